import "server-only";
import { type Expression, type ExpressionBuilder, type SqlBool, sql } from "kysely";
import { z } from "zod";
import type { Actor } from "@/lib/auth/permissions";
import {
  dateFilter,
  flagFilter,
  type SortDir,
  type TableQuery,
  textFilter,
  uuidFilter,
} from "@/lib/tables/params";
import { db } from "../client";
import type { CaseStatus, Database } from "../schema";
import { accountVisibleTo } from "./access";
import { likePattern } from "./admin-users";

// The office tables of accounts, fields and digs: scoped to what the actor may read, sorted,
// filtered and paged in SQL, each with its total row count. The pages and the JSON routes under
// app/api/tables share these functions and specs.

export interface TablePage<R> {
  rows: R[];
  total: number;
}

function order(dir: SortDir) {
  return (ob: { asc(): { nullsLast(): unknown }; desc(): { nullsLast(): unknown } }) =>
    (dir === "asc" ? ob.asc() : ob.desc()).nullsLast() as never;
}

const names = (rows: string[] | null) => rows ?? [];

// ---------------------------------------------------------------------------------------------
// Accounts

export const accountTableSpec = {
  sorts: ["name", "locality", "fields", "digs", "openCases", "lastDig"] as const,
  defaultSort: "name" as const,
  defaultDir: "asc" as const,
  filters: z.object({ q: textFilter.optional(), repId: uuidFilter.optional() }),
};
export type AccountTableQuery = TableQuery<
  (typeof accountTableSpec.sorts)[number],
  z.output<typeof accountTableSpec.filters>
>;

export interface AccountTableRow {
  id: string;
  name: string;
  locality: string | null;
  reps: string[];
  growers: string[];
  fieldCount: number;
  digCount: number;
  openCaseCount: number;
  lastDigAt: Date | null;
}

function accountFilters(actor: Actor, filters: AccountTableQuery["filters"]) {
  return (eb: ExpressionBuilder<Database, "account">) => {
    const and: Expression<SqlBool>[] = [accountVisibleTo(actor)(eb)];
    if (filters.q) and.push(eb("account.name", "ilike", likePattern(filters.q)));
    if (filters.repId) {
      and.push(
        eb.exists(
          eb
            .selectFrom("accountRep")
            .whereRef("accountRep.accountId", "=", "account.id")
            .where("accountRep.userId", "=", filters.repId),
        ),
      );
    }
    return eb.and(and);
  };
}

const memberNames = (table: "accountRep" | "accountGrower") => (eb: ExpressionBuilder<Database, "account">) =>
  eb
    .selectFrom(table)
    .innerJoin("appUser", "appUser.id", `${table}.userId`)
    .select(sql<string[]>`array_agg(app_user.name order by app_user.name)`.as("names"))
    .whereRef(`${table}.accountId`, "=", "account.id");

export async function listAccountTable(
  actor: Actor,
  q: AccountTableQuery,
): Promise<TablePage<AccountTableRow>> {
  const where = accountFilters(actor, q.filters);
  const countRow = await db
    .selectFrom("account")
    .select((eb) => eb.fn.countAll<string>().as("n"))
    .where(where)
    .executeTakeFirstOrThrow();
  const sortRef = {
    name: "account.name",
    locality: "account.locality",
    fields: "fieldCount",
    digs: "digCount",
    openCases: "openCaseCount",
    lastDig: "lastDigAt",
  }[q.sort];
  const rows = await db
    .selectFrom("account")
    .select((eb) => [
      "account.id",
      "account.name",
      "account.locality",
      memberNames("accountRep")(eb).as("reps"),
      memberNames("accountGrower")(eb).as("growers"),
      eb
        .selectFrom("field")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("field.accountId", "=", "account.id")
        .where("field.deletedAt", "is", null)
        .as("fieldCount"),
      eb
        .selectFrom("digSite")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("digSite.accountId", "=", "account.id")
        .where("digSite.deletedAt", "is", null)
        .as("digCount"),
      eb
        .selectFrom("injuryCase")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("injuryCase.accountId", "=", "account.id")
        .where("injuryCase.deletedAt", "is", null)
        .where("injuryCase.status", "<>", "closed")
        .as("openCaseCount"),
      eb
        .selectFrom("digSite")
        .select((e) => e.fn.max("digSite.dugAt").as("m"))
        .whereRef("digSite.accountId", "=", "account.id")
        .where("digSite.deletedAt", "is", null)
        .as("lastDigAt"),
    ])
    .where(where)
    .orderBy(sql.ref(sortRef), order(q.dir))
    .orderBy("account.id")
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .execute();
  return {
    total: Number(countRow.n),
    rows: rows.map((r) => ({
      id: r.id,
      name: r.name,
      locality: r.locality,
      reps: names(r.reps),
      growers: names(r.growers),
      fieldCount: Number(r.fieldCount ?? 0),
      digCount: Number(r.digCount ?? 0),
      openCaseCount: Number(r.openCaseCount ?? 0),
      lastDigAt: r.lastDigAt ? new Date(r.lastDigAt) : null,
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Fields

export const fieldTableSpec = {
  sorts: ["name", "account", "area", "planted", "digs", "lastRootIndex", "flagged"] as const,
  defaultSort: "name" as const,
  defaultDir: "asc" as const,
  filters: z.object({
    q: textFilter.optional(),
    accountId: uuidFilter.optional(),
    hybrid: textFilter.optional(),
  }),
};
export type FieldTableQuery = TableQuery<
  (typeof fieldTableSpec.sorts)[number],
  z.output<typeof fieldTableSpec.filters>
>;

export interface FieldTableRow {
  id: string;
  name: string;
  accountId: string;
  accountName: string;
  areaAcres: number | null;
  hybrids: string[];
  plantedOn: string | null;
  digCount: number;
  lastRootIndex: number | null;
  flaggedCount: number;
}

// A dig counts as flagged when the rep flagged it or it has an injury case.
function digFlagged(eb: ExpressionBuilder<Database, "digSite">) {
  return eb.or([
    eb("digSite.flaggedByRep", "=", true),
    eb.exists(
      eb
        .selectFrom("injuryCase")
        .whereRef("injuryCase.digSiteId", "=", "digSite.id")
        .where("injuryCase.deletedAt", "is", null),
    ),
  ]);
}

function fieldFilters(actor: Actor, filters: FieldTableQuery["filters"]) {
  return (eb: ExpressionBuilder<Database, "field" | "account">) => {
    const and: Expression<SqlBool>[] = [
      accountVisibleTo(actor)(eb as never),
      eb("field.deletedAt", "is", null),
    ];
    if (filters.q) and.push(eb("field.name", "ilike", likePattern(filters.q)));
    if (filters.accountId) and.push(eb("field.accountId", "=", filters.accountId));
    if (filters.hybrid) {
      and.push(
        eb.exists(
          eb
            .selectFrom("planting")
            .whereRef("planting.fieldId", "=", "field.id")
            .where("planting.deletedAt", "is", null)
            .where("planting.hybrid", "=", filters.hybrid),
        ),
      );
    }
    return eb.and(and);
  };
}

export async function listFieldTable(actor: Actor, q: FieldTableQuery): Promise<TablePage<FieldTableRow>> {
  const where = fieldFilters(actor, q.filters);
  const countRow = await db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select((eb) => eb.fn.countAll<string>().as("n"))
    .where(where)
    .executeTakeFirstOrThrow();
  const sortRef = {
    name: "field.name",
    account: "account.name",
    area: "field.areaAcres",
    planted: "plantedOn",
    digs: "digCount",
    lastRootIndex: "lastRootIndex",
    flagged: "flaggedCount",
  }[q.sort];
  const rows = await db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select((eb) => [
      "field.id",
      "field.name",
      "field.accountId",
      "account.name as accountName",
      "field.areaAcres",
      eb
        .selectFrom("planting")
        .select(sql<string[]>`array_agg(distinct planting.hybrid order by planting.hybrid)`.as("h"))
        .whereRef("planting.fieldId", "=", "field.id")
        .where("planting.deletedAt", "is", null)
        .as("hybrids"),
      eb
        .selectFrom("planting")
        .select((e) => e.fn.min("planting.plantedOn").as("d"))
        .whereRef("planting.fieldId", "=", "field.id")
        .where("planting.deletedAt", "is", null)
        .as("plantedOn"),
      eb
        .selectFrom("digSite")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("digSite.fieldId", "=", "field.id")
        .where("digSite.deletedAt", "is", null)
        .as("digCount"),
      eb
        .selectFrom("digSite")
        .select("digSite.rootIndex")
        .whereRef("digSite.fieldId", "=", "field.id")
        .where("digSite.deletedAt", "is", null)
        .where("digSite.rootIndex", "is not", null)
        .orderBy("digSite.dugAt", "desc")
        .limit(1)
        .as("lastRootIndex"),
      eb
        .selectFrom("digSite")
        .select(eb.fn.countAll<string>().as("n"))
        .whereRef("digSite.fieldId", "=", "field.id")
        .where("digSite.deletedAt", "is", null)
        .where(digFlagged)
        .as("flaggedCount"),
    ])
    .where(where)
    .orderBy(sql.ref(sortRef), order(q.dir))
    .orderBy("field.id")
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .execute();
  return {
    total: Number(countRow.n),
    rows: rows.map((r) => ({
      id: r.id,
      name: r.name,
      accountId: r.accountId,
      accountName: r.accountName,
      areaAcres: r.areaAcres,
      hybrids: names(r.hybrids),
      plantedOn: r.plantedOn ?? null,
      digCount: Number(r.digCount ?? 0),
      lastRootIndex: r.lastRootIndex ?? null,
      flaggedCount: Number(r.flaggedCount ?? 0),
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Digs

export const digTableSpec = {
  sorts: ["date", "field", "account", "rep", "hybrid", "stage", "rootIndex", "flags"] as const,
  defaultSort: "date" as const,
  defaultDir: "desc" as const,
  filters: z.object({
    from: dateFilter.optional(),
    to: dateFilter.optional(),
    accountId: uuidFilter.optional(),
    fieldId: uuidFilter.optional(),
    hybrid: textFilter.optional(),
    repId: uuidFilter.optional(),
    flagged: flagFilter.optional(),
  }),
};
export type DigTableQuery = TableQuery<
  (typeof digTableSpec.sorts)[number],
  z.output<typeof digTableSpec.filters>
>;

export interface DigTableRow {
  id: string;
  dugAt: Date;
  fieldId: string;
  fieldName: string;
  accountId: string;
  accountName: string;
  repName: string | null;
  hybrid: string | null;
  leafCollars: number | null;
  rootIndex: number | null;
  flagCount: number;
  flaggedByRep: boolean;
  caseId: string | null;
  caseStatus: CaseStatus | null;
}

type DigTables = "digSite" | "field" | "account" | "planting" | "appUser";

function digFilters(actor: Actor, filters: DigTableQuery["filters"]) {
  return (eb: ExpressionBuilder<Database, DigTables>) => {
    const and: Expression<SqlBool>[] = [
      accountVisibleTo(actor)(eb as never),
      eb("digSite.deletedAt", "is", null),
    ];
    // Days are calendar days in UTC, the server's clock.
    if (filters.from) and.push(eb("digSite.dugAt", ">=", sql<Date>`${filters.from}::date`));
    if (filters.to) and.push(eb("digSite.dugAt", "<", sql<Date>`${filters.to}::date + 1`));
    if (filters.accountId) and.push(eb("digSite.accountId", "=", filters.accountId));
    if (filters.fieldId) and.push(eb("digSite.fieldId", "=", filters.fieldId));
    if (filters.hybrid) and.push(eb("planting.hybrid", "=", filters.hybrid));
    if (filters.repId) and.push(eb("digSite.repId", "=", filters.repId));
    if (filters.flagged) and.push(digFlagged(eb as never));
    return eb.and(and);
  };
}

function digBase() {
  return db
    .selectFrom("digSite")
    .innerJoin("field", "field.id", "digSite.fieldId")
    .innerJoin("account", "account.id", "digSite.accountId")
    .leftJoin("planting", "planting.id", "digSite.plantingId")
    .leftJoin("appUser", "appUser.id", "digSite.repId");
}

export async function listDigTable(actor: Actor, q: DigTableQuery): Promise<TablePage<DigTableRow>> {
  const where = digFilters(actor, q.filters);
  const countRow = await digBase()
    .select((eb) => eb.fn.countAll<string>().as("n"))
    .where(where)
    .executeTakeFirstOrThrow();
  const sortRef = {
    date: "digSite.dugAt",
    field: "field.name",
    account: "account.name",
    rep: "appUser.name",
    hybrid: "planting.hybrid",
    stage: "leafCollars",
    rootIndex: "digSite.rootIndex",
    flags: "flagCount",
  }[q.sort];
  const rows = await digBase()
    .select((eb) => [
      "digSite.id",
      "digSite.dugAt",
      "digSite.fieldId",
      "field.name as fieldName",
      "digSite.accountId",
      "account.name as accountName",
      "appUser.name as repName",
      "planting.hybrid",
      sql<number | null>`(dig_site.assessment->>'leafCollars')::int`.as("leafCollars"),
      "digSite.rootIndex",
      sql<number>`coalesce(jsonb_array_length(dig_site.assessment->'flags'), 0)`.as("flagCount"),
      "digSite.flaggedByRep",
      eb
        .selectFrom("injuryCase")
        .select("injuryCase.id")
        .whereRef("injuryCase.digSiteId", "=", "digSite.id")
        .where("injuryCase.deletedAt", "is", null)
        .orderBy("injuryCase.createdAt", "desc")
        .limit(1)
        .as("caseId"),
      eb
        .selectFrom("injuryCase")
        .select("injuryCase.status")
        .whereRef("injuryCase.digSiteId", "=", "digSite.id")
        .where("injuryCase.deletedAt", "is", null)
        .orderBy("injuryCase.createdAt", "desc")
        .limit(1)
        .as("caseStatus"),
    ])
    .where(where)
    .orderBy(sql.ref(sortRef), order(q.dir))
    .orderBy("digSite.id")
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .execute();
  return {
    total: Number(countRow.n),
    rows: rows.map((r) => ({
      id: r.id,
      dugAt: r.dugAt,
      fieldId: r.fieldId,
      fieldName: r.fieldName,
      accountId: r.accountId,
      accountName: r.accountName,
      repName: r.repName ?? null,
      hybrid: r.hybrid ?? null,
      leafCollars: r.leafCollars ?? null,
      rootIndex: r.rootIndex,
      flagCount: Number(r.flagCount ?? 0),
      flaggedByRep: r.flaggedByRep,
      caseId: r.caseId ?? null,
      caseStatus: (r.caseStatus as CaseStatus | null) ?? null,
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// Choices for the filter forms, from what the actor may see.

export interface FilterOption {
  value: string;
  label: string;
}

export async function listVisibleAccountOptions(actor: Actor): Promise<FilterOption[]> {
  const rows = await db
    .selectFrom("account")
    .select(["account.id", "account.name"])
    .where(accountVisibleTo(actor))
    .orderBy("account.name")
    .execute();
  return rows.map((r) => ({ value: r.id, label: r.name }));
}

export async function listVisibleRepOptions(actor: Actor): Promise<FilterOption[]> {
  const rows = await db
    .selectFrom("account")
    .innerJoin("accountRep", "accountRep.accountId", "account.id")
    .innerJoin("appUser", "appUser.id", "accountRep.userId")
    .select(["appUser.id", "appUser.name"])
    .distinct()
    .where(accountVisibleTo(actor))
    .orderBy("appUser.name")
    .execute();
  return rows.map((r) => ({ value: r.id, label: r.name }));
}

export async function listVisibleHybridOptions(actor: Actor): Promise<FilterOption[]> {
  const rows = await db
    .selectFrom("planting")
    .innerJoin("account", "account.id", "planting.accountId")
    .select("planting.hybrid")
    .distinct()
    .where(accountVisibleTo(actor))
    .where("planting.deletedAt", "is", null)
    .orderBy("planting.hybrid")
    .execute();
  return rows.map((r) => ({ value: r.hybrid, label: r.hybrid }));
}

export async function listVisibleFieldOptions(actor: Actor, accountId?: string): Promise<FilterOption[]> {
  let query = db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select(["field.id", "field.name", "account.name as accountName"])
    .where(accountVisibleTo(actor))
    .where("field.deletedAt", "is", null);
  if (accountId) query = query.where("field.accountId", "=", accountId);
  const rows = await query.orderBy("account.name").orderBy("field.name").execute();
  return rows.map((r) => ({ value: r.id, label: `${r.name} (${r.accountName})` }));
}

// The accounts a grower owns, for sending them to their farm.
export async function listGrownAccountIds(userId: string): Promise<string[]> {
  const rows = await db
    .selectFrom("accountGrower")
    .select("accountId")
    .where("userId", "=", userId)
    .execute();
  return rows.map((r) => r.accountId);
}

// The reps and growers of one account, by name.
export async function listAccountPeople(
  accountId: string,
): Promise<{ reps: { id: string; name: string }[]; growers: { id: string; name: string }[] }> {
  const [reps, growers] = await Promise.all(
    (["accountRep", "accountGrower"] as const).map((table) =>
      db
        .selectFrom(table)
        .innerJoin("appUser", "appUser.id", `${table}.userId`)
        .select(["appUser.id", "appUser.name"])
        .where(`${table}.accountId`, "=", accountId)
        .orderBy("appUser.name")
        .execute(),
    ),
  );
  return { reps: reps ?? [], growers: growers ?? [] };
}
