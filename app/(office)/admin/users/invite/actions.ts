"use server";

import { getTranslations } from "next-intl/server";
import { inviteUser } from "@/db/queries/invitations";
import { invitationCreateSchema } from "@/lib/auth/schemas";
import { getSessionUser } from "@/lib/auth/session";

export type InviteField = "email" | "name" | "role" | "regionId" | "accountIds";

export type InviteUserResult =
  | { data: { email: string; reinvited: boolean } }
  | { error: string; fieldErrors?: Partial<Record<InviteField, string>> };

export async function inviteUserAction(formData: FormData): Promise<InviteUserResult> {
  const t = await getTranslations("auth.inviteUser.errors");
  const user = await getSessionUser();
  if (!user) return { error: t("signIn") };
  if (user.role !== "admin") return { error: t("forbidden") };

  const text = (key: string) => {
    const v = formData.get(key);
    return typeof v === "string" ? v : "";
  };
  const parsed = invitationCreateSchema.safeParse({
    email: text("email"),
    name: text("name"),
    role: text("role"),
    regionId: text("regionId") || null,
    accountIds: formData.getAll("accountIds").filter((v): v is string => typeof v === "string" && v !== ""),
  });
  if (!parsed.success) {
    const fieldErrors: Partial<Record<InviteField, string>> = {};
    for (const issue of parsed.error.issues) {
      const field = issue.path[0] as InviteField;
      fieldErrors[field] ??= issue.message;
    }
    return { error: t("invalid"), fieldErrors };
  }

  try {
    const result = await inviteUser(user, parsed.data, user.name);
    if (!result.ok) {
      const fieldErrors: Partial<Record<InviteField, string>> = {};
      if (result.reason === "activeUser" || result.reason === "deactivatedUser" || result.reason === "busy") {
        fieldErrors.email = t(result.reason);
      }
      if (result.reason === "unknownRegion") fieldErrors.regionId = t(result.reason);
      if (result.reason === "unknownAccounts") fieldErrors.accountIds = t(result.reason);
      return { error: t(result.reason), fieldErrors };
    }
    if (!result.mailSent) return { error: t("mailFailed", { email: result.invitation.email }) };
    return { data: { email: result.invitation.email, reinvited: result.invitation.reinvited } };
  } catch (err) {
    console.error("[action] inviteUserAction failed:", err);
    return { error: t("failed") };
  }
}
