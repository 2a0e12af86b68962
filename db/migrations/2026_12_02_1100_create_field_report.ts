import { type Kysely, sql } from "kysely";

// Field reports sent to growers: the PDF stored in the object store, who it went to and whether the
// e-mail left. A failed send keeps its error and can be sent again. Frozen: imports nothing from the app.

export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("field_report")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("field_id", "uuid", (c) => c.notNull().references("field.id").onDelete("cascade"))
    .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id").onDelete("cascade"))
    .addColumn("created_by", "uuid", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("object_key", "text", (c) => c.notNull())
    .addColumn("byte_size", "integer", (c) => c.notNull().check(sql`byte_size > 0`))
    .addColumn("sha256", "text", (c) => c.notNull().check(sql`sha256 ~ '^[0-9a-f]{64}$'`))
    .addColumn("recipients", sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
    .addColumn("status", "text", (c) =>
      c.notNull().defaultTo("sending").check(sql`status in ('sending','sent','failed')`),
    )
    .addColumn("error", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("sent_at", "timestamptz")
    .execute();
  await db.schema.createIndex("field_report_field_id_index").on("field_report").column("field_id").execute();
  await db.schema
    .createIndex("field_report_account_id_index")
    .on("field_report")
    .column("account_id")
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable("field_report").execute();
}
