import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { listFields } from "@/db/queries/fields";
import { can } from "@/lib/auth/permissions";
import { authenticate, handle, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

// The live fields the actor may see; ?accountId= narrows to one account (404 when not visible).
export const GET = handle("GET /api/fields", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const accountId = new URL(req.url).searchParams.get("accountId") ?? undefined;
  if (accountId !== undefined) {
    if (!isRecordId(accountId)) return notFoundJson("account");
    const access = await findAccountAccess(auth.user, accountId);
    if (!access || !can(auth.user, "read", { kind: "account", access })) return notFoundJson("account");
  }
  return NextResponse.json({ fields: await listFields(auth.user, accountId) });
});
