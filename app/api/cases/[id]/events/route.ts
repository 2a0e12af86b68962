import { after, NextResponse } from "next/server";
import { applyCaseAction, findCaseTimeline } from "@/db/queries/case-actions";
import { caseActionSchema } from "@/lib/cases/workflow";
import { notifyCase } from "@/lib/cases/notify";
import { authenticate, handle, jsonError, notFoundJson, parseJson } from "@/lib/http";
import { isRecordId } from "@/lib/records/schemas";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/cases/:id/events: the case and its timeline (oldest first) for whoever may read it.
export const GET = handle<Ctx>("GET /api/cases/[id]/events", async (_req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("case");
  const timeline = await findCaseTimeline(auth.user, id);
  if (!timeline) return notFoundJson("case");
  return NextResponse.json(timeline);
});

// POST /api/cases/:id/events { action, …, expectedVersion }: one workflow step (lib/cases/workflow.ts),
// written with its event in one transaction (db/queries/case-actions.ts); the e-mail of a decision or
// a share goes out after the commit and the answer.
export const POST = handle<Ctx>("POST /api/cases/[id]/events", async (req, ctx) => {
  const auth = await authenticate();
  if (!auth.ok) return auth.response;
  const { id } = await ctx.params;
  if (!isRecordId(id)) return notFoundJson("case");
  const body = await parseJson(req, caseActionSchema);
  if (!body.ok) return body.response;
  const result = await applyCaseAction(auth.user, id, body.data);
  if (!result.ok) {
    if (result.status === 409) {
      return NextResponse.json({ error: result.error, case: result.case }, { status: 409 });
    }
    return jsonError(result.status, result.error, result.status === 422 ? result.issues : undefined);
  }
  // After the answer: a slow or failing mail server never holds up or undoes the committed step.
  if (body.data.action === "decide") after(() => notifyCase("decided", id));
  if (body.data.action === "share" && body.data.shared) after(() => notifyCase("shared", id));
  return NextResponse.json({ case: result.case, event: result.event }, { status: 201 });
});
