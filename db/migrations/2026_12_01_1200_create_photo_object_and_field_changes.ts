import { type Kysely, sql } from "kysely";

// Photo objects the server has verified in the bucket (size and SHA-256 of the bytes), so each object
// is checked once however many photo rows point at it; and, on the rows devices edit, the recent
// changes of each field (version, device client, user, time, digest of the value) for the
// field-by-field merge of sync/server/merge.ts. Frozen: this file imports nothing from the app.

const SYNCED = ["dig_site", "dug_plant", "photo"] as const;

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("photo_object")
    .addColumn("sha256", "text", (c) => c.primaryKey().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
    .addColumn("byte_size", "integer", (c) => c.notNull().check(sql`byte_size > 0`))
    .addColumn("confirmed_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  for (const table of SYNCED) {
    await db.schema
      .alterTable(table)
      .addColumn("field_changes", "jsonb", (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
      .execute();
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of SYNCED) {
    await db.schema.alterTable(table).dropColumn("field_changes").execute();
  }
  await db.schema.dropTable("photo_object").execute();
}
