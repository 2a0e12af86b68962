import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findDigDetail, listRecommendationResponses } from "@/db/queries/dig-detail";
import { can } from "@/lib/auth/permissions";
import { recommendationResponseCreateSchema } from "@/lib/digs/recommendation-response";
import { respondToRecommendation } from "@/lib/digs/respond";
import { authenticate, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

// The acknowledgements and comments on a dig's recommendation.
export const GET = handle<Ctx>("GET /api/dig-sites/[id]/responses", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("dig site");
  const dig = await findDigDetail(id);
  const access = dig && (await findAccountAccess(auth.user, dig.accountId));
  if (!dig || !access || !can(auth.user, "read", { kind: "recommendationResponse", access })) {
    return notFoundJson("dig site");
  }
  return NextResponse.json({ responses: await listRecommendationResponses([id]) });
});

export const POST = handle<Ctx>("POST /api/dig-sites/[id]/responses", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("dig site");
  const parsed = await parseJson(req, recommendationResponseCreateSchema);
  if (!parsed.ok) return parsed.response;
  const result = await respondToRecommendation(auth.user, id, parsed.data);
  if (!result.ok) return jsonError(result.status, result.error);
  return NextResponse.json(
    { id: result.id, created: result.created },
    { status: result.created ? 201 : 200 },
  );
});
