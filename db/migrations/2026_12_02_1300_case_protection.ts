import { type Kysely, sql } from "kysely";

// The evidence of an open injury case (status other than 'closed') stays: its dig, dug plants and
// photos can't be tombstoned (deleted_at set) or deleted while the case is open, whoever writes.
// Sync push refuses such a delete first with its own plain reason (sync/server/push.ts); this is
// the guard for every other path. The error is a restrict_violation (23001), so a push that still
// reaches it rejects that one mutation instead of failing the whole request. Frozen: this file
// imports nothing from the app.

const GUARDED = ["dig_site", "dug_plant", "photo"] as const;

export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create function case_evidence_guard() returns trigger language plpgsql as $$
    declare
      dig uuid;
    begin
      if tg_table_name = 'dig_site' then
        dig := old.id;
      else
        dig := old.dig_site_id;
      end if;
      if exists (
        select 1 from injury_case
        where dig_site_id = dig and deleted_at is null and status <> 'closed'
      ) then
        raise exception 'This dig has an open injury case: its dig, plants and photos are kept as evidence until the case is closed.'
          using errcode = 'restrict_violation';
      end if;
      if tg_op = 'DELETE' then
        return old;
      end if;
      return new;
    end $$`.execute(db);
  for (const table of GUARDED) {
    await sql`
      create trigger ${sql.raw(`${table}_case_evidence_tombstone`)} before update of deleted_at on ${sql.table(table)}
      for each row when (old.deleted_at is null and new.deleted_at is not null)
      execute function case_evidence_guard()`.execute(db);
    await sql`
      create trigger ${sql.raw(`${table}_case_evidence_delete`)} before delete on ${sql.table(table)}
      for each row execute function case_evidence_guard()`.execute(db);
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const table of GUARDED) {
    await sql`drop trigger if exists ${sql.raw(`${table}_case_evidence_delete`)} on ${sql.table(table)}`.execute(
      db,
    );
    await sql`drop trigger if exists ${sql.raw(`${table}_case_evidence_tombstone`)} on ${sql.table(table)}`.execute(
      db,
    );
  }
  await sql`drop function if exists case_evidence_guard()`.execute(db);
}
