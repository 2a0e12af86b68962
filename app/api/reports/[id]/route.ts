import { NextResponse } from "next/server";
import { findAccountAccess } from "@/db/queries/access";
import { findFieldReportListing } from "@/db/queries/reports";
import { can } from "@/lib/auth/permissions";
import { authenticate, handle, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { reportFileName } from "@/lib/reports/send";
import { presignedGetUrl } from "@/lib/storage/s3";

type Ctx = { params: Promise<{ id: string }> };

export const dynamic = "force-dynamic";

// A stored report's PDF: a redirect to a short-lived presigned GET, asked for per click so the link
// on the reports page never goes stale.
export const GET = handle<Ctx>("GET /api/reports/[id]", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("report");
  const report = await findFieldReportListing(id);
  const access = report && (await findAccountAccess(auth.user, report.accountId));
  if (!report || !access || !can(auth.user, "read", { kind: "field", access })) return notFoundJson("report");
  const { url } = await presignedGetUrl(report.objectKey, {
    expiresIn: 60,
    downloadAs: reportFileName(report.fieldName, report.createdAt.toISOString().slice(0, 10)),
  });
  return NextResponse.redirect(url, { status: 303, headers: { "cache-control": "private, no-store" } });
});
