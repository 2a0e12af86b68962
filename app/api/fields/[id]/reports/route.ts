import { NextResponse } from "next/server";
import { can, refusalStatus } from "@/lib/auth/permissions";
import { authenticate, forbidden, handle, jsonError, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { gatherFieldReport } from "@/lib/reports/field-report";
import { sendFieldReport } from "@/lib/reports/send";

type Ctx = { params: Promise<{ id: string }> };

// Sends the field report to the account's growers: the rep serving the account or an admin. The
// answer is 201 with the stored report, whose status says whether the e-mail left ('sent' or
// 'failed' with the error); 409 when the account has no active grower.
export const POST = handle<Ctx>("POST /api/fields/[id]/reports", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const report = await gatherFieldReport(auth.user, id);
  if (!report) return notFoundJson("field");
  const resource = { kind: "field", access: report.access } as const;
  if (!can(auth.user, "write", resource)) {
    return refusalStatus(auth.user, resource) === 403 ? forbidden() : notFoundJson("field");
  }
  const outcome = await sendFieldReport(report, { id: auth.user.id, name: auth.user.name });
  if (!outcome.ok) return jsonError(409, "This account has no active grower to send the report to.");
  const r = outcome.report;
  return NextResponse.json(
    {
      report: {
        id: r.id,
        fieldId: r.fieldId,
        status: r.status,
        recipients: r.recipients,
        error: r.error,
        byteSize: r.byteSize,
        sha256: r.sha256,
        createdAt: r.createdAt,
        sentAt: r.sentAt,
      },
    },
    { status: 201 },
  );
});
