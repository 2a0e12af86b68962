import Papa from "papaparse";
import { CASE_EXPORT_LIMIT, caseTableSpec, listCases } from "@/db/queries/case-view";
import { authenticate, handle, jsonError } from "@/lib/http";
import { csvCell } from "@/lib/reports/csv";
import { parseTableQuery } from "@/lib/tables/params";

// GET /api/cases/export?<the queue's filters and sort>: every matching case as CSV (no paging).
export const GET = handle("GET /api/cases/export", async (req) => {
  const auth = await authenticate(["supervisor", "rep", "admin"]);
  if (!auth.ok) return auth.response;
  const query = parseTableQuery(Object.fromEntries(new URL(req.url).searchParams), caseTableSpec);
  if (query.issues.length > 0) {
    return jsonError(
      422,
      "Some values are not valid.",
      query.issues.map((i) => ({ path: i.param, message: i.message })),
    );
  }
  const list = await listCases(auth.user, { ...query, page: 1, pageSize: CASE_EXPORT_LIMIT });
  const csv = Papa.unparse({
    fields: [
      "case_id",
      "status",
      "severity",
      "decision",
      "opened_at",
      "age_days",
      "account",
      "field",
      "rep",
      "hybrid",
      "assigned_to",
      "dig_site_id",
    ],
    data: list.rows.map((r) =>
      [
        r.id,
        r.status,
        r.severity,
        r.decision,
        r.openedAt,
        r.ageDays,
        r.accountName,
        r.fieldName,
        r.repName,
        r.hybrid,
        r.assignedToName,
        r.digSiteId,
      ].map(csvCell),
    ),
  });
  const day = new Date().toISOString().slice(0, 10);
  return new Response(`\uFEFF${csv}\r\n`, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="cases-${day}.csv"`,
      "cache-control": "no-store",
    },
  });
});
