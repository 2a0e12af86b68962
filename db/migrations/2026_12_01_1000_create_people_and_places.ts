import { type Kysely, sql } from "kysely";

// Users, roles, regions, grower accounts and who serves them, one-time e-mail tokens and sign-in
// attempts. Frozen: this file imports nothing from the app.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable("region")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("name", "text", (c) => c.notNull().unique())
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();

  await db.schema
    .createTable("app_user")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("role", "text", (c) => c.notNull().check(sql`role in ('rep','grower','supervisor','admin')`))
    .addColumn("region_id", "uuid", (c) => c.references("region.id").onDelete("set null"))
    .addColumn("password_hash", "text")
    .addColumn("status", "text", (c) =>
      c.notNull().defaultTo("invited").check(sql`status in ('invited','active','deactivated')`),
    )
    .addColumn("units", "text", (c) => c.notNull().defaultTo("us").check(sql`units in ('us','metric')`))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`create unique index app_user_email_index on app_user (lower(email))`.execute(db);
  await db.schema.createIndex("app_user_region_id_index").on("app_user").column("region_id").execute();

  await db.schema
    .createTable("one_time_token")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("user_id", "uuid", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
    .addColumn("purpose", "text", (c) => c.notNull().check(sql`purpose in ('invite','password_reset')`))
    .addColumn("token_hash", "text", (c) => c.notNull().unique())
    .addColumn("expires_at", "timestamptz", (c) => c.notNull())
    .addColumn("used_at", "timestamptz")
    .addColumn("created_by", "uuid", (c) => c.references("app_user.id").onDelete("set null"))
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("one_time_token_user_id_index")
    .on("one_time_token")
    .column("user_id")
    .execute();

  await db.schema
    .createTable("sign_in_attempt")
    .addColumn("id", "bigserial", (c) => c.primaryKey())
    .addColumn("email", "text", (c) => c.notNull())
    .addColumn("succeeded", "boolean", (c) => c.notNull())
    .addColumn("attempted_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex("sign_in_attempt_email_index")
    .on("sign_in_attempt")
    .columns(["email", "attempted_at"])
    .execute();

  await db.schema
    .createTable("account")
    .addColumn("id", "uuid", (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn("region_id", "uuid", (c) => c.notNull().references("region.id"))
    .addColumn("name", "text", (c) => c.notNull())
    .addColumn("locality", "text")
    .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn("updated_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema.createIndex("account_region_id_index").on("account").column("region_id").execute();

  // Which reps serve an account, and which grower users belong to it.
  for (const table of ["account_rep", "account_grower"]) {
    await db.schema
      .createTable(table)
      .addColumn("account_id", "uuid", (c) => c.notNull().references("account.id").onDelete("cascade"))
      .addColumn("user_id", "uuid", (c) => c.notNull().references("app_user.id").onDelete("cascade"))
      .addColumn("created_at", "timestamptz", (c) => c.notNull().defaultTo(sql`now()`))
      .addPrimaryKeyConstraint(`${table}_pkey`, ["account_id", "user_id"])
      .execute();
    await db.schema.createIndex(`${table}_user_id_index`).on(table).column("user_id").execute();
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of [
    "account_grower",
    "account_rep",
    "account",
    "sign_in_attempt",
    "one_time_token",
    "app_user",
    "region",
  ]) {
    await db.schema.dropTable(table).execute();
  }
}
