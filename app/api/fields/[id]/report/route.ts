import { authenticate, handle, notFoundJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";
import { gatherFieldReport } from "@/lib/reports/field-report";
import { renderFieldReportPdf } from "@/lib/reports/field-report-pdf";
import { reportFileName } from "@/lib/reports/send";

type Ctx = { params: Promise<{ id: string }> };

export const dynamic = "force-dynamic";

// The field report as a PDF, rendered now for anyone who may read the field.
export const GET = handle<Ctx>("GET /api/fields/[id]/report", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("field");
  const report = await gatherFieldReport(auth.user, id);
  if (!report) return notFoundJson("field");
  const bytes = await renderFieldReportPdf(report, auth.user.name);
  const name = reportFileName(report.field.name, report.generatedAt.toISOString().slice(0, 10));
  return new Response(Buffer.from(bytes), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(bytes.byteLength),
      "content-disposition": `attachment; filename="${name}"`,
      "cache-control": "private, no-store",
    },
  });
});
