import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findAccount, updateAccountDetails } from "@/db/queries/accounts";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, notFoundJson, parseJson } from "@/lib/http";
import { accountUpdateSchema, isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

export const GET = handle<Ctx>("GET /api/accounts/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("account");
  const access = await findAccountAccess(auth.user, id);
  if (!access || !can(auth.user, "read", { kind: "account", access })) return notFoundJson("account");
  return NextResponse.json({ account: await findAccount(id) });
});

// Admins rename an account or change its locality.
export const PATCH = handle<Ctx>("PATCH /api/accounts/[id]", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("account");
  const access = await findAccountAccess(auth.user, id);
  if (!access) return notFoundJson("account");
  const resource = { kind: "account", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("account");
  }
  const body = await parseJson(req, accountUpdateSchema);
  if (!body.ok) return body.response;
  const account = await updateAccountDetails(id, body.data);
  if (!account) return notFoundJson("account");
  return NextResponse.json({ account });
});
