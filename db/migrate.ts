import "server-only";
import { promises as fs } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { FileMigrationProvider, type Kysely, Migrator, NO_MIGRATIONS } from "kysely";

const migrationFolder = path.join(path.dirname(fileURLToPath(import.meta.url)), "migrations");

export function createMigrator(db: Kysely<any>): Migrator {
  return new Migrator({
    db,
    provider: new FileMigrationProvider({ fs, path, migrationFolder }),
  });
}

// Runs every pending migration (or, with "down", undoes the last one / "reset" undoes all).
export async function migrate(db: Kysely<any>, direction: "latest" | "down" | "reset" = "latest") {
  const migrator = createMigrator(db);
  const run = async () => {
    if (direction === "latest") return migrator.migrateToLatest();
    if (direction === "down") return migrator.migrateDown();
    return migrator.migrateTo(NO_MIGRATIONS);
  };
  const { error, results } = await run();
  for (const r of results ?? []) {
    const verb = r.direction === "Up" ? "applied" : "reverted";
    console.log(`  migration ${r.migrationName} ${r.status === "Success" ? verb : r.status.toLowerCase()}`);
  }
  if (error) throw error instanceof Error ? error : new Error(String(error));
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  const { createDb } = await import("./client");
  const { env } = await import("@/lib/env");
  // As the owner role: the app's role may not change the schema (scripts/services.ts).
  const db = createDb(env.MIGRATION_DATABASE_URL);
  const arg = process.argv[2];
  try {
    await migrate(db, arg === "down" || arg === "reset" ? arg : "latest");
  } finally {
    await db.destroy();
  }
}
