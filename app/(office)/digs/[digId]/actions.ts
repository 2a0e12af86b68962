"use server";

import { revalidatePath } from "next/cache";
import { recommendationResponseCreateSchema } from "@/lib/digs/recommendation-response";
import { respondToRecommendation } from "@/lib/digs/respond";
import { getSessionUser } from "@/lib/auth/session";

export type RespondState =
  | { data: { id: string; kind: "acknowledged" | "comment" } }
  | { error: string; fieldErrors?: Record<string, string> }
  | null;

// Acknowledge or comment on a dig's recommendation from the dig page or the grower's home.
export async function respondAction(
  digSiteId: string,
  _prev: RespondState,
  form: FormData,
): Promise<RespondState> {
  const user = await getSessionUser();
  if (!user) return { error: "Sign in to continue." };
  const parsed = recommendationResponseCreateSchema.safeParse({
    kind: form.get("kind"),
    body: form.get("body") ?? undefined,
  });
  if (!parsed.success) {
    const fieldErrors: Record<string, string> = {};
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0] ?? "form")] ??= issue.message;
    return { error: "Some values are not valid.", fieldErrors };
  }
  const result = await respondToRecommendation(user, digSiteId, parsed.data);
  if (!result.ok) return { error: result.error };
  revalidatePath(`/digs/${digSiteId}`);
  revalidatePath("/");
  return { data: { id: result.id, kind: parsed.data.kind } };
}
