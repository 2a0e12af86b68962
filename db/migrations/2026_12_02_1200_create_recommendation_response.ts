import { type Kysely, sql } from "kysely";

// A grower's answer to the recommendation on a dig, and the comments around it: 'acknowledged' (no
// body) or 'comment' (a body). Written in the office only (not synced to devices). Frozen: this file
// imports nothing from the app.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("recommendation_response")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("dig_site_id", "uuid", (c) => c.notNull().references("dig_site.id").onDelete("cascade"))
    .addColumn("user_id", "uuid", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
    .addColumn("kind", "text", (c) => c.notNull().check(sql`kind in ('acknowledged', 'comment')`))
    .addColumn("body", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      "recommendation_response_body_check",
      sql`(kind = 'acknowledged' and body is null) or (kind = 'comment' and length(body) between 1 and 2000)`,
    )
    .execute();
  await db.schema
    .createIndex("recommendation_response_dig_site_id_index")
    .on("recommendation_response")
    .columns(["dig_site_id", "created_at"])
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("recommendation_response").execute();
}
