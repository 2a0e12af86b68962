import { NextResponse } from "next/server";
import { listDigTable, digTableSpec } from "@/db/queries/tables";
import { authenticate, handle } from "@/lib/http";
import { parseTableQuery } from "@/lib/tables/params";

// The digs table as JSON: the same scoped, sorted, filtered and paged query as the /digs page.
export const GET = handle("GET /api/tables/digs", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const url = new URL(req.url);
  const query = parseTableQuery(Object.fromEntries(url.searchParams), digTableSpec);
  const { rows, total } = await listDigTable(auth.user, query);
  const { sort, dir, page, pageSize, filters, issues } = query;
  return NextResponse.json({ rows, total, sort, dir, page, pageSize, filters, issues });
});
