import { type Kysely, sql } from "kysely";

// The injury case audit trail is append-only for the application's database role by privilege as
// well as by trigger: that role may INSERT and SELECT event rows but holds no UPDATE, DELETE or
// TRUNCATE on injury_case_event, and it owns no table, so it cannot switch the trigger off either
// (the owner role that runs the migrations owns the schema; see scripts/services.ts). The trigger
// stays for every other role. The app's role name is read from the database setting
// trenchbook.app_role (set by scripts/services.ts, or by whoever provisions the database); without
// it, or when the migrations run as that role itself, there is nothing to grant or revoke here.
// Frozen: this file imports nothing from the app.

async function appRole(db: Kysely<any>): Promise<string | null> {
  const { rows } = await sql<{ role: string | null }>`
    select r.rolname as role from pg_roles r
    where r.rolname = nullif(current_setting('trenchbook.app_role', true), '')
      and r.rolname <> current_user`.execute(db);
  return rows[0]?.role ?? null;
}

export async function up(db: Kysely<any>): Promise<void> {
  const role = await appRole(db);
  if (!role) return;
  const app = sql.id(role);
  // Row access to every existing table (later tables get it from the owner's default privileges).
  await sql`grant select, insert, update, delete on all tables in schema public to ${app}`.execute(db);
  await sql`grant usage, select on all sequences in schema public to ${app}`.execute(db);
  // The migrator's own bookkeeping is the owner's alone.
  await sql`revoke all on kysely_migration, kysely_migration_lock from ${app}`.execute(db);
  await sql`revoke update, delete, truncate on injury_case_event from ${app}`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  const role = await appRole(db);
  if (!role) return;
  const app = sql.id(role);
  await sql`grant update, delete on injury_case_event to ${app}`.execute(db);
  await sql`grant select, insert, update, delete on kysely_migration, kysely_migration_lock to ${app}`.execute(
    db,
  );
}
