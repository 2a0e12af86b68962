// The injury case workflow of lib/cases/workflow.ts: every action from every status (allowed or
// refused, and what an allowed one changes and records), who may take which action, and the
// validation of the request body. Rules from issue 7 (our own workflow, no outside source).
import { describe, expect, it } from "vitest";
import type { CaseStatus } from "@/db/schema";
import type { AccountAccess, Actor } from "@/lib/auth/permissions";
import {
  type CaseAction,
  type CaseActionName,
  type CaseState,
  caseActionSchema,
  caseRoleOf,
  mayTake,
  transition,
} from "@/lib/cases/workflow";

const SUPERVISOR_B = "0b6d3c1e-7f2a-4c59-9a51-1d2e3f405162";
const SUPERVISOR_C = "1c7e4d2f-8a3b-4d6a-8b62-2e3f40516273";

const state = (status: CaseStatus, over: Partial<CaseState> = {}): CaseState => ({
  status,
  decision: status === "decided" || status === "closed" ? "injury_confirmed" : null,
  decisionReason: status === "decided" || status === "closed" ? "Burn on every plant at the band." : null,
  assignedTo: null,
  sharedWithGrower: false,
  ...over,
});

const actions: Record<CaseActionName, CaseAction> = {
  start_review: { action: "start_review", expectedVersion: 1 },
  assign: { action: "assign", userId: SUPERVISOR_B, expectedVersion: 1 },
  comment: { action: "comment", body: "Dug two more rows, same burn.", expectedVersion: 1 },
  decide: {
    action: "decide",
    decision: "not_injury",
    reason: "Roots were pruned by a cultivator, not by salt.",
    expectedVersion: 1,
  },
  close: { action: "close", expectedVersion: 1 },
  reopen: { action: "reopen", reason: "Lab result came back positive.", expectedVersion: 1 },
  share: { action: "share", shared: true, expectedVersion: 1 },
};

// Which actions each status allows (the state machine of issue 7).
const ALLOWED: Record<CaseStatus, CaseActionName[]> = {
  new: ["start_review", "assign", "comment", "decide", "share"],
  in_review: ["assign", "comment", "decide", "share"],
  decided: ["comment", "close", "reopen", "share"],
  closed: ["comment", "reopen", "share"],
};

describe("transitions from every status", () => {
  for (const status of Object.keys(ALLOWED) as CaseStatus[]) {
    for (const name of Object.keys(actions) as CaseActionName[]) {
      const allowed = ALLOWED[status].includes(name);
      it(`${name} from ${status} is ${allowed ? "allowed" : "refused"}`, () => {
        const result = transition(state(status), actions[name]);
        expect(result.ok).toBe(allowed);
        if (!result.ok) expect(result.error.length).toBeGreaterThan(10);
      });
    }
  }
});

describe("what each allowed action changes and records", () => {
  it("start_review moves new to in_review with a status event", () => {
    const r = transition(state("new"), actions.start_review);
    expect(r).toEqual({
      ok: true,
      change: {
        patch: { status: "in_review" },
        event: { kind: "status", body: null, payload: { from: "new", to: "in_review" } },
      },
    });
  });

  it("assign sets the assignee and records the previous one", () => {
    const r = transition(state("in_review", { assignedTo: SUPERVISOR_C }), actions.assign);
    expect(r).toEqual({
      ok: true,
      change: {
        patch: { assignedTo: SUPERVISOR_B },
        event: {
          kind: "assigned",
          body: null,
          payload: { status: "in_review", from: SUPERVISOR_C, to: SUPERVISOR_B },
        },
      },
    });
  });

  it("assign to the supervisor already assigned is refused", () => {
    const r = transition(state("in_review", { assignedTo: SUPERVISOR_B }), actions.assign);
    expect(r).toEqual({ ok: false, error: "This case is already assigned to that supervisor." });
  });

  it("comment changes no column and keeps the body", () => {
    const r = transition(state("closed"), actions.comment);
    expect(r).toEqual({
      ok: true,
      change: {
        patch: {},
        event: { kind: "comment", body: "Dug two more rows, same burn.", payload: { status: "closed" } },
      },
    });
  });

  it("decide stores the decision, its reason and the time, from new or in review", () => {
    for (const from of ["new", "in_review"] as const) {
      const r = transition(state(from), actions.decide);
      expect(r).toEqual({
        ok: true,
        change: {
          patch: {
            status: "decided",
            decision: "not_injury",
            decisionReason: "Roots were pruned by a cultivator, not by salt.",
            decidedAt: true,
          },
          event: {
            kind: "decision",
            body: "Roots were pruned by a cultivator, not by salt.",
            payload: { from, to: "decided", decision: "not_injury" },
          },
        },
      });
    }
  });

  it("close moves decided to closed and keeps the decision", () => {
    const r = transition(state("decided"), actions.close);
    expect(r).toEqual({
      ok: true,
      change: {
        patch: { status: "closed" },
        event: { kind: "status", body: null, payload: { from: "decided", to: "closed" } },
      },
    });
  });

  it("close of an undecided case asks for a decision first", () => {
    expect(transition(state("in_review"), actions.close)).toEqual({
      ok: false,
      error: "Decide the case before closing it.",
    });
  });

  it("reopen returns a decided or closed case to review, clears the decision and keeps it in the event", () => {
    for (const from of ["decided", "closed"] as const) {
      const r = transition(state(from), actions.reopen);
      expect(r).toEqual({
        ok: true,
        change: {
          patch: { status: "in_review", decision: null, decisionReason: null, decidedAt: false },
          event: {
            kind: "reopened",
            body: "Lab result came back positive.",
            payload: { from, to: "in_review", previousDecision: "injury_confirmed" },
          },
        },
      });
    }
  });

  it("share and unshare flip the grower's access; the same value again is refused", () => {
    const on = transition(state("decided"), actions.share);
    expect(on).toEqual({
      ok: true,
      change: {
        patch: { sharedWithGrower: true },
        event: { kind: "shared", body: null, payload: { status: "decided", shared: true } },
      },
    });
    const off = transition(state("decided", { sharedWithGrower: true }), {
      action: "share",
      shared: false,
      expectedVersion: 1,
    });
    expect(off.ok && off.change.patch).toEqual({ sharedWithGrower: false });
    expect(transition(state("new", { sharedWithGrower: true }), actions.share).ok).toBe(false);
    expect(transition(state("new"), { action: "share", shared: false, expectedVersion: 1 }).ok).toBe(false);
  });
});

describe("who may take which action", () => {
  const region = "2d8f5e30-9b4c-4e7b-9c73-3f4051627384";
  const otherRegion = "3e9a6f41-ac5d-4f8c-8d84-405162738495";
  const access = (over: Partial<AccountAccess> = {}): AccountAccess => ({
    accountId: "4fab7a52-bd6e-4a9d-9e95-516273849506",
    regionId: region,
    servedByActor: false,
    grownByActor: false,
    ...over,
  });
  const actor = (role: Actor["role"], regionId: string | null = region): Actor => ({
    id: "5abc8b63-ce7f-4bae-8fa6-627384950617",
    role,
    regionId,
  });

  it("the region's supervisor and an admin decide; a supervisor elsewhere does not see the case", () => {
    expect(caseRoleOf(actor("supervisor"), access(), false)).toBe("decider");
    expect(caseRoleOf(actor("admin", null), access(), false)).toBe("decider");
    expect(caseRoleOf(actor("supervisor", otherRegion), access(), false)).toBe("none");
    expect(caseRoleOf(actor("supervisor", null), access(), false)).toBe("none");
  });

  it("the account's rep comments; another rep does not see the case", () => {
    expect(caseRoleOf(actor("rep"), access({ servedByActor: true }), false)).toBe("commenter");
    expect(caseRoleOf(actor("rep"), access(), false)).toBe("none");
  });

  it("the account's grower comments only once the case is shared", () => {
    expect(caseRoleOf(actor("grower"), access({ grownByActor: true }), true)).toBe("commenter");
    expect(caseRoleOf(actor("grower"), access({ grownByActor: true }), false)).toBe("none");
    expect(caseRoleOf(actor("grower"), access(), true)).toBe("none");
  });

  it("a decider takes every action, a commenter only comments, nobody else anything", () => {
    for (const name of Object.keys(actions) as CaseActionName[]) {
      expect(mayTake("decider", name), name).toBe(true);
      expect(mayTake("commenter", name), name).toBe(name === "comment");
      expect(mayTake("none", name), name).toBe(false);
    }
  });
});

describe("the request body", () => {
  const issues = (body: unknown) => {
    const r = caseActionSchema.safeParse(body);
    return r.success ? [] : r.error.issues.map((i) => i.path.join("."));
  };

  it("accepts every action with its values and the expected version", () => {
    for (const body of Object.values(actions)) expect(issues(body), body.action).toEqual([]);
  });

  it("a decision needs a written reason of at least 10 characters", () => {
    expect(issues({ action: "decide", decision: "inconclusive", expectedVersion: 3 })).toEqual(["reason"]);
    expect(
      issues({ action: "decide", decision: "inconclusive", reason: "  lab   ", expectedVersion: 3 }),
    ).toEqual(["reason"]);
    expect(
      issues({ action: "decide", decision: "inconclusive", reason: "Lab sample sent", expectedVersion: 3 }),
    ).toEqual([]);
  });

  it("a decision must be one of the three", () => {
    expect(
      issues({ action: "decide", decision: "maybe", reason: "Lab sample sent", expectedVersion: 3 }),
    ).toEqual(["decision"]);
  });

  it("a reopen needs a reason too", () => {
    expect(issues({ action: "reopen", reason: "again", expectedVersion: 3 })).toEqual(["reason"]);
  });

  it("a comment is 1 to 4000 characters after trimming", () => {
    expect(issues({ action: "comment", body: "   ", expectedVersion: 0 })).toEqual(["body"]);
    expect(issues({ action: "comment", body: "x".repeat(4000), expectedVersion: 0 })).toEqual([]);
    expect(issues({ action: "comment", body: "x".repeat(4001), expectedVersion: 0 })).toEqual(["body"]);
  });

  it("an assignee is a user id, and every action carries the version the client saw", () => {
    expect(issues({ action: "assign", userId: "bob", expectedVersion: 1 })).toEqual(["userId"]);
    expect(issues({ action: "close" })).toEqual(["expectedVersion"]);
    expect(issues({ action: "close", expectedVersion: -1 })).toEqual(["expectedVersion"]);
    expect(issues({ action: "archive", expectedVersion: 1 })).toEqual(["action"]);
  });
});
