import { NextResponse } from "next/server";
import { z } from "zod";
import { listConflicts } from "@/db/queries/conflicts";
import { authenticate, handle, jsonError, zodIssues } from "@/lib/http";

const querySchema = z.strictObject({
  settled: z.enum(["true", "false"], { error: "Use settled=true or settled=false." }).optional(),
});

// GET /api/conflicts[?settled=true|false]: sync conflicts for the supervisor of their region (admins:
// every region), with both values, who and when.
export const GET = handle("GET /api/conflicts", async (req) => {
  const auth = await authenticate(["supervisor", "admin"]);
  if (!auth.ok) return auth.response;
  const query = querySchema.safeParse(Object.fromEntries(new URL(req.url).searchParams));
  if (!query.success) return jsonError(422, "Some values are not valid.", zodIssues(query.error));
  const settled = query.data.settled === undefined ? undefined : query.data.settled === "true";
  return NextResponse.json({ conflicts: await listConflicts(auth.user, { settled }) });
});
