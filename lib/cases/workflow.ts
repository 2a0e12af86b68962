import { z } from "zod";
import type { CaseStatus } from "@/db/schema";
import { type AccountAccess, type Actor, can } from "@/lib/auth/permissions";

// The injury case workflow, pure: new → in_review → decided (injury confirmed, not injury,
// inconclusive) → closed, with reopen back to in_review. Who may do what, what each action needs and
// what it changes; db/queries/case-actions.ts applies the result in one transaction with its event.

export const CASE_DECISIONS = ["injury_confirmed", "not_injury", "inconclusive"] as const;
export type CaseDecision = (typeof CASE_DECISIONS)[number];

export const REASON_MIN_CHARS = 10;
export const TEXT_MAX_CHARS = 4000;

const expectedVersion = z.number().int().min(0);
const reason = z
  .string()
  .trim()
  .min(REASON_MIN_CHARS, `Write a reason of at least ${REASON_MIN_CHARS} characters.`)
  .max(TEXT_MAX_CHARS, `Keep the reason under ${TEXT_MAX_CHARS} characters.`);

/** The body of POST /api/cases/:id/events: one action and the case version the client saw. */
export const caseActionSchema = z.discriminatedUnion("action", [
  z.object({ action: z.literal("start_review"), expectedVersion }),
  z.object({ action: z.literal("assign"), userId: z.uuid("Choose a supervisor."), expectedVersion }),
  z.object({
    action: z.literal("comment"),
    body: z
      .string()
      .trim()
      .min(1, "Write a comment.")
      .max(TEXT_MAX_CHARS, `Keep the comment under ${TEXT_MAX_CHARS} characters.`),
    expectedVersion,
  }),
  z.object({
    action: z.literal("decide"),
    decision: z.enum(CASE_DECISIONS, "Choose a decision."),
    reason,
    expectedVersion,
  }),
  z.object({ action: z.literal("close"), expectedVersion }),
  z.object({ action: z.literal("reopen"), reason, expectedVersion }),
  z.object({ action: z.literal("share"), shared: z.boolean(), expectedVersion }),
]);
export type CaseAction = z.infer<typeof caseActionSchema>;
export type CaseActionName = CaseAction["action"];

/**
 * How the actor stands to one case: a decider (the supervisor of its region, an admin) runs the
 * workflow; a commenter (the rep of the account, its grower once the case is shared) reads and
 * comments; anyone else does not see the case at all.
 */
export type CaseRole = "decider" | "commenter" | "none";

export function caseRoleOf(actor: Actor, access: AccountAccess, sharedWithGrower: boolean): CaseRole {
  const resource = { kind: "case", access, sharedWithGrower } as const;
  if (can(actor, "write", resource)) return "decider";
  if (can(actor, "read", resource)) return "commenter";
  return "none";
}

/** Whether a role may take an action at all, whatever the case's status. */
export function mayTake(role: CaseRole, action: CaseActionName): boolean {
  if (role === "decider") return true;
  return role === "commenter" && action === "comment";
}

// The parts of a case the workflow reads and changes.
export interface CaseState {
  status: CaseStatus;
  decision: CaseDecision | null;
  decisionReason: string | null;
  assignedTo: string | null;
  sharedWithGrower: boolean;
}

export type CaseEventKind = "status" | "assigned" | "comment" | "decision" | "shared" | "reopened";

export interface CaseChange {
  // Columns to write (decidedAt true: now; false: cleared); empty for a comment.
  patch: Partial<CaseState> & { decidedAt?: boolean };
  event: { kind: CaseEventKind; body: string | null; payload: Record<string, unknown> };
}

export type Transition = { ok: true; change: CaseChange } | { ok: false; error: string };

const refuse = (error: string): Transition => ({ ok: false, error });

const STATUS_WORDS: Record<CaseStatus, string> = {
  new: "new",
  in_review: "in review",
  decided: "decided",
  closed: "closed",
};

/**
 * What an action does to a case in its current state, or why it can't be taken now. Permission
 * (mayTake) and the assignee's eligibility are checked by the caller; the action's own values are
 * already valid (caseActionSchema).
 */
export function transition(state: CaseState, action: CaseAction): Transition {
  const from = state.status;
  const now = STATUS_WORDS[from];
  switch (action.action) {
    case "start_review":
      if (from !== "new") return refuse(`Only a new case can go into review; this case is ${now}.`);
      return ok({ status: "in_review" }, "status", null, { from, to: "in_review" });
    case "assign":
      if (from !== "new" && from !== "in_review") {
        return refuse(`A ${now} case can't be assigned; reopen it first.`);
      }
      if (state.assignedTo === action.userId) {
        return refuse("This case is already assigned to that supervisor.");
      }
      return ok({ assignedTo: action.userId }, "assigned", null, {
        status: from,
        from: state.assignedTo,
        to: action.userId,
      });
    case "comment":
      return ok({}, "comment", action.body, { status: from });
    case "decide":
      if (from !== "new" && from !== "in_review") {
        return refuse(`This case is already ${now}; reopen it to decide again.`);
      }
      return ok(
        {
          status: "decided",
          decision: action.decision,
          decisionReason: action.reason,
          decidedAt: true,
        },
        "decision",
        action.reason,
        { from, to: "decided", decision: action.decision },
      );
    case "close":
      if (from !== "decided") {
        return refuse(
          from === "closed" ? "This case is already closed." : "Decide the case before closing it.",
        );
      }
      return ok({ status: "closed" }, "status", null, { from, to: "closed" });
    case "reopen":
      if (from !== "decided" && from !== "closed") {
        return refuse(`Only a decided or closed case can be reopened; this case is ${now}.`);
      }
      return ok(
        { status: "in_review", decision: null, decisionReason: null, decidedAt: false },
        "reopened",
        action.reason,
        { from, to: "in_review", previousDecision: state.decision },
      );
    case "share":
      if (state.sharedWithGrower === action.shared) {
        return refuse(
          action.shared
            ? "This case is already shared with the grower."
            : "This case is not shared with the grower.",
        );
      }
      return ok({ sharedWithGrower: action.shared }, "shared", null, {
        status: from,
        shared: action.shared,
      });
  }
}

function ok(
  patch: CaseChange["patch"],
  kind: CaseEventKind,
  body: string | null,
  payload: Record<string, unknown>,
): Transition {
  return { ok: true, change: { patch, event: { kind, body, payload } } };
}
