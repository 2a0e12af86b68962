// The migrations on a fresh database owned by the application's role: all the way up, all the way
// down leaving no application table behind, and up again; and the injury case audit trail refuses
// UPDATE, DELETE and TRUNCATE even from the role that owns the table.
import { randomUUID } from "node:crypto";
import { type Kysely, sql } from "kysely";
import pg from "pg";
import { register } from "tsx/esm/api";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import { migrate } from "@/db/migrate";
import type { Database } from "@/db/schema";
import { testEnv } from "../helpers/env";

const DB_NAME = "trenchbook_migration_check";
const appRole = decodeURIComponent(new URL(testEnv.databaseUrl).username);
const checkUrl = (() => {
  const url = new URL(testEnv.databaseUrl);
  url.pathname = `/${DB_NAME}`;
  return url.toString();
})();

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

const dropCheckDatabase = () =>
  asSuperuser(`drop database if exists ${pg.escapeIdentifier(DB_NAME)} with (force)`);

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
  await asSuperuser(`create database ${pg.escapeIdentifier(DB_NAME)} owner ${pg.escapeIdentifier(appRole)}`);
  db = createDb(checkUrl, 2);
});

afterAll(async () => {
  await db?.destroy();
  await dropCheckDatabase();
  await unregisterTsx?.();
});

describe("migrations on a fresh database", () => {
  it("starts empty", async () => {
    expect(await appTables()).toEqual([]);
  });

  it("migrates up and creates every application table", async () => {
    await migrate(db);
    tablesAfterUp = await appTables();
    expect(tablesAfterUp).toEqual(expect.arrayContaining(APP_TABLES));
    const { rows } = await sql<{ owner: string }>`
      select distinct tableowner as owner from pg_tables where schemaname = 'public'`.execute(db);
    expect(rows.map((r) => r.owner)).toEqual([appRole]);
  });

  it("is idempotent: migrating up again changes nothing", async () => {
    await migrate(db);
    expect(await appTables()).toEqual(tablesAfterUp);
  });

  it("resets all the way down, leaving no application table or function", async () => {
    await migrate(db, "reset");
    expect(await appTables()).toEqual([]);
    expect(await appFunctions()).not.toContain("injury_case_event_append_only");
    const { rows } = await sql<{ n: string }>`select count(*) as n from kysely_migration`.execute(db);
    expect(Number(rows[0]!.n)).toBe(0);
  });

  it("migrates up again after the reset", async () => {
    await migrate(db);
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

  it("accepts new events, written by the application's role that owns the table", async () => {
    const { rows } = await sql<{ n: string }>`select count(*) as n from injury_case_event`.execute(db);
    expect(Number(rows[0]!.n)).toBe(1);
    const who = await sql<{ role: string; owner: string }>`
      select current_user as role, tableowner as owner from pg_tables where tablename = 'injury_case_event'`.execute(
      db,
    );
    expect(who.rows[0]).toEqual({ role: appRole, owner: appRole });
  });

  it("refuses UPDATE from the application's own role", async () => {
    await expect(
      db
        .updateTable("injuryCaseEvent")
        .set({ body: "rewritten" })
        .where("id", "=", String(eventId))
        .execute(),
    ).rejects.toThrow(/append-only/);
  });

  it("refuses DELETE from the application's own role", async () => {
    await expect(
      db.deleteFrom("injuryCaseEvent").where("id", "=", String(eventId)).execute(),
    ).rejects.toThrow(/append-only/);
  });

  it("refuses TRUNCATE from the application's own role", async () => {
    await expect(sql`truncate injury_case_event`.execute(db)).rejects.toThrow(/append-only/);
  });

  it("still holds the event exactly as written", async () => {
    const row = await db.selectFrom("injuryCaseEvent").selectAll().executeTakeFirstOrThrow();
    expect(row.body).toBe("Band found 0.5 in from the seed.");
  });
});
