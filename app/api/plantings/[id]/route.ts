import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findPlanting, updatePlanting } from "@/db/queries/plantings";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId, plantingUpdateSchema } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

export const GET = handle<Ctx>("GET /api/plantings/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("planting");
  const planting = await findPlanting(id);
  const access = planting && (await findAccountAccess(auth.user, planting.accountId));
  if (!planting || !access || !can(auth.user, "read", { kind: "planting", access })) {
    return notFoundJson("planting");
  }
  return NextResponse.json({ planting });
});

export const PATCH = handle<Ctx>("PATCH /api/plantings/[id]", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("planting");
  const current = await findPlanting(id);
  const access = current && (await findAccountAccess(auth.user, current.accountId));
  if (!current || !access) return notFoundJson("planting");
  const resource = { kind: "planting", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("planting");
  }
  const body = await parseJson(req, plantingUpdateSchema);
  if (!body.ok) return body.response;
  const planting = await updatePlanting(id, body.data, { regionId: access.regionId, actorId: auth.user.id });
  if (!planting) return notFoundJson("planting");
  return NextResponse.json({ planting });
});
