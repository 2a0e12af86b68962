import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findFieldReportListing } from "@/db/queries/reports";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { resendFieldReport } from "@/lib/reports/send";

type Ctx = { params: Promise<{ id: string }> };

// Sends a stored report again (after a failed send): the rep serving the account or an admin.
export const POST = handle<Ctx>("POST /api/reports/[id]/resend", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("report");
  const listing = await findFieldReportListing(id);
  const access = listing && (await findAccountAccess(auth.user, listing.accountId));
  if (!listing || !access) return notFoundJson("report");
  const resource = { kind: "field", access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("report");
  }
  if (listing.status === "sending") return jsonError(409, "This report is being sent right now.");
  const outcome = await resendFieldReport(listing, { name: auth.user.name });
  if (!outcome.ok) return jsonError(409, "This account has no active grower to send the report to.");
  const r = outcome.report;
  return NextResponse.json({
    report: { id: r.id, status: r.status, recipients: r.recipients, error: r.error, sentAt: r.sentAt },
  });
});
