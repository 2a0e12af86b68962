import { NextResponse } from "next/server";
import { caseTableSpec, listCases } from "@/db/queries/case-view";
import { authenticate, handle, jsonError } from "@/lib/http";
import { parseTableQuery } from "@/lib/tables/params";

// GET /api/cases?status=&severity=&account=&rep=&hybrid=&minAge=&maxAge=&sort=&dir=&page=&pageSize=
// The case queue of the actor's scope: one page, the total and the counts by status. Growers have no
// queue (they reach a case shared with them by its link).
export const GET = handle("GET /api/cases", async (req) => {
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
  return NextResponse.json(await listCases(auth.user, query));
});
