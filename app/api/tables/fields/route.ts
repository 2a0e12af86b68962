import { NextResponse } from "next/server";
import { listFieldTable, fieldTableSpec } from "@/db/queries/tables";
import { authenticate, handle } from "@/lib/http";
import { parseTableQuery } from "@/lib/tables/params";

// The fields table as JSON: the same scoped, sorted, filtered and paged query as the /fields page.
export const GET = handle("GET /api/tables/fields", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const url = new URL(req.url);
  const query = parseTableQuery(Object.fromEntries(url.searchParams), fieldTableSpec);
  const { rows, total } = await listFieldTable(auth.user, query);
  const { sort, dir, page, pageSize, filters, issues } = query;
  return NextResponse.json({ rows, total, sort, dir, page, pageSize, filters, issues });
});
