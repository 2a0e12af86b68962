import "server-only";
import { type SqlBool, sql } from "kysely";
import { z } from "zod";
import type { DigAssessment } from "@/lib/agronomy";
import { type AccountAccess, type Actor, can } from "@/lib/auth/permissions";
import { isRecordId } from "@/lib/records/schemas";
import { type TableQuery, type TableSpec, textFilter, uuidFilter } from "@/lib/tables/params";
import { db } from "../client";
import type { CaseStatus, InjuryCase, Placement } from "../schema";
import { accountVisibleTo, findAccountAccess } from "./access";

// The read side of injury cases: the supervisor's queue (sorted, filtered and paged in SQL) and
// everything the case page and the evidence file show. Writes live in lib/cases/workflow.ts.

export const CASE_STATUSES = [
  "new",
  "in_review",
  "decided",
  "closed",
] as const satisfies readonly CaseStatus[];
export const CASE_SEVERITIES = ["critical", "warning", "caution"] as const;
export type CaseSeverity = InjuryCase["severity"];
export type CaseDecision = NonNullable<InjuryCase["decision"]>;
export const CASE_SORTS = ["queue", "opened", "severity", "status", "account", "rep", "hybrid"] as const;
export type CaseSort = (typeof CASE_SORTS)[number];
export const CASE_EXPORT_LIMIT = 10_000;

const ageFilter = z.coerce.number().int().min(0).max(3650);

/** The queue's table state in the URL (lib/tables/params.ts): "queue" is undecided first, oldest first. */
export const caseTableSpec = {
  sorts: CASE_SORTS,
  defaultSort: "queue",
  defaultDir: "asc",
  filters: z.object({
    status: z.enum(CASE_STATUSES).optional(),
    severity: z.enum(CASE_SEVERITIES).optional(),
    account: uuidFilter.optional(),
    rep: uuidFilter.optional(),
    hybrid: textFilter.optional(),
    minAge: ageFilter.optional(),
    maxAge: ageFilter.optional(),
  }),
} satisfies TableSpec<CaseSort, z.ZodObject>;

export type CaseFilters = z.output<typeof caseTableSpec.filters>;
export type CaseListQuery = Pick<
  TableQuery<CaseSort, CaseFilters>,
  "sort" | "dir" | "page" | "pageSize" | "filters"
>;

export interface CaseRow {
  id: string;
  status: CaseStatus;
  severity: CaseSeverity;
  decision: CaseDecision | null;
  openedAt: string;
  ageDays: number;
  accountId: string;
  accountName: string;
  fieldName: string;
  repName: string | null;
  hybrid: string | null;
  assignedToName: string | null;
  digSiteId: string;
  version: number;
}

export interface CaseList {
  rows: CaseRow[];
  total: number;
  page: number;
  pageSize: number;
  /** Cases per status in the actor's scope under every filter but the status one. */
  counts: Record<CaseStatus, number>;
}

const AGE_DAYS = sql<number>`floor(extract(epoch from (now() - ic.created_at)) / 86400)::int`;
const SEVERITY_RANK = sql<number>`case ic.severity when 'critical' then 0 when 'warning' then 1 else 2 end`;
const STATUS_RANK = sql<number>`case ic.status when 'new' then 0 when 'in_review' then 1 when 'decided' then 2 else 3 end`;
const UNDECIDED_FIRST = sql<number>`case when ic.status in ('new', 'in_review') then 0 else 1 end`;

function baseQuery(actor: Actor) {
  return (
    db
      .selectFrom("injuryCase as ic")
      .innerJoin("account as a", "a.id", "ic.accountId")
      .innerJoin("digSite as ds", "ds.id", "ic.digSiteId")
      .innerJoin("field as f", "f.id", "ds.fieldId")
      .leftJoin("planting as p", "p.id", "ds.plantingId")
      .leftJoin("appUser as rep", "rep.id", "ds.repId")
      .leftJoin("appUser as asg", "asg.id", "ic.assignedTo")
      .where("ic.deletedAt", "is", null)
      // Cases the actor may read: the one account scope rule, and for a grower only shared cases.
      .where((eb) =>
        eb(
          "ic.accountId",
          "in",
          eb.selectFrom("account").select("account.id").where(accountVisibleTo(actor)),
        ),
      )
      .$if(actor.role === "grower", (q) => q.where("ic.sharedWithGrower", "=", true))
  );
}
type Base = ReturnType<typeof baseQuery>;

function applyFilters(q: Base, query: CaseFilters, withStatus: boolean): Base {
  let out = q;
  if (withStatus && query.status) out = out.where("ic.status", "=", query.status);
  if (query.severity) out = out.where("ic.severity", "=", query.severity);
  if (query.account) out = out.where("ic.accountId", "=", query.account);
  if (query.rep) out = out.where("ds.repId", "=", query.rep);
  if (query.hybrid) out = out.where(sql<SqlBool>`lower(p.hybrid) = lower(${query.hybrid})`);
  if (query.minAge !== undefined) out = out.where(sql<SqlBool>`${AGE_DAYS} >= ${query.minAge}`);
  if (query.maxAge !== undefined) out = out.where(sql<SqlBool>`${AGE_DAYS} <= ${query.maxAge}`);
  return out;
}

function orderExpression(sort: CaseSort) {
  switch (sort) {
    case "queue":
    case "opened":
      return sql`ic.created_at`;
    case "severity":
      return SEVERITY_RANK;
    case "status":
      return STATUS_RANK;
    case "account":
      return sql`lower(a.name)`;
    case "rep":
      return sql`lower(rep.name)`;
    case "hybrid":
      return sql`lower(p.hybrid)`;
  }
}

/**
 * The queue for the actor: one page of cases under the filters, the total and the counts by status.
 * Default order: undecided cases (new, in review) first, oldest first within each group; an explicit
 * sort breaks ties by the same rule, then by id, so pages never overlap.
 */
export async function listCases(actor: Actor, query: CaseListQuery): Promise<CaseList> {
  const { page, pageSize, filters } = query;
  let rowsQuery = applyFilters(baseQuery(actor), filters, true).select([
    "ic.id",
    "ic.status",
    "ic.severity",
    "ic.decision",
    "ic.createdAt",
    AGE_DAYS.as("ageDays"),
    "a.id as accountId",
    "a.name as accountName",
    "f.name as fieldName",
    "rep.name as repName",
    "p.hybrid",
    "asg.name as assignedToName",
    "ic.digSiteId",
    "ic.version",
  ]);
  const dir = query.dir === "desc" ? sql`desc nulls last` : sql`asc nulls last`;
  if (query.sort === "queue") {
    // Undecided first in either direction; the direction turns the age order around.
    rowsQuery = rowsQuery.orderBy(UNDECIDED_FIRST).orderBy(sql`ic.created_at ${dir}`);
  } else {
    rowsQuery = rowsQuery
      .orderBy(sql`${orderExpression(query.sort)} ${dir}`)
      .orderBy(UNDECIDED_FIRST)
      .orderBy("ic.createdAt");
  }
  rowsQuery = rowsQuery.orderBy("ic.id");

  const [rows, countRows] = await Promise.all([
    rowsQuery
      .limit(pageSize)
      .offset((page - 1) * pageSize)
      .execute(),
    applyFilters(baseQuery(actor), filters, false)
      .select(["ic.status", sql<number>`count(*)::int`.as("n")])
      .groupBy("ic.status")
      .execute(),
  ]);
  const counts: Record<CaseStatus, number> = { new: 0, in_review: 0, decided: 0, closed: 0 };
  for (const c of countRows) counts[c.status] = c.n;
  const total = filters.status
    ? counts[filters.status]
    : CASE_STATUSES.reduce((sum, s) => sum + counts[s], 0);
  return {
    rows: rows.map((r) => ({
      id: r.id,
      status: r.status,
      severity: r.severity,
      decision: r.decision,
      openedAt: r.createdAt.toISOString(),
      ageDays: r.ageDays,
      accountId: r.accountId,
      accountName: r.accountName,
      fieldName: r.fieldName,
      repName: r.repName,
      hybrid: r.hybrid,
      assignedToName: r.assignedToName,
      digSiteId: r.digSiteId,
      version: r.version,
    })),
    total,
    page,
    pageSize,
    counts,
  };
}

export interface CaseFilterOptions {
  accounts: { id: string; name: string }[];
  reps: { id: string; name: string }[];
  hybrids: string[];
}

/** The accounts, reps and hybrids that occur in the actor's cases, for the filter form. */
export async function listCaseFilterOptions(actor: Actor): Promise<CaseFilterOptions> {
  const [accounts, reps, hybrids] = await Promise.all([
    baseQuery(actor).select(["a.id", "a.name"]).distinct().orderBy("a.name").execute(),
    baseQuery(actor)
      .where("rep.id", "is not", null)
      .select(["rep.id", "rep.name"])
      .distinct()
      .orderBy("rep.name")
      .execute(),
    baseQuery(actor)
      .where("p.hybrid", "is not", null)
      .select("p.hybrid")
      .distinct()
      .orderBy("p.hybrid")
      .execute(),
  ]);
  return {
    accounts,
    reps: reps.flatMap((r) => (r.id && r.name ? [{ id: r.id, name: r.name }] : [])),
    hybrids: hybrids.flatMap((h) => (h.hybrid ? [h.hybrid] : [])),
  };
}

// ---------------------------------------------------------------------------------------------
// One case, with its evidence

export interface Person {
  id: string;
  name: string;
}

export interface CaseEvent {
  id: string;
  kind: "opened" | "status" | "assigned" | "comment" | "decision" | "shared" | "reopened";
  actor: Person | null;
  body: string | null;
  payload: unknown;
  /** For an assignment: the supervisor it went to. */
  assignee: string | null;
  createdAt: string;
}

export interface CaseFertilizerPass {
  id: string;
  plantingId: string | null;
  appliedOn: string;
  rate: number;
  rateUnit: "lb/ac" | "gal/ac";
  placement: Placement;
  intendedBesideIn: number | null;
  intendedBelowIn: number | null;
  notes: string | null;
  product: {
    chemistry: string;
    form: "liquid" | "dry" | "gas";
    gradeN: number;
    gradeP2o5: number;
    gradeK2o: number;
    gradeS: number;
  };
}

export interface CasePlant {
  id: string;
  position: number;
  leafStage: string;
  seedingDepthIn: number | null;
  crownDepthIn: number | null;
  mesocotyl: "healthy" | "discolored" | "damaged" | "severed" | null;
  seminalScore: number | null;
  nodalWhorls: number | null;
  nodalCount: number | null;
  longestNodalIn: number | null;
  seminalInjury: "none" | "slight" | "moderate" | "severe";
  nodalInjury: "none" | "slight" | "moderate" | "severe";
  findings: string[];
  bandBesideIn: number | null;
  bandBelowIn: number | null;
  rootIndex: number | null;
  notes: string | null;
}

export interface CasePhoto {
  id: string;
  dugPlantId: string | null;
  objectKey: string;
  sha256: string;
  capturedAt: string | null;
  caption: string | null;
  isIllustration: boolean;
  contentType: string;
  byteSize: number;
  width: number | null;
  height: number | null;
}

export interface CaseConflict {
  id: string;
  tableName: string;
  recordId: string;
  fieldName: string;
  serverValue: unknown;
  clientValue: unknown;
  serverUser: string | null;
  clientUser: string | null;
  clientReceivedAt: string;
  settledBy: string | null;
  settledAt: string | null;
  settledValue: unknown;
}

export interface CaseEvidence {
  case: {
    id: string;
    status: CaseStatus;
    severity: CaseSeverity;
    decision: CaseDecision | null;
    decisionReason: string | null;
    decidedAt: string | null;
    assignedTo: Person | null;
    sharedWithGrower: boolean;
    openedAt: string;
    version: number;
  };
  account: { id: string; name: string; regionId: string };
  dig: {
    id: string;
    dugAt: string;
    latitude: number | null;
    longitude: number | null;
    accuracyM: number | null;
    soilMoisture: string | null;
    soilTempF: number | null;
    irrigatedYet: boolean;
    rep: Person | null;
    recommendation: string | null;
    flaggedByRep: boolean;
    notes: string | null;
    rootIndex: number | null;
  };
  field: { id: string; name: string; boundary: unknown; soilTexture: string; areaAcres: number | null };
  planting: {
    id: string;
    hybrid: string;
    plantedOn: string;
    seedingRate: number;
    seedingDepthIn: number;
    rowSpacingIn: number;
    soilTexture: string;
  } | null;
  passes: CaseFertilizerPass[];
  plants: CasePlant[];
  photos: CasePhoto[];
  /** The assessment the server stored for the dig (lib/agronomy assessDig), or null. */
  assessment: DigAssessment | null;
  conflicts: CaseConflict[];
  events: CaseEvent[];
  /** What the actor may do here; the write routes check again. */
  allowed: { decide: boolean; comment: boolean };
  /** Supervisors of the account's region, for assignment (empty unless the actor may decide). */
  supervisors: Person[];
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);
const person = (id: string | null, name: string | null): Person | null =>
  id ? { id, name: name ?? "" } : null;

/** What the actor may do on a case they can read (comments: supervisor, rep, shared grower). */
export function caseAllowed(actor: Actor, access: AccountAccess, sharedWithGrower: boolean) {
  const resource = { kind: "case" as const, access, sharedWithGrower };
  const read = can(actor, "read", resource);
  return { read, decide: can(actor, "write", resource), comment: read };
}

/** Whether the case exists and the actor may read it (the case page's layout asks before streaming). */
export async function caseReadableBy(actor: Actor, caseId: string): Promise<boolean> {
  if (!isRecordId(caseId)) return false;
  const c = await db
    .selectFrom("injuryCase")
    .select(["accountId", "sharedWithGrower"])
    .where("id", "=", caseId)
    .where("deletedAt", "is", null)
    .executeTakeFirst();
  const access = c && (await findAccountAccess(actor, c.accountId));
  return Boolean(c && access && caseAllowed(actor, access, c.sharedWithGrower).read);
}

/** The case and everything behind it, or undefined when it does not exist or the actor may not read it. */
export async function getCaseEvidence(actor: Actor, caseId: string): Promise<CaseEvidence | undefined> {
  if (!isRecordId(caseId)) return undefined;
  const c = await db
    .selectFrom("injuryCase as ic")
    .leftJoin("appUser as asg", "asg.id", "ic.assignedTo")
    .select([
      "ic.id",
      "ic.status",
      "ic.severity",
      "ic.decision",
      "ic.decisionReason",
      "ic.decidedAt",
      "ic.assignedTo",
      "asg.name as assignedToName",
      "ic.sharedWithGrower",
      "ic.createdAt",
      "ic.version",
      "ic.accountId",
      "ic.digSiteId",
    ])
    .where("ic.id", "=", caseId)
    .where("ic.deletedAt", "is", null)
    .executeTakeFirst();
  if (!c) return undefined;
  const access = await findAccountAccess(actor, c.accountId);
  if (!access) return undefined;
  const allowed = caseAllowed(actor, access, c.sharedWithGrower);
  if (!allowed.read) return undefined;

  const dig = await db
    .selectFrom("digSite as ds")
    .innerJoin("account as a", "a.id", "ds.accountId")
    .innerJoin("field as f", "f.id", "ds.fieldId")
    .leftJoin("appUser as rep", "rep.id", "ds.repId")
    .select([
      "ds.id",
      "ds.dugAt",
      "ds.latitude",
      "ds.longitude",
      "ds.accuracyM",
      "ds.soilMoisture",
      "ds.soilTempF",
      "ds.irrigatedYet",
      "ds.repId",
      "rep.name as repName",
      "ds.recommendation",
      "ds.flaggedByRep",
      "ds.notes",
      "ds.rootIndex",
      "ds.assessment",
      "ds.plantingId",
      "a.id as accountId",
      "a.name as accountName",
      "a.regionId",
      "f.id as fieldId",
      "f.name as fieldName",
      "f.boundary",
      "f.soilTexture as fieldSoil",
      "f.areaAcres",
    ])
    .where("ds.id", "=", c.digSiteId)
    .executeTakeFirstOrThrow();

  const [planting, passes, plants, photos, events, supervisors] = await Promise.all([
    dig.plantingId
      ? db
          .selectFrom("planting")
          .select([
            "id",
            "hybrid",
            "plantedOn",
            "seedingRate",
            "seedingDepthIn",
            "rowSpacingIn",
            "soilTexture",
          ])
          .where("id", "=", dig.plantingId)
          .executeTakeFirst()
      : Promise.resolve(undefined),
    db
      .selectFrom("fertilizerPass as fp")
      .innerJoin("product as pr", "pr.id", "fp.productId")
      .select([
        "fp.id",
        "fp.plantingId",
        "fp.appliedOn",
        "fp.rate",
        "fp.rateUnit",
        "fp.placement",
        "fp.intendedBesideIn",
        "fp.intendedBelowIn",
        "fp.notes",
        "pr.chemistry",
        "pr.form",
        "pr.gradeN",
        "pr.gradeP2o5",
        "pr.gradeK2o",
        "pr.gradeS",
      ])
      .where("fp.fieldId", "=", dig.fieldId)
      .where("fp.deletedAt", "is", null)
      .orderBy("fp.appliedOn")
      .orderBy("fp.id")
      .execute(),
    db
      .selectFrom("dugPlant")
      .selectAll()
      .where("digSiteId", "=", dig.id)
      .where("deletedAt", "is", null)
      .orderBy("position")
      .orderBy("createdAt")
      .execute(),
    db
      .selectFrom("photo")
      .selectAll()
      .where("digSiteId", "=", dig.id)
      .where("deletedAt", "is", null)
      .orderBy("capturedAt")
      .orderBy("id")
      .execute(),
    listCaseEvents(c.id),
    allowed.decide
      ? db
          .selectFrom("appUser")
          .select(["id", "name"])
          .where("role", "=", "supervisor")
          .where("status", "=", "active")
          .where("regionId", "=", dig.regionId)
          .orderBy("name")
          .execute()
      : Promise.resolve([]),
  ]);

  const recordIds = [dig.id, ...plants.map((p) => p.id), ...photos.map((p) => p.id)];
  const conflicts = await db
    .selectFrom("syncConflict as sc")
    .leftJoin("appUser as su", "su.id", "sc.serverUserId")
    .leftJoin("appUser as cu", "cu.id", "sc.clientUserId")
    .leftJoin("appUser as sb", "sb.id", "sc.settledBy")
    .select([
      "sc.id",
      "sc.tableName",
      "sc.recordId",
      "sc.fieldName",
      "sc.serverValue",
      "sc.clientValue",
      "su.name as serverUser",
      "cu.name as clientUser",
      "sc.clientReceivedAt",
      "sb.name as settledBy",
      "sc.settledAt",
      "sc.settledValue",
    ])
    .where("sc.recordId", "in", recordIds)
    .orderBy("sc.clientReceivedAt")
    .orderBy("sc.id")
    .execute();

  return {
    case: {
      id: c.id,
      status: c.status,
      severity: c.severity,
      decision: c.decision,
      decisionReason: c.decisionReason,
      decidedAt: iso(c.decidedAt),
      assignedTo: person(c.assignedTo, c.assignedToName),
      sharedWithGrower: c.sharedWithGrower,
      openedAt: c.createdAt.toISOString(),
      version: c.version,
    },
    account: { id: dig.accountId, name: dig.accountName, regionId: dig.regionId },
    dig: {
      id: dig.id,
      dugAt: dig.dugAt.toISOString(),
      latitude: dig.latitude,
      longitude: dig.longitude,
      accuracyM: dig.accuracyM,
      soilMoisture: dig.soilMoisture,
      soilTempF: dig.soilTempF,
      irrigatedYet: dig.irrigatedYet,
      rep: person(dig.repId, dig.repName),
      recommendation: dig.recommendation,
      flaggedByRep: dig.flaggedByRep,
      notes: dig.notes,
      rootIndex: dig.rootIndex,
    },
    field: {
      id: dig.fieldId,
      name: dig.fieldName,
      boundary: dig.boundary,
      soilTexture: dig.fieldSoil,
      areaAcres: dig.areaAcres,
    },
    planting: planting ?? null,
    passes: passes.map((p) => ({
      id: p.id,
      plantingId: p.plantingId,
      appliedOn: p.appliedOn,
      rate: p.rate,
      rateUnit: p.rateUnit,
      placement: p.placement,
      intendedBesideIn: p.intendedBesideIn,
      intendedBelowIn: p.intendedBelowIn,
      notes: p.notes,
      product: {
        chemistry: p.chemistry,
        form: p.form,
        gradeN: p.gradeN,
        gradeP2o5: p.gradeP2o5,
        gradeK2o: p.gradeK2o,
        gradeS: p.gradeS,
      },
    })),
    plants: plants.map((p) => ({
      id: p.id,
      position: p.position,
      leafStage: p.leafStage,
      seedingDepthIn: p.seedingDepthIn,
      crownDepthIn: p.crownDepthIn,
      mesocotyl: p.mesocotyl,
      seminalScore: p.seminalScore,
      nodalWhorls: p.nodalWhorls,
      nodalCount: p.nodalCount,
      longestNodalIn: p.longestNodalIn,
      seminalInjury: p.seminalInjury,
      nodalInjury: p.nodalInjury,
      findings: p.findings,
      bandBesideIn: p.bandBesideIn,
      bandBelowIn: p.bandBelowIn,
      rootIndex: p.rootIndex,
      notes: p.notes,
    })),
    photos: photos.map((p) => ({
      id: p.id,
      dugPlantId: p.dugPlantId,
      objectKey: p.objectKey,
      sha256: p.sha256,
      capturedAt: iso(p.capturedAt),
      caption: p.caption,
      isIllustration: p.isIllustration,
      contentType: p.contentType,
      byteSize: p.byteSize,
      width: p.width,
      height: p.height,
    })),
    assessment: (dig.assessment as DigAssessment | null) ?? null,
    conflicts: conflicts.map((r) => ({
      id: r.id,
      tableName: r.tableName,
      recordId: r.recordId,
      fieldName: r.fieldName,
      serverValue: r.serverValue,
      clientValue: r.clientValue,
      serverUser: r.serverUser,
      clientUser: r.clientUser,
      clientReceivedAt: r.clientReceivedAt.toISOString(),
      settledBy: r.settledBy,
      settledAt: iso(r.settledAt),
      settledValue: r.settledValue,
    })),
    events,
    allowed: { decide: allowed.decide, comment: allowed.comment },
    supervisors,
  };
}

/** A case's events, oldest first, with who made each (the audit trail; rows are never changed). */
export async function listCaseEvents(caseId: string): Promise<CaseEvent[]> {
  const rows = await db
    .selectFrom("injuryCaseEvent as e")
    .leftJoin("appUser as u", "u.id", "e.actorId")
    .leftJoin("appUser as tu", (j) =>
      j.on(sql<SqlBool>`e.kind = 'assigned' and tu.id::text = e.payload ->> 'to'`),
    )
    .select([
      "e.id",
      "e.kind",
      "e.actorId",
      "u.name as actorName",
      "e.body",
      "e.payload",
      "tu.name as assignee",
      "e.createdAt",
    ])
    .where("e.caseId", "=", caseId)
    .orderBy("e.createdAt")
    .orderBy("e.id")
    .execute();
  return rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    actor: person(r.actorId, r.actorName),
    body: r.body,
    payload: r.payload,
    assignee: r.assignee,
    createdAt: r.createdAt.toISOString(),
  }));
}

const grade = (x: number) => String(Math.round(x * 100) / 100);

/** A product by chemistry and grade, e.g. "ammonium polyphosphate 10-34-0". */
export function productGradeLabel(p: CaseFertilizerPass["product"]): string {
  const npk = [p.gradeN, p.gradeP2o5, p.gradeK2o].map(grade).join("-");
  return `${p.chemistry} ${npk}${p.gradeS > 0 ? `-${grade(p.gradeS)}S` : ""}`;
}
