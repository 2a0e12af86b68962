import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findFertilizerPass, updateFertilizerPass } from "@/db/queries/fertilizer-passes";
import { findActiveProduct } from "@/db/queries/products";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { fertilizerPassUpdateSchema, isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

export const GET = handle<Ctx>("GET /api/fertilizer-passes/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("fertilizer pass");
  const fertilizerPass = await findFertilizerPass(id);
  const access = fertilizerPass && (await findAccountAccess(auth.user, fertilizerPass.accountId));
  if (!fertilizerPass || !access || !can(auth.user, "read", { kind: "fertilizerPass", access })) {
    return notFoundJson("fertilizer pass");
  }
  return NextResponse.json({ fertilizerPass });
});

export const PATCH = handle<Ctx>("PATCH /api/fertilizer-passes/[id]", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("fertilizer pass");
  const current = await findFertilizerPass(id);
  const access = current && (await findAccountAccess(auth.user, current.accountId));
  if (!current || !access) return notFoundJson("fertilizer pass");
  const resource = { kind: "fertilizerPass", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("fertilizer pass");
  }
  const body = await parseJson(req, fertilizerPassUpdateSchema);
  if (!body.ok) return body.response;
  if (body.data.productId && !(await findActiveProduct(body.data.productId))) {
    return jsonError(422, "Some values are not valid.", [
      { path: "productId", message: "Choose a product from the catalog." },
    ]);
  }
  const fertilizerPass = await updateFertilizerPass(id, body.data, {
    regionId: access.regionId,
    actorId: auth.user.id,
  });
  if (!fertilizerPass) return notFoundJson("fertilizer pass");
  return NextResponse.json({ fertilizerPass });
});
