import "server-only";
import { createHash } from "node:crypto";
import { type Kysely, sql, type Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { digSiteSchema, dugPlantSchema, photoSchema } from "../protocol";

// The field-by-field merge of records that devices edit (shared/SYNC.md, "Merge" and "Deletes"), and
// the writes that keep each row's sync bookkeeping: `version` (the region's version at its last
// change), `field_versions` (the version at which each field last changed) and `field_changes` (the
// recent changes of each field, newest first: version, device client, user, time and a digest of the
// value written, so the server knows which value of a field a device had seen).
//
// A device pushes the whole record with the server version it last saw (its base). For each field
// whose value differs from the server's:
// - the server has not changed the field since the base: the device's value is applied;
// - the field's last change is this device's own (it edited twice before pulling): applied;
// - the server changed it since the base, but the device still holds a value it knew (the value at
//   its base, or one it wrote itself since): the device did not edit this field, so the server's
//   newer value stays, with no conflict;
// - otherwise both sides changed the field: the server's value stays and ONE sync_conflict row keeps
//   both values, both users and both times (device time only as observed-at data). The same device
//   value against the same base is recorded once, however often it is pushed again.
// A field whose history does not reach back to the base (rows written outside sync, or more than
// HISTORY changes since) counts as changed by someone else. Device clocks order nothing: only server
// versions do.
//
// Deletes are tombstones (deleted_at and a version bump), never row removal. Delete versus edit is a
// conflict row on the pseudo-field "deleted" and the DELETION STANDS in both orders: an edit arriving
// for a tombstoned record, or a delete of a record someone else edited since the deleting device's
// base. The conflict row keeps the losing side whole ({ deleted: false, record }), so a supervisor who
// settles for it restores the record with those values (db/queries/conflicts.ts).
//
// A merge that leaves the server's values in place still bumps the record's version, so the next
// pull brings every device the server's view (invariant 3 of SYNC.md).

export type Trx = Transaction<Database>;
export type SyncedTable = "digSite" | "dugPlant" | "photo";

export const SQL_TABLE: Record<SyncedTable, "dig_site" | "dug_plant" | "photo"> = {
  digSite: "dig_site",
  dugPlant: "dug_plant",
  photo: "photo",
};

export function tableOfSqlName(name: string): SyncedTable | undefined {
  return (Object.keys(SQL_TABLE) as SyncedTable[]).find((t) => SQL_TABLE[t] === name);
}

export const RECORD_SCHEMAS = { digSite: digSiteSchema, dugPlant: dugPlantSchema, photo: photoSchema };

// The fields a device sends and the merge compares (the payload without its id).
export const MERGED_FIELDS: Record<SyncedTable, readonly string[]> = {
  digSite: Object.keys(digSiteSchema.shape).filter((k) => k !== "id"),
  dugPlant: Object.keys(dugPlantSchema.shape).filter((k) => k !== "id"),
  photo: Object.keys(photoSchema.shape).filter((k) => k !== "id"),
};

// The pseudo-field of delete-versus-edit conflicts.
export const DELETED_FIELD = "deleted";

const TIMESTAMP_FIELDS = new Set(["dugAt", "capturedAt"]);

// A field's value in the JSON form the merge compares and conflict rows store (instants as UTC ISO).
export function normalize(field: string, value: unknown): unknown {
  if (value instanceof Date) return value.toISOString();
  if (TIMESTAMP_FIELDS.has(field) && typeof value === "string") return new Date(value).toISOString();
  return value === undefined ? null : value;
}

export const sameValue = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

// One change of a field; field_changes keeps the latest HISTORY of them per field, newest first.
export interface FieldChange {
  version: number;
  client: string | null;
  user: string | null;
  at: string;
  // Digest of the value written (valueDigest), to recognise a value a device had seen.
  digest: string;
}

export const HISTORY = 8;

export const valueDigest = (value: unknown) =>
  createHash("sha256").update(JSON.stringify(value)).digest("base64url").slice(0, 16);

// Who writes, and at which version: a device client through push, or a person through the office
// (client null: no device owns the value).
export interface Writer {
  clientId: string | null;
  userId: string;
  version: number;
  at: string;
}

export type StoredRow = Record<string, unknown> & {
  id: string;
  version: number;
  fieldVersions: Record<string, number>;
  fieldChanges: Record<string, FieldChange[]>;
  updatedBy: string | null;
  updatedAt: Date;
  deletedAt: Date | null;
};

// Kysely cannot type a query over a table chosen at run time; the exported functions stay typed.
// biome-ignore lint/suspicious/noExplicitAny: see above
const untyped = (trx: Trx) => trx as unknown as Kysely<any>;

// The row, locked until the transaction ends (tombstones included).
export async function lockRow(trx: Trx, table: SyncedTable, id: string): Promise<StoredRow | undefined> {
  const row = await untyped(trx)
    .selectFrom(table)
    .selectAll()
    .where("id", "=", id)
    .forUpdate()
    .executeTakeFirst();
  return row as StoredRow | undefined;
}

// The record's merged fields in their JSON form, with its id.
export function recordPayload(table: SyncedTable, row: Record<string, unknown>): Record<string, unknown> {
  return {
    id: row.id,
    ...Object.fromEntries(MERGED_FIELDS[table].map((f) => [f, normalize(f, row[f])])),
  };
}

export function differsFromRow(table: SyncedTable, row: StoredRow, args: Record<string, unknown>): boolean {
  return MERGED_FIELDS[table].some((f) => !sameValue(normalize(f, args[f]), normalize(f, row[f])));
}

const fieldVersion = (row: StoredRow, field: string) => row.fieldVersions[field] ?? row.version;

// The field's recent changes, newest first, when they are known up to its current value; else [].
function history(row: StoredRow, field: string): FieldChange[] {
  const changes = row.fieldChanges[field];
  return Array.isArray(changes) && changes[0]?.version === fieldVersion(row, field) ? changes : [];
}

export interface FieldConflict {
  field: string;
  serverValue: unknown;
  clientValue: unknown;
  serverUserId: string | null;
  serverChangedAt: string;
}

export interface Merge {
  // Column values to write (as the device sent them).
  patch: Record<string, unknown>;
  conflicts: FieldConflict[];
}

/** The merge of one pushed record into the stored one (see the rules at the top of this file). Pure. */
export function mergeFields(
  table: SyncedTable,
  row: StoredRow,
  args: Record<string, unknown>,
  baseVersion: number | null,
  clientId: string,
): Merge {
  const base = baseVersion ?? 0;
  const patch: Record<string, unknown> = {};
  const conflicts: FieldConflict[] = [];
  for (const field of MERGED_FIELDS[table]) {
    const clientValue = normalize(field, args[field]);
    const serverValue = normalize(field, row[field]);
    if (sameValue(clientValue, serverValue)) continue;
    if (fieldVersion(row, field) <= base) {
      patch[field] = args[field];
      continue;
    }
    const changes = history(row, field);
    const last = changes[0];
    if (last && last.client === clientId) {
      patch[field] = args[field];
      continue;
    }
    const atBase = changes.find((c) => c.version <= base);
    const known = [
      ...(atBase ? [atBase.digest] : []),
      ...changes.filter((c) => c.version > base && c.client === clientId).map((c) => c.digest),
    ];
    if (known.includes(valueDigest(clientValue))) continue;
    conflicts.push({
      field,
      serverValue,
      clientValue,
      serverUserId: last ? last.user : row.updatedBy,
      serverChangedAt: last ? last.at : row.updatedAt.toISOString(),
    });
  }
  return { patch, conflicts };
}

/**
 * The latest change by someone other than this client to a merged field after the base, or null: a
 * delete based on `baseVersion` would throw that edit away unseen.
 */
export function editSinceBase(
  table: SyncedTable,
  row: StoredRow,
  baseVersion: number | null,
  clientId: string,
): { userId: string | null; at: string } | null {
  const base = baseVersion ?? 0;
  let latest: { version: number; userId: string | null; at: string } | null = null;
  for (const field of MERGED_FIELDS[table]) {
    const version = fieldVersion(row, field);
    if (version <= base) continue;
    const changes = history(row, field);
    const edit =
      changes.length === 0
        ? { version, userId: row.updatedBy, at: row.updatedAt.toISOString() }
        : changes
            .filter((c) => c.version > base && c.client !== clientId)
            .map((c) => ({ version: c.version, userId: c.user, at: c.at }))[0];
    if (edit && (!latest || edit.version > latest.version)) latest = edit;
  }
  return latest && { userId: latest.userId, at: latest.at };
}

function changeEntries(
  row: StoredRow | null,
  values: Record<string, unknown>,
  writer: Writer,
): Record<string, FieldChange[]> {
  return Object.fromEntries(
    Object.entries(values).map(([field, value]) => {
      const change: FieldChange = {
        version: writer.version,
        client: writer.clientId,
        user: writer.userId,
        at: writer.at,
        digest: valueDigest(normalize(field, value)),
      };
      let earlier: FieldChange[] = [];
      if (row) {
        earlier = history(row, field);
        // A value written outside sync starts the history afresh from what is stored.
        if (earlier.length === 0) {
          earlier = [
            {
              version: fieldVersion(row, field),
              client: null,
              user: row.updatedBy,
              at: row.updatedAt.toISOString(),
              digest: valueDigest(normalize(field, row[field])),
            },
          ];
        }
      }
      return [field, [change, ...earlier].slice(0, HISTORY)];
    }),
  );
}

const jsonb = (value: unknown) => sql`${JSON.stringify(value)}::jsonb`;

// Inserts a new record with every merged field versioned and owned by the writer.
export async function insertRecord(
  trx: Trx,
  table: SyncedTable,
  values: Record<string, unknown>,
  writer: Writer,
): Promise<void> {
  const fields = MERGED_FIELDS[table];
  await untyped(trx)
    .insertInto(table)
    .values({
      ...values,
      version: writer.version,
      fieldVersions: JSON.stringify(Object.fromEntries(fields.map((f) => [f, writer.version]))),
      fieldChanges: JSON.stringify(
        changeEntries(null, Object.fromEntries(fields.map((f) => [f, values[f]])), writer),
      ),
      createdBy: writer.userId,
      updatedBy: writer.userId,
    })
    .execute();
}

// Writes the changed fields with the writer's version, their field versions and change records.
export async function updateFields(
  trx: Trx,
  table: SyncedTable,
  row: StoredRow,
  patch: Record<string, unknown>,
  writer: Writer,
): Promise<void> {
  const fields = Object.keys(patch);
  if (fields.length === 0) return;
  await untyped(trx)
    .updateTable(table)
    .set({
      ...patch,
      version: writer.version,
      fieldVersions: sql`field_versions || ${jsonb(Object.fromEntries(fields.map((f) => [f, writer.version])))}`,
      fieldChanges: sql`field_changes || ${jsonb(changeEntries(row, patch, writer))}`,
      updatedBy: writer.userId,
      updatedAt: sql`now()`,
    })
    .where("id", "=", row.id)
    .execute();
}

// A version bump with no value change, so pulls deliver the server's view of the record again.
export async function touchRecord(trx: Trx, table: SyncedTable, id: string, version: number): Promise<void> {
  await untyped(trx)
    .updateTable(table)
    .set({ version, updatedAt: sql`now()` })
    .where("id", "=", id)
    .where("version", "<", version)
    .execute();
}

export async function setDeleted(
  trx: Trx,
  table: SyncedTable,
  id: string,
  deleted: boolean,
  writer: Writer,
): Promise<void> {
  await untyped(trx)
    .updateTable(table)
    .set({
      deletedAt: deleted ? sql`now()` : null,
      version: writer.version,
      fieldVersions: sql`field_versions || ${jsonb({ deletedAt: writer.version })}`,
      updatedBy: writer.userId,
      updatedAt: sql`now()`,
    })
    .where("id", "=", id)
    .execute();
}

export interface ConflictInput {
  regionId: string;
  table: SyncedTable;
  recordId: string;
  field: string;
  baseVersion: number | null;
  serverValue: unknown;
  clientValue: unknown;
  serverUserId: string | null;
  clientUserId: string;
  serverChangedAt: string | Date | null;
  clientObservedAt: string | null;
}

/**
 * Writes one conflict row, unless the same device value against the same base was already recorded
 * for this field (a record pushed again, or a settled pair): invariant 4 of SYNC.md. True when written.
 */
export async function recordConflict(trx: Trx, c: ConflictInput): Promise<boolean> {
  const clientValue = JSON.stringify(c.clientValue ?? null);
  const seen = await trx
    .selectFrom("syncConflict")
    .select("id")
    .where("tableName", "=", SQL_TABLE[c.table])
    .where("recordId", "=", c.recordId)
    .where("fieldName", "=", c.field)
    .where("clientUserId", "=", c.clientUserId)
    .where("baseVersion", "=", c.baseVersion ?? 0)
    .where(sql<boolean>`client_value = ${clientValue}::jsonb`)
    .executeTakeFirst();
  if (seen) return false;
  await trx
    .insertInto("syncConflict")
    .values({
      regionId: c.regionId,
      tableName: SQL_TABLE[c.table],
      recordId: c.recordId,
      fieldName: c.field,
      baseVersion: c.baseVersion ?? 0,
      serverValue: JSON.stringify(c.serverValue ?? null),
      clientValue,
      serverUserId: c.serverUserId,
      clientUserId: c.clientUserId,
      serverChangedAt: c.serverChangedAt,
      clientObservedAt: c.clientObservedAt,
    })
    .execute();
  return true;
}
