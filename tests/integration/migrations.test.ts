// The migrations on a fresh database set up as `npm start` does (scripts/services.ts): run by the
// owner role all the way up, all the way down leaving no application table behind, and up again;
// the app's role owns nothing and cannot change, delete or switch off the injury case audit trail,
// which also refuses UPDATE, DELETE and TRUNCATE from the owner. And a database from before the
// owner role (everything owned by the app's role) is handed over by the next start.
import { randomUUID } from "node:crypto";
import { type Kysely, sql } from "kysely";
import pg from "pg";
import { register } from "tsx/esm/api";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import { createMigrator, migrate } from "@/db/migrate";
import type { Database } from "@/db/schema";
import { env } from "@/lib/env";
import { ensureDatabase, serviceConfig } from "../../scripts/services";
import { testEnv } from "../helpers/env";

const DB_NAME = "trenchbook_migration_check";
const LEGACY_DB_NAME = "trenchbook_migration_legacy";
const appRole = decodeURIComponent(new URL(testEnv.databaseUrl).username);
const ownerRole = decodeURIComponent(new URL(testEnv.migrationDatabaseUrl).username);
const inDb = (base: string, name: string) => {
  const url = new URL(base);
  url.pathname = `/${name}`;
  return url.toString();
};
const checkUrl = inDb(testEnv.databaseUrl, DB_NAME);
const ownerCheckUrl = inDb(testEnv.migrationDatabaseUrl, DB_NAME);
const cfgFor = (dbName: string) => ({ ...serviceConfig(env), dbName });

// The tables the foundation migrations create (later migrations may add more).
const APP_TABLES = [
  "account",
  "account_grower",
  "account_rep",
  "app_user",
  "dig_site",
  "dug_plant",
  "fertilizer_pass",
  "field",
  "injury_case",
  "injury_case_event",
  "one_time_token",
  "photo",
  "planting",
  "product",
  "region",
  "sign_in_attempt",
  "sync_client",
  "sync_client_group",
  "sync_conflict",
  "sync_cursor",
  "sync_mutation_result",
  "weather_daily",
  "weather_station",
];

async function asSuperuser(statement: string) {
  const client = new pg.Client({ connectionString: testEnv.superuserUrl });
  await client.connect();
  try {
    await client.query(statement);
  } finally {
    await client.end();
  }
}

const dropCheckDatabase = async () => {
  for (const name of [DB_NAME, LEGACY_DB_NAME]) {
    await asSuperuser(`drop database if exists ${pg.escapeIdentifier(name)} with (force)`);
  }
};

// The owner role runs the migrations; `db` is the app's role, as the app connects.
let ownerDb: Kysely<Database>;
let db: Kysely<Database>;
let tablesAfterUp: string[] = [];

// Tables in the public schema, apart from the migrator's own bookkeeping.
async function appTables(): Promise<string[]> {
  const rows = await sql<{ name: string }>`
    select table_name as name from information_schema.tables
    where table_schema = 'public' and table_type = 'BASE TABLE' and table_name not like 'kysely_migration%'
    order by table_name`.execute(db);
  return rows.rows.map((r) => r.name);
}

async function appFunctions(): Promise<string[]> {
  const rows = await sql<{ name: string }>`
    select p.proname as name from pg_proc p join pg_namespace n on n.oid = p.pronamespace
    where n.nspname = 'public'`.execute(db);
  return rows.rows.map((r) => r.name);
}

// Kysely loads each migration file with Node's own import(), which cannot read TypeScript; under
// Vitest that needs tsx's loader, as `npm run migrate` has.
let unregisterTsx: (() => Promise<void>) | undefined;

beforeAll(async () => {
  unregisterTsx = register();
  await dropCheckDatabase();
  await ensureDatabase(cfgFor(DB_NAME));
  ownerDb = createDb(ownerCheckUrl, 2);
  db = createDb(checkUrl, 2);
});

afterAll(async () => {
  await db?.destroy();
  await ownerDb?.destroy();
  await dropCheckDatabase();
  await unregisterTsx?.();
});

describe("migrations on a fresh database", () => {
  it("starts empty", async () => {
    expect(await appTables()).toEqual([]);
  });

  it("migrates up as the owner role and creates every application table, owned by it", async () => {
    await migrate(ownerDb);
    tablesAfterUp = await appTables();
    expect(tablesAfterUp).toEqual(expect.arrayContaining(APP_TABLES));
    const { rows } = await sql<{ owner: string }>`
      select distinct tableowner as owner from pg_tables where schemaname = 'public'`.execute(db);
    expect(rows.map((r) => r.owner)).toEqual([ownerRole]);
    expect(ownerRole).not.toBe(appRole);
  });

  it("leaves the app's role owning nothing and unable to change the schema", async () => {
    expect(await objectsOwnedBy(db, appRole)).toEqual([]);
    const { rows } = await sql<{ owner: string }>`
      select pg_get_userbyid(datdba) as owner from pg_database where datname = current_database()`.execute(
      db,
    );
    expect(rows[0]?.owner).toBe(ownerRole);
    await expect(sql`create table intruder (id int)`.execute(db)).rejects.toThrow(/permission denied/);
    await expect(sql`alter table region add column intruder int`.execute(db)).rejects.toThrow(
      /must be owner/,
    );
    await expect(sql`select count(*) from kysely_migration`.execute(db)).rejects.toThrow(/permission denied/);
  });

  it("is idempotent: setting up and migrating up again changes nothing", async () => {
    await ensureDatabase(cfgFor(DB_NAME));
    await migrate(ownerDb);
    expect(await appTables()).toEqual(tablesAfterUp);
    expect(await objectsOwnedBy(db, appRole)).toEqual([]);
  });

  it("resets all the way down, leaving no application table or function", async () => {
    await migrate(ownerDb, "reset");
    expect(await appTables()).toEqual([]);
    expect(await appFunctions()).not.toContain("injury_case_event_append_only");
    const { rows } = await sql<{ n: string }>`select count(*) as n from kysely_migration`.execute(ownerDb);
    expect(Number(rows[0]!.n)).toBe(0);
  });

  it("migrates up again after the reset", async () => {
    await migrate(ownerDb);
    expect(await appTables()).toEqual(tablesAfterUp);
    expect(await appFunctions()).toContain("injury_case_event_append_only");
  });
});

describe("the injury case audit trail", () => {
  let eventId = 0;

  beforeAll(async () => {
    const region = await db
      .insertInto("region")
      .values({ name: "Audit Flats" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const account = await db
      .insertInto("account")
      .values({ regionId: region.id, name: "Audit Farm" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const field = await db
      .insertInto("field")
      .values({ accountId: account.id, name: "Audit field" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const digSiteId = randomUUID();
    await db
      .insertInto("digSite")
      .values({ id: digSiteId, fieldId: field.id, accountId: account.id, dugAt: new Date() })
      .execute();
    const injuryCase = await db
      .insertInto("injuryCase")
      .values({ digSiteId, accountId: account.id, severity: "warning" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const event = await db
      .insertInto("injuryCaseEvent")
      .values({ caseId: injuryCase.id, kind: "opened", body: "Band found 0.5 in from the seed." })
      .returning("id")
      .executeTakeFirstOrThrow();
    eventId = Number(event.id);
  });

  it("accepts new events from the application's role, which does not own the table", async () => {
    const { rows } = await sql<{ n: string }>`select count(*) as n from injury_case_event`.execute(db);
    expect(Number(rows[0]!.n)).toBe(1);
    const who = await sql<{ role: string; owner: string }>`
      select current_user as role, tableowner as owner from pg_tables where tablename = 'injury_case_event'`.execute(
      db,
    );
    expect(who.rows[0]).toEqual({ role: appRole, owner: ownerRole });
  });

  it("refuses UPDATE, DELETE and TRUNCATE from the application's role: it holds no such privilege", async () => {
    await expect(
      db
        .updateTable("injuryCaseEvent")
        .set({ body: "rewritten" })
        .where("id", "=", String(eventId))
        .execute(),
    ).rejects.toThrow(/permission denied/);
    await expect(
      db.deleteFrom("injuryCaseEvent").where("id", "=", String(eventId)).execute(),
    ).rejects.toThrow(/permission denied/);
    await expect(sql`truncate injury_case_event`.execute(db)).rejects.toThrow(/permission denied/);
  });

  it("does not let the application's role switch the trigger off", async () => {
    await expect(sql`alter table injury_case_event disable trigger all`.execute(db)).rejects.toThrow(
      /must be owner/,
    );
    await expect(
      sql`alter table injury_case_event disable trigger injury_case_event_no_change`.execute(db),
    ).rejects.toThrow(/must be owner/);
  });

  it("refuses UPDATE, DELETE and TRUNCATE from the owner role too, by the trigger", async () => {
    await expect(
      ownerDb
        .updateTable("injuryCaseEvent")
        .set({ body: "rewritten" })
        .where("id", "=", String(eventId))
        .execute(),
    ).rejects.toThrow(/append-only/);
    await expect(
      ownerDb.deleteFrom("injuryCaseEvent").where("id", "=", String(eventId)).execute(),
    ).rejects.toThrow(/append-only/);
    await expect(sql`truncate injury_case_event`.execute(ownerDb)).rejects.toThrow(/append-only/);
  });

  it("still holds the event exactly as written", async () => {
    const row = await db.selectFrom("injuryCaseEvent").selectAll().executeTakeFirstOrThrow();
    expect(row.body).toBe("Band found 0.5 in from the seed.");
  });
});

describe("a database from before the owner role", () => {
  // Set up the old way: the database and every table owned by the app's role, migrated by it up to
  // the migration before the privilege split. The next start (ensureDatabase) hands it over.
  const SPLIT = "2026_12_02_1500_audit_trail_privileges";
  let legacyApp: Kysely<Database>;
  let legacyOwner: Kysely<Database>;

  beforeAll(async () => {
    await asSuperuser(
      `create database ${pg.escapeIdentifier(LEGACY_DB_NAME)} owner ${pg.escapeIdentifier(appRole)}`,
    );
    legacyApp = createDb(inDb(testEnv.databaseUrl, LEGACY_DB_NAME), 2);
    legacyOwner = createDb(inDb(testEnv.migrationDatabaseUrl, LEGACY_DB_NAME), 2);
    const migrator = createMigrator(legacyApp);
    const names = (await migrator.getMigrations()).map((m) => m.name);
    const before = names[names.indexOf(SPLIT) - 1];
    if (!before) throw new Error(`no migration before ${SPLIT}`);
    const { error } = await migrator.migrateTo(before);
    if (error) throw error;
  });

  afterAll(async () => {
    await legacyApp?.destroy();
    await legacyOwner?.destroy();
  });

  it("starts with the app's role owning the tables", async () => {
    expect(await objectsOwnedBy(legacyApp, appRole)).toEqual(expect.arrayContaining(["injury_case_event"]));
  });

  it("is handed to the owner role on the next start and keeps working for the app", async () => {
    await ensureDatabase(cfgFor(LEGACY_DB_NAME));
    await ensureDatabase(cfgFor(LEGACY_DB_NAME));
    await migrate(legacyOwner);
    expect(await objectsOwnedBy(legacyApp, appRole)).toEqual([]);
    const region = await legacyApp
      .insertInto("region")
      .values({ name: "Legacy Flats" })
      .returning("id")
      .executeTakeFirstOrThrow();
    const renamed = await legacyApp
      .updateTable("region")
      .set({ name: "Legacy Flats East" })
      .where("id", "=", region.id)
      .returning("name")
      .executeTakeFirstOrThrow();
    expect(renamed.name).toBe("Legacy Flats East");
    await legacyApp.deleteFrom("region").where("id", "=", region.id).execute();
    await expect(sql`alter table injury_case_event disable trigger all`.execute(legacyApp)).rejects.toThrow(
      /must be owner/,
    );
    await expect(sql`delete from injury_case_event`.execute(legacyApp)).rejects.toThrow(/permission denied/);
  });
});

// Relations, functions and types in the public schema that the role owns.
async function objectsOwnedBy(on: Kysely<Database>, role: string): Promise<string[]> {
  const { rows } = await sql<{ name: string }>`
    select c.relname as name from pg_class c join pg_namespace n on n.oid = c.relnamespace
    where n.nspname = 'public' and pg_get_userbyid(c.relowner) = ${role}
    union all
    select p.proname from pg_proc p join pg_namespace n on n.oid = p.pronamespace
    where n.nspname = 'public' and pg_get_userbyid(p.proowner) = ${role}
    union all
    select t.typname from pg_type t join pg_namespace n on n.oid = t.typnamespace
    where n.nspname = 'public' and pg_get_userbyid(t.typowner) = ${role}
    order by 1`.execute(on);
  return rows.map((r) => r.name);
}
