import "server-only";
import { type Insertable, type Kysely, type Selectable, sql, type Transaction } from "kysely";
import { db } from "../client";
import type { Database } from "../schema";

// The bookkeeping the sync protocol relies on (shared/SYNC.md): every change to a synced row takes
// the next version of its region's cursor inside the writing transaction, stores it on the row, and
// records it in `field_versions` under each changed column's (camelCase) name.

// The region's next version. The cursor row stays locked until the caller's transaction ends, so
// versions of one region commit in the order they were taken and a pull never skips a row.
export async function nextVersion(trx: Transaction<Database>, regionId: string): Promise<number> {
  await trx
    .insertInto("syncCursor")
    .values({ regionId })
    .onConflict((oc) => oc.column("regionId").doNothing())
    .execute();
  const cursor = await trx
    .selectFrom("syncCursor")
    .select("version")
    .where("regionId", "=", regionId)
    .forUpdate()
    .executeTakeFirstOrThrow();
  const version = cursor.version + 1;
  await trx.updateTable("syncCursor").set({ version }).where("regionId", "=", regionId).execute();
  return version;
}

export type VersionedTable = "field" | "planting" | "fertilizerPass";

interface Change {
  regionId: string;
  actorId: string;
}

// Applies `patch` to one live (not deleted) row in one transaction: locks the row, keeps only the
// columns whose value really changes, and when any does, bumps the row's version, its field_versions
// entries, updated_by and updated_at. Returns the row as stored, or undefined when there is no live row.
export async function updateVersioned<T extends VersionedTable>(
  table: T,
  id: string,
  patch: Partial<Selectable<Database[T]>>,
  { regionId, actorId }: Change,
): Promise<Selectable<Database[T]> | undefined> {
  const row = await db.transaction().execute(async (trx) => {
    // Kysely cannot type a query over a table chosen by a type parameter; the signature keeps callers typed.
    // biome-ignore lint/suspicious/noExplicitAny: see above
    const anyTrx = trx as unknown as Kysely<any>;
    const name: string = table;
    const current = await anyTrx
      .selectFrom(name)
      .selectAll()
      .where("id", "=", id)
      .where("deletedAt", "is", null)
      .forUpdate()
      .executeTakeFirst();
    if (!current) return undefined;
    const changed = Object.fromEntries(
      Object.entries(patch).filter(([column, value]) => value !== undefined && current[column] !== value),
    );
    if (Object.keys(changed).length === 0) return current;
    const version = await nextVersion(trx, regionId);
    const fieldVersions = Object.fromEntries(Object.keys(changed).map((column) => [column, version]));
    return anyTrx
      .updateTable(name)
      .set({
        ...changed,
        version,
        fieldVersions: sql`field_versions || ${JSON.stringify(fieldVersions)}::jsonb`,
        updatedBy: actorId,
        updatedAt: sql`now()`,
      })
      .where("id", "=", id)
      .returningAll()
      .executeTakeFirstOrThrow();
  });
  return row as Selectable<Database[T]> | undefined;
}

// Inserts one row in one transaction with the region's next version, recording that version under
// every column given. Returns the row as stored.
export async function insertVersioned<T extends VersionedTable>(
  table: T,
  values: Omit<Insertable<Database[T]>, "version" | "fieldVersions" | "createdBy" | "updatedBy">,
  { regionId, actorId }: Change,
): Promise<Selectable<Database[T]>> {
  const row = await db.transaction().execute(async (trx) => {
    // biome-ignore lint/suspicious/noExplicitAny: as in updateVersioned
    const anyTrx = trx as unknown as Kysely<any>;
    const version = await nextVersion(trx, regionId);
    const fieldVersions = Object.fromEntries(Object.keys(values).map((column) => [column, version]));
    return anyTrx
      .insertInto(table as string)
      .values({
        ...values,
        version,
        fieldVersions: JSON.stringify(fieldVersions),
        createdBy: actorId,
        updatedBy: actorId,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
  });
  return row as Selectable<Database[T]>;
}
