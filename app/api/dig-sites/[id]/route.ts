import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findDigSite, listDugPlants } from "@/db/queries/dig-sites";
import { can } from "@/lib/auth/permissions";
import { authenticate, handle, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

// Read only: digs are written on devices and reach the server through sync.
export const GET = handle<Ctx>("GET /api/dig-sites/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("dig site");
  const digSite = await findDigSite(id);
  const access = digSite && (await findAccountAccess(auth.user, digSite.accountId));
  if (!digSite || !access || !can(auth.user, "read", { kind: "digSite", access })) {
    return notFoundJson("dig site");
  }
  return NextResponse.json({ digSite: { ...digSite, dugPlants: await listDugPlants(id) } });
});
