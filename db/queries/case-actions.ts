import "server-only";
import { sql } from "kysely";
import type { Actor } from "@/lib/auth/permissions";
import {
  type CaseAction,
  type CaseDecision,
  type CaseRole,
  caseRoleOf,
  mayTake,
  transition,
} from "@/lib/cases/workflow";
import { db } from "../client";
import type { CaseStatus, InjuryCase } from "../schema";
import { findAccountAccess } from "./access";
import { nextVersion } from "./versioning";

// The write side of injury cases: one workflow action (lib/cases/workflow.ts) applied in ONE
// transaction under the case row's lock — the case row changes with the region's next sync version
// and exactly one injury_case_event row records who did what. The event table is append-only in
// PostgreSQL (a trigger refuses UPDATE, DELETE and TRUNCATE from every role), so the timeline is the
// audit trail. The app connects as the owner of its tables (scripts/services.ts), so privileges can't
// do this (an owner may always grant itself UPDATE again): the trigger is the enforcement, and only
// DDL by the owner (disabling or dropping the trigger) gets past it.

export interface CaseSummary {
  id: string;
  digSiteId: string;
  accountId: string;
  status: CaseStatus;
  severity: InjuryCase["severity"];
  decision: CaseDecision | null;
  decisionReason: string | null;
  assignedTo: string | null;
  sharedWithGrower: boolean;
  decidedAt: string | null;
  updatedAt: string;
  version: number;
}

export interface CaseEventView {
  id: string;
  kind: string;
  actor: { id: string; name: string } | null;
  body: string | null;
  payload: unknown;
  createdAt: string;
}

export type CaseActionResult =
  | { ok: true; case: CaseSummary; event: CaseEventView }
  | { ok: false; status: 403 | 404; error: string }
  | { ok: false; status: 409; error: string; case: CaseSummary }
  | { ok: false; status: 422; error: string; issues: { path: string; message: string }[] };

function summary(row: InjuryCase): CaseSummary {
  return {
    id: row.id,
    digSiteId: row.digSiteId,
    accountId: row.accountId,
    status: row.status,
    severity: row.severity,
    decision: row.decision,
    decisionReason: row.decisionReason,
    assignedTo: row.assignedTo,
    sharedWithGrower: row.sharedWithGrower,
    decidedAt: row.decidedAt ? row.decidedAt.toISOString() : null,
    updatedAt: row.updatedAt.toISOString(),
    version: row.version,
  };
}

const NOT_FOUND = { ok: false, status: 404, error: "No such case." } as const;

/**
 * Applies one workflow action for `actor`. Contract:
 * - Not visible to the actor (another region, another farm, a grower's unshared case) → 404;
 *   visible but the action is not theirs (a rep deciding) → 403.
 * - Optimistic concurrency: `expectedVersion` must equal the case's version, else 409 with the
 *   current case (nothing written); a comment is appended whatever the version. An action the
 *   case's status does not allow is also 409 with the current case.
 * - An assignee who is not an active supervisor of the case's region → 422 on `userId`.
 * - Otherwise the case row (except for a comment, which changes only the timeline) takes the
 *   region's next version, and one event row is inserted, both in one transaction. Not idempotent:
 *   a retry with the same expectedVersion after success answers 409.
 */
export async function applyCaseAction(
  actor: Actor,
  caseId: string,
  action: CaseAction,
): Promise<CaseActionResult> {
  return db.transaction().execute(async (trx): Promise<CaseActionResult> => {
    const current = await trx
      .selectFrom("injuryCase")
      .selectAll()
      .where("id", "=", caseId)
      .where("deletedAt", "is", null)
      .forUpdate()
      .executeTakeFirst();
    if (!current) return NOT_FOUND;
    const access = await findAccountAccess(actor, current.accountId, trx);
    if (!access) return NOT_FOUND;
    const role = caseRoleOf(actor, access, current.sharedWithGrower);
    if (role === "none") return NOT_FOUND;
    if (!mayTake(role, action.action)) {
      return { ok: false, status: 403, error: "Only a supervisor of this region can do that." };
    }
    // A comment changes no column of the case, so it never goes stale.
    if (action.action !== "comment" && current.version !== action.expectedVersion) {
      return {
        ok: false,
        status: 409,
        error: "Someone else changed this case since you opened it. Look at the current state and try again.",
        case: summary(current),
      };
    }
    if (action.action === "assign") {
      const assignee = await trx
        .selectFrom("appUser")
        .select("id")
        .where("id", "=", action.userId)
        .where("role", "=", "supervisor")
        .where("regionId", "=", access.regionId)
        .where("status", "=", "active")
        .executeTakeFirst();
      if (!assignee) {
        return {
          ok: false,
          status: 422,
          error: "Some values are not valid.",
          issues: [{ path: "userId", message: "Choose an active supervisor of this case's region." }],
        };
      }
    }
    const next = transition(current, action);
    if (!next.ok) return { ok: false, status: 409, error: next.error, case: summary(current) };

    const { patch, event } = next.change;
    let stored = current;
    const columns = Object.keys(patch);
    if (columns.length > 0) {
      const version = await nextVersion(trx, access.regionId);
      const { decidedAt, ...values } = patch;
      stored = await trx
        .updateTable("injuryCase")
        .set({
          ...values,
          ...(decidedAt === undefined ? {} : { decidedAt: decidedAt ? sql`now()` : null }),
          version,
          fieldVersions: sql`field_versions || ${JSON.stringify(
            Object.fromEntries(columns.map((c) => [c, version])),
          )}::jsonb`,
          updatedBy: actor.id,
          updatedAt: sql`now()`,
        })
        .where("id", "=", caseId)
        .returningAll()
        .executeTakeFirstOrThrow();
    }
    const inserted = await trx
      .insertInto("injuryCaseEvent")
      .values({
        caseId,
        actorId: actor.id,
        kind: event.kind,
        body: event.body,
        payload: JSON.stringify(event.payload),
      })
      .returning(["id", "createdAt"])
      .executeTakeFirstOrThrow();
    const name = await trx.selectFrom("appUser").select("name").where("id", "=", actor.id).executeTakeFirst();
    return {
      ok: true,
      case: summary(stored),
      event: {
        id: String(inserted.id),
        kind: event.kind,
        actor: { id: actor.id, name: name?.name ?? "" },
        body: event.body,
        payload: event.payload,
        createdAt: inserted.createdAt.toISOString(),
      },
    };
  });
}

export type CaseTimeline = { case: CaseSummary; role: Exclude<CaseRole, "none">; events: CaseEventView[] };

/** The case and its events, oldest first, when the actor may read it (else undefined: 404). */
export async function findCaseTimeline(actor: Actor, caseId: string): Promise<CaseTimeline | undefined> {
  const current = await db
    .selectFrom("injuryCase")
    .selectAll()
    .where("id", "=", caseId)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
  if (!current) return undefined;
  const access = await findAccountAccess(actor, current.accountId);
  if (!access) return undefined;
  const role = caseRoleOf(actor, access, current.sharedWithGrower);
  if (role === "none") return undefined;
  const rows = await db
    .selectFrom("injuryCaseEvent as e")
    .leftJoin("appUser as u", "u.id", "e.actorId")
    .select(["e.id", "e.kind", "e.actorId", "u.name as actorName", "e.body", "e.payload", "e.createdAt"])
    .where("e.caseId", "=", caseId)
    .orderBy("e.createdAt")
    .orderBy("e.id")
    .execute();
  return {
    case: summary(current),
    role,
    events: rows.map((r) => ({
      id: String(r.id),
      kind: r.kind,
      actor: r.actorId ? { id: r.actorId, name: r.actorName ?? "" } : null,
      body: r.body,
      payload: r.payload,
      createdAt: r.createdAt.toISOString(),
    })),
  };
}

export interface Recipient {
  email: string;
  name: string;
}

export interface CaseNoticeContext {
  caseId: string;
  status: CaseStatus;
  severity: InjuryCase["severity"];
  decision: CaseDecision | null;
  decisionReason: string | null;
  accountName: string;
  fieldName: string;
  dugAt: Date;
  repName: string | null;
  openedBody: string | null;
  // The region's active supervisors (a new case).
  supervisors: Recipient[];
  // The rep who dug, or when unknown or inactive the account's active reps (a decision).
  reps: Recipient[];
  // The account's active growers (a shared case).
  growers: Recipient[];
}

/** Everything the case e-mails say and whom they go to, read after the case's change committed. */
export async function findCaseNoticeContext(caseId: string): Promise<CaseNoticeContext | undefined> {
  const c = await db
    .selectFrom("injuryCase as ic")
    .innerJoin("account as a", "a.id", "ic.accountId")
    .innerJoin("digSite as ds", "ds.id", "ic.digSiteId")
    .innerJoin("field as f", "f.id", "ds.fieldId")
    .leftJoin("appUser as rep", (j) => j.onRef("rep.id", "=", "ds.repId").on("rep.status", "=", "active"))
    .select([
      "ic.id",
      "ic.status",
      "ic.severity",
      "ic.decision",
      "ic.decisionReason",
      "ic.accountId",
      "a.name as accountName",
      "a.regionId",
      "f.name as fieldName",
      "ds.dugAt",
      "rep.name as repName",
      "rep.email as repEmail",
    ])
    .where("ic.id", "=", caseId)
    .executeTakeFirst();
  if (!c) return undefined;
  const opened = await db
    .selectFrom("injuryCaseEvent")
    .select("body")
    .where("caseId", "=", caseId)
    .where("kind", "=", "opened")
    .orderBy("id")
    .executeTakeFirst();
  const users = db.selectFrom("appUser as u").select(["u.email", "u.name"]).where("u.status", "=", "active");
  const supervisors = await users
    .where("u.role", "=", "supervisor")
    .where("u.regionId", "=", c.regionId)
    .orderBy("u.email")
    .execute();
  const reps =
    c.repEmail && c.repName
      ? [{ email: c.repEmail, name: c.repName }]
      : await users
          .innerJoin("accountRep as ar", "ar.userId", "u.id")
          .where("ar.accountId", "=", c.accountId)
          .orderBy("u.email")
          .execute();
  const growers = await users
    .innerJoin("accountGrower as ag", "ag.userId", "u.id")
    .where("ag.accountId", "=", c.accountId)
    .orderBy("u.email")
    .execute();
  return {
    caseId: c.id,
    status: c.status,
    severity: c.severity,
    decision: c.decision,
    decisionReason: c.decisionReason,
    accountName: c.accountName,
    fieldName: c.fieldName,
    dugAt: c.dugAt,
    repName: c.repName,
    openedBody: opened?.body ?? null,
    supervisors,
    reps,
    growers,
  };
}
