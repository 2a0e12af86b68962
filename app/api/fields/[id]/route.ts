import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findField, updateField } from "@/db/queries/fields";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, notFoundJson, parseJson } from "@/lib/http";
import { fieldUpdateSchema, isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

export const GET = handle<Ctx>("GET /api/fields/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const field = await findField(id);
  const access = field && (await findAccountAccess(auth.user, field.accountId));
  if (!field || !access || !can(auth.user, "read", { kind: "field", access })) return notFoundJson("field");
  return NextResponse.json({ field });
});

export const PATCH = handle<Ctx>("PATCH /api/fields/[id]", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const current = await findField(id);
  const access = current && (await findAccountAccess(auth.user, current.accountId));
  if (!current || !access) return notFoundJson("field");
  const resource = { kind: "field", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("field");
  }
  const body = await parseJson(req, fieldUpdateSchema);
  if (!body.ok) return body.response;
  const field = await updateField(id, body.data, { regionId: access.regionId, actorId: auth.user.id });
  if (!field) return notFoundJson("field");
  return NextResponse.json({ field });
});
