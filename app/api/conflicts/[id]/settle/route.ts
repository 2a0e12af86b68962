import { after, NextResponse } from "next/server";
import { settleConflict, settleConflictSchema } from "@/db/queries/conflicts";
import { notifyOpenedCases } from "@/lib/cases/notify";
import { authenticate, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

// POST /api/conflicts/:id/settle { choice: "server" | "client" } or { choice: "custom", value }:
// the supervisor's decision, written to the record with a new version so every device receives it.
export const POST = handle<Ctx>("POST /api/conflicts/[id]/settle", async (req, ctx) => {
  const auth = await authenticate(["supervisor", "admin"]);
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("conflict");
  const body = await parseJson(req, settleConflictSchema);
  if (!body.ok) return body.response;
  const settled = await settleConflict(auth.user, id, body.data);
  if (!settled.ok) return jsonError(settled.status, settled.error, settled.issues);
  // A settled value can flag the dig: its case's supervisors hear of it after the answer.
  const opened = settled.openedCaseId;
  if (opened) after(() => notifyOpenedCases([opened]));
  return NextResponse.json({ conflict: settled.conflict, recordVersion: settled.recordVersion });
});
