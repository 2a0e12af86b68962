import "server-only";
import { findAccountAccess } from "@/db/queries/access";
import { createRecommendationResponse, findDigDetail } from "@/db/queries/dig-detail";
import { type Actor, can } from "@/lib/auth/permissions";
import { isRecordId } from "@/lib/records/schemas";
import type { RecommendationResponseCreate } from "./recommendation-response";

export type RespondResult =
  | { ok: true; id: string; created: boolean }
  | { ok: false; status: 403 | 404 | 422; error: string };

/**
 * Records an acknowledgement or a comment on a dig's recommendation, after the permission check:
 * a dig the actor may not read is 404; one they may read but not answer is 403. Only the farm's
 * grower acknowledges; acknowledging twice keeps the first (idempotent).
 */
export async function respondToRecommendation(
  actor: Actor,
  digSiteId: string,
  input: RecommendationResponseCreate,
): Promise<RespondResult> {
  const notFound = { ok: false, status: 404, error: "No such dig." } as const;
  if (!isRecordId(digSiteId)) return notFound;
  const dig = await findDigDetail(digSiteId);
  const access = dig && (await findAccountAccess(actor, dig.accountId));
  if (!dig || !access || !can(actor, "read", { kind: "digSite", access })) return notFound;
  const resource = { kind: "recommendationResponse", access } as const;
  if (!can(actor, "write", resource) || (input.kind === "acknowledged" && actor.role !== "grower")) {
    return { ok: false, status: 403, error: "You do not have permission to do that." };
  }
  if (input.kind === "acknowledged" && !dig.recommendation?.trim()) {
    return { ok: false, status: 422, error: "This dig has no recommendation to acknowledge yet." };
  }
  const saved = await createRecommendationResponse({
    digSiteId,
    userId: actor.id,
    kind: input.kind,
    body: input.kind === "comment" ? input.body : null,
  });
  return { ok: true, ...saved };
}
