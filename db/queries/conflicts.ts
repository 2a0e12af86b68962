import "server-only";
import { type Expression, type SqlBool, sql } from "kysely";
import { z } from "zod";
import { type Actor, can } from "@/lib/auth/permissions";
import {
  DELETED_FIELD,
  lockRow,
  MERGED_FIELDS,
  normalize,
  RECORD_SCHEMAS,
  type SyncedTable,
  setDeleted,
  tableOfSqlName,
  touchRecord,
  updateFields,
  type Writer,
} from "@/sync/server/merge";
import { OPEN_CASE_REASON, openCase } from "@/sync/server/push";
import { recomputeDig } from "@/sync/server/recompute";
import { db } from "../client";
import { nextVersion } from "./versioning";

// Sync conflicts (shared/SYNC.md, "Merge"): two sides changed the same field, or one deleted what the
// other edited. The supervisor of the record's region (and admins) see both values, who and when, and
// settle them; the settled value is written to the record with a new version, so every device gets it
// on its next pull.

export interface ConflictUser {
  id: string;
  name: string;
}

export interface ConflictView {
  id: string;
  regionId: string;
  tableName: string;
  recordId: string;
  fieldName: string;
  baseVersion: number;
  serverValue: unknown;
  clientValue: unknown;
  serverUser: ConflictUser | null;
  clientUser: ConflictUser | null;
  serverChangedAt: string | null;
  clientReceivedAt: string;
  // The device's clock when the rep made the edit: shown as observed, never used for ordering.
  clientObservedAt: string | null;
  settledBy: ConflictUser | null;
  settledAt: string | null;
  settledValue: unknown;
  version: number;
  // The dig the record belongs to, for context.
  dig: { id: string; accountId: string; accountName: string; fieldName: string; dugAt: string } | null;
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function conflictsQuery() {
  return db
    .selectFrom("syncConflict as c")
    .leftJoin("dugPlant as dp", (j) =>
      j.onRef("dp.id", "=", "c.recordId").on("c.tableName", "=", "dug_plant"),
    )
    .leftJoin("photo as ph", (j) => j.onRef("ph.id", "=", "c.recordId").on("c.tableName", "=", "photo"))
    .leftJoin("digSite as ds", (j) =>
      j.on(
        sql<SqlBool>`ds.id = coalesce(case when c.table_name = 'dig_site' then c.record_id end, dp.dig_site_id, ph.dig_site_id)`,
      ),
    )
    .leftJoin("account as a", "a.id", "ds.accountId")
    .leftJoin("field as f", "f.id", "ds.fieldId")
    .leftJoin("appUser as su", "su.id", "c.serverUserId")
    .leftJoin("appUser as cu", "cu.id", "c.clientUserId")
    .leftJoin("appUser as sb", "sb.id", "c.settledBy")
    .select([
      "c.id",
      "c.regionId",
      "c.tableName",
      "c.recordId",
      "c.fieldName",
      "c.baseVersion",
      "c.serverValue",
      "c.clientValue",
      "c.serverUserId",
      "su.name as serverUserName",
      "c.clientUserId",
      "cu.name as clientUserName",
      "c.serverChangedAt",
      "c.clientReceivedAt",
      "c.clientObservedAt",
      "c.settledBy",
      "sb.name as settledByName",
      "c.settledAt",
      "c.settledValue",
      "c.version",
      "ds.id as digId",
      "ds.accountId as digAccountId",
      "a.name as accountName",
      "f.name as digFieldName",
      "ds.dugAt as digDugAt",
    ]);
}

type ConflictRow = Awaited<ReturnType<ReturnType<typeof conflictsQuery>["executeTakeFirstOrThrow"]>>;

const user = (id: string | null, name: string | null): ConflictUser | null =>
  id ? { id, name: name ?? "" } : null;

function toView(r: ConflictRow): ConflictView {
  return {
    id: r.id,
    regionId: r.regionId,
    tableName: r.tableName,
    recordId: r.recordId,
    fieldName: r.fieldName,
    baseVersion: r.baseVersion,
    serverValue: r.serverValue,
    clientValue: r.clientValue,
    serverUser: user(r.serverUserId, r.serverUserName),
    clientUser: user(r.clientUserId, r.clientUserName),
    serverChangedAt: iso(r.serverChangedAt),
    clientReceivedAt: r.clientReceivedAt.toISOString(),
    clientObservedAt: iso(r.clientObservedAt),
    settledBy: user(r.settledBy, r.settledByName),
    settledAt: iso(r.settledAt),
    settledValue: r.settledValue,
    version: r.version,
    dig:
      r.digId && r.digAccountId && r.digDugAt
        ? {
            id: r.digId,
            accountId: r.digAccountId,
            accountName: r.accountName ?? "",
            fieldName: r.digFieldName ?? "",
            dugAt: r.digDugAt.toISOString(),
          }
        : null,
  };
}

// The conflicts an actor may settle: a supervisor's region, every region for an admin, none otherwise.
function settleableBy(actor: Actor): Expression<SqlBool> {
  if (actor.role === "admin") return sql<SqlBool>`true`;
  if (actor.role === "supervisor" && actor.regionId) return sql<SqlBool>`c.region_id = ${actor.regionId}`;
  return sql<SqlBool>`false`;
}

/** Conflicts the actor may settle, newest first; `settled` filters open (false) or settled (true) ones. */
export async function listConflicts(
  actor: Actor,
  options: { settled?: boolean } = {},
): Promise<ConflictView[]> {
  let query = conflictsQuery().where(settleableBy(actor));
  if (options.settled !== undefined) {
    query = query.where("c.settledAt", options.settled ? "is not" : "is", null);
  }
  const rows = await query.orderBy("c.clientReceivedAt", "desc").orderBy("c.id").limit(500).execute();
  return rows.map(toView);
}

export const settleConflictSchema = z.discriminatedUnion("choice", [
  z.strictObject({ choice: z.enum(["server", "client"]) }),
  // A value of the supervisor's own, checked like the device's payload field.
  z.strictObject({ choice: z.literal("custom"), value: z.unknown() }),
]);
export type SettleChoice = z.infer<typeof settleConflictSchema>;

export type Settled =
  | { ok: true; conflict: ConflictView; recordVersion: number; openedCaseId: string | null }
  | { ok: false; status: 404 | 409 | 422; error: string; issues?: { path: string; message: string }[] };

const deletedSide = z.object({ deleted: z.boolean(), record: z.record(z.string(), z.unknown()).optional() });

/**
 * Settles one conflict with the server's value, the device's value or a custom value, in one
 * transaction: the chosen value is written to the record with a new version of its region (so it
 * reaches every device), the record's dig is recomputed, and the conflict is marked settled. A
 * delete-versus-edit conflict settles to the deletion or to the record restored (with the edit's
 * values when the edit side carries them). Not idempotent by design: a settled conflict answers 409.
 */
export async function settleConflict(
  actor: Actor,
  conflictId: string,
  choice: SettleChoice,
): Promise<Settled> {
  const notFound = { ok: false, status: 404, error: "No such conflict." } as const;
  return db.transaction().execute(async (trx): Promise<Settled> => {
    const head = await trx
      .selectFrom("syncConflict")
      .select("regionId")
      .where("id", "=", conflictId)
      .executeTakeFirst();
    if (!head || !can(actor, "write", { kind: "conflict", regionId: head.regionId })) return notFound;
    // The region's version first, then the rows: the same lock order as a push.
    const version = await nextVersion(trx, head.regionId);
    const conflict = await trx
      .selectFrom("syncConflict")
      .selectAll()
      .where("id", "=", conflictId)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (conflict.settledAt) return { ok: false, status: 409, error: "This conflict is already settled." };
    const table: SyncedTable | undefined = tableOfSqlName(conflict.tableName);
    const row = table && (await lockRow(trx, table, conflict.recordId));
    if (!table || !row) return notFound;
    const writer: Writer = { clientId: null, userId: actor.id, version, at: new Date().toISOString() };

    let chosen: unknown;
    if (conflict.fieldName === DELETED_FIELD) {
      if (choice.choice === "custom") {
        return {
          ok: false,
          status: 422,
          error: "Settle a deletion with one side: the server's or the device's.",
        };
      }
      chosen = choice.choice === "server" ? conflict.serverValue : conflict.clientValue;
      const parsed = deletedSide.safeParse(chosen);
      if (!parsed.success) {
        return {
          ok: false,
          status: 409,
          error: "This conflict's stored value cannot be applied; settle it the other way.",
        };
      }
      const side = parsed.data;
      // The evidence of an open injury case stays until the case is closed (as for a device's delete).
      const digOfRow = table === "digSite" ? row.id : String(row.digSiteId);
      if (side.deleted && !row.deletedAt && (await openCase(trx, digOfRow))) {
        return { ok: false, status: 409, error: OPEN_CASE_REASON };
      }
      if (side.deleted !== Boolean(row.deletedAt)) await setDeleted(trx, table, row.id, side.deleted, writer);
      const restored = side.record && RECORD_SCHEMAS[table].safeParse(side.record);
      if (!side.deleted && restored?.success) {
        const values = restored.data as Record<string, unknown>;
        const patch = Object.fromEntries(
          MERGED_FIELDS[table]
            .filter((f) => JSON.stringify(normalize(f, values[f])) !== JSON.stringify(normalize(f, row[f])))
            .map((f) => [f, values[f]]),
        );
        await updateFields(trx, table, row, patch, writer);
      }
      await touchRecord(trx, table, row.id, version);
    } else {
      const field = conflict.fieldName;
      if (!MERGED_FIELDS[table].includes(field)) return notFound;
      if (choice.choice === "custom") {
        const schema = (RECORD_SCHEMAS[table].shape as Record<string, z.ZodType>)[field]!;
        const parsed = schema.safeParse(choice.value);
        if (!parsed.success) {
          return {
            ok: false,
            status: 422,
            error: "The value is not valid for this field.",
            issues: parsed.error.issues.map((i) => ({
              path: ["value", ...i.path].join("."),
              message: i.message,
            })),
          };
        }
        chosen = normalize(field, parsed.data);
      } else {
        chosen = choice.choice === "server" ? conflict.serverValue : conflict.clientValue;
      }
      // Written even when it equals the stored value: the new version sends it to every device.
      await updateFields(trx, table, row, { [field]: chosen }, writer);
    }

    await trx
      .updateTable("syncConflict")
      .set({
        settledBy: actor.id,
        settledAt: sql`now()`,
        settledValue: JSON.stringify(chosen ?? null),
        version,
      })
      .where("id", "=", conflictId)
      .execute();
    const digSiteId = table === "digSite" ? row.id : String(row.digSiteId);
    const { openedCaseId } = await recomputeDig(trx, digSiteId, version, actor.id);
    return {
      ok: true,
      conflict: await findConflictIn(trx, conflictId),
      recordVersion: version,
      openedCaseId,
    };
  });
}

async function findConflictIn(trx: Parameters<typeof recomputeDig>[0], id: string): Promise<ConflictView> {
  // The same query as the list, inside the settling transaction.
  const q = conflictsQuery().where("c.id", "=", id).compile();
  const { rows } = await trx.executeQuery<ConflictRow>(q);
  return toView(rows[0]!);
}
