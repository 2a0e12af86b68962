import "server-only";
import { CamelCasePlugin, Kysely, PostgresDialect } from "kysely";
import pg from "pg";
import { env } from "@/lib/env";
import type { Database } from "./schema";

// int8 → number (versions and counts stay well below 2^53); date → 'YYYY-MM-DD' string, never a
// JS Date shifted by the server's time zone.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number.parseInt(v, 10));
pg.types.setTypeParser(pg.types.builtins.DATE, (v) => v);

export function createDb(connectionString = env.DATABASE_URL, max = 10): Kysely<Database> {
  return new Kysely<Database>({
    dialect: new PostgresDialect({ pool: new pg.Pool({ connectionString, max }) }),
    plugins: [new CamelCasePlugin()],
  });
}

// One pool per server process; kept on globalThis so dev-mode reloads do not leak pools.
const globalForDb = globalThis as unknown as { trenchbookDb?: Kysely<Database> };
export const db: Kysely<Database> = globalForDb.trenchbookDb ?? createDb();
if (env.NODE_ENV !== "production") globalForDb.trenchbookDb = db;
