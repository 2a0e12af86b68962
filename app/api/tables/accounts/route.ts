import { NextResponse } from "next/server";
import { listAccountTable, accountTableSpec } from "@/db/queries/tables";
import { authenticate, handle } from "@/lib/http";
import { parseTableQuery } from "@/lib/tables/params";

// The accounts table as JSON: the same scoped, sorted, filtered and paged query as the /accounts page.
export const GET = handle("GET /api/tables/accounts", async (req) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const url = new URL(req.url);
  const query = parseTableQuery(Object.fromEntries(url.searchParams), accountTableSpec);
  const { rows, total } = await listAccountTable(auth.user, query);
  const { sort, dir, page, pageSize, filters, issues } = query;
  return NextResponse.json({ rows, total, sort, dir, page, pageSize, filters, issues });
});
