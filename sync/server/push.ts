import "server-only";
import { sql } from "kysely";
import { z } from "zod";
import { db } from "@/db/client";
import { nextVersion } from "@/db/queries/versioning";
import { type AccountAccess, type Actor, can } from "@/lib/auth/permissions";
import {
  type Mutation,
  PROTOCOL_VERSION,
  type PushResponse,
  type PushResult,
  pushedMutationSchema,
  pushRequestSchema,
} from "../protocol";
import {
  DELETED_FIELD,
  differsFromRow,
  editSinceBase,
  insertRecord,
  lockRow,
  mergeFields,
  recordConflict,
  recordPayload,
  type StoredRow,
  type SyncedTable,
  setDeleted,
  touchRecord,
  type Trx,
  updateFields,
  type Writer,
} from "./merge";
import { recomputeDig } from "./recompute";

// The write side of sync (shared/SYNC.md, "Push"). Contract of pushMutations:
// - ONE PostgreSQL transaction per request. The client row is locked first (select … for update),
//   so two pushes of one client (two tabs, a retry racing its lost original) run one after the other.
// - Exactly once: mutation ids ≤ the client's last_mutation_id were settled by an earlier push; they
//   are skipped and answered with their stored result (`duplicate: true`). The first new id must be
//   last + 1, else the push is refused as a gap and nothing is applied. The new last_mutation_id is
//   stored in the same transaction as the effects.
// - A mutation that can never succeed (invalid for its record, a farm the user may not write, an
//   unknown field, planting or dig, evidence of an open injury case) is recorded in
//   sync_mutation_result as 'rejected' with its plain reason and still advances the counter, so the
//   queue never jams; every other mutation is recorded 'applied' (its reason, if any, says what the
//   merge kept: see merge.ts).
// - HOLD: a photo.put whose object is not yet confirmed in the bucket (app/api/photos/confirm) stops
//   the push there: the mutations before it are applied and acknowledged, nothing from it on is, and
//   the answer carries heldAt (its id) and the reason. The device uploads and confirms the photo and
//   pushes again, so a photo row never exists before its object. A device that lost the bytes must
//   delete the photo locally (its queued put) to move on.
// - Versions: each write takes the version of its region from db/queries/versioning.ts nextVersion,
//   once per region per push (all rows a push writes in a region share that version: they commit
//   together, so pulls see all or none of them). The region's cursor row stays locked until commit.
// - After the mutations, every dig they touched (site, plant or photo) is recomputed from the
//   server's rows (recompute.ts) and may open its one injury case; the new case ids are returned for
//   the supervisor notice to be sent after the commit.
// - A deadlock or serialization failure retries the whole transaction; any other error rolls it all
//   back (500) and the device retries later with the same outbox.

export type PushOutcome =
  | { kind: "ok"; response: PushResponse; openedCaseIds: string[] }
  | { kind: "invalid"; error: string }
  | { kind: "forbidden"; error: string }
  | { kind: "gap"; error: string; expectedMutationId: number; lastMutationId: number };

// The envelope is checked as a whole; each mutation on its own, so one bad mutation is refused
// with its reason instead of jamming every mutation after it.
export const pushEnvelopeSchema = pushRequestSchema.extend({
  mutations: z.array(z.looseObject({ mutationId: z.number().int().positive() })).max(500),
});
export type PushEnvelope = z.infer<typeof pushEnvelopeSchema>;

// Mutations written with the previous schema version are read through this step; schema 1 is the
// first, so there is nothing to upgrade yet.
function upgradeMutation(_schemaVersion: number, raw: unknown): unknown {
  return raw;
}

type Outcome =
  | { status: "applied"; reason?: string }
  | { status: "rejected"; reason: string }
  | { status: "held"; reason: string };

const applied = (reason?: string): Outcome =>
  reason ? { status: "applied", reason } : { status: "applied" };
const rejected = (reason: string): Outcome => ({ status: "rejected", reason });

const NOT_VISIBLE = "is not on the server, or belongs to a farm you don't serve";
export const HELD_REASON = "Photo not uploaded yet: upload and confirm it, then push again.";

function issuesText(error: z.ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => (i.path.length ? `${i.path.join(".")}: ${i.message}` : i.message))
    .join(" ");
}

class PushContext {
  private versions = new Map<string, number>();
  private accessByAccount = new Map<string, AccountAccess | null>();
  readonly touchedDigs = new Map<string, string>(); // dig id → region id
  readonly at = new Date().toISOString();

  constructor(
    readonly trx: Trx,
    readonly actor: Actor,
    readonly clientId: string,
  ) {}

  async version(regionId: string): Promise<number> {
    let v = this.versions.get(regionId);
    if (v === undefined) {
      v = await nextVersion(this.trx, regionId);
      this.versions.set(regionId, v);
    }
    return v;
  }

  writer(version: number): Writer {
    return { clientId: this.clientId, userId: this.actor.id, version, at: this.at };
  }

  // The same rule as db/queries/access.ts findAccountAccess, read inside this transaction.
  async access(accountId: string): Promise<AccountAccess | null> {
    if (this.accessByAccount.has(accountId)) return this.accessByAccount.get(accountId) ?? null;
    const row = await this.trx
      .selectFrom("account")
      .select((eb) => [
        "account.id",
        "account.regionId",
        eb
          .exists(
            eb
              .selectFrom("accountRep")
              .whereRef("accountRep.accountId", "=", "account.id")
              .where("accountRep.userId", "=", this.actor.id),
          )
          .as("served"),
        eb
          .exists(
            eb
              .selectFrom("accountGrower")
              .whereRef("accountGrower.accountId", "=", "account.id")
              .where("accountGrower.userId", "=", this.actor.id),
          )
          .as("grown"),
      ])
      .where("account.id", "=", accountId)
      .executeTakeFirst();
    const access = row
      ? {
          accountId: row.id,
          regionId: row.regionId,
          servedByActor: Boolean(row.served),
          grownByActor: Boolean(row.grown),
        }
      : null;
    this.accessByAccount.set(accountId, access);
    return access;
  }

  // Why the actor may not write records of this account (what: "This dig's field"), or null.
  async refusal(accountId: string, what: string): Promise<string | null> {
    const access = await this.access(accountId);
    if (access && can(this.actor, "write", { kind: "digSite", access })) return null;
    if (access && can(this.actor, "read", { kind: "digSite", access })) {
      return "Only the rep who serves this farm can record digs; your role can read them but not change them.";
    }
    return `${what} ${NOT_VISIBLE}.`;
  }

  touch(digSiteId: string, regionId: string) {
    this.touchedDigs.set(digSiteId, regionId);
  }

  conflictBase(m: PushedMutation) {
    return {
      baseVersion: m.baseVersion,
      clientUserId: this.actor.id,
      clientObservedAt: m.observedAt,
    };
  }
}

type PushedMutation = z.infer<typeof pushedMutationSchema>;

const SQL_INVALID = /^2[23]/; // data exceptions and integrity violations: the row can never be stored

// Runs a mutation's writes under a savepoint: a value PostgreSQL refuses rejects that mutation only.
async function writeStep(trx: Trx, step: () => Promise<Outcome>): Promise<Outcome> {
  await sql`savepoint mutation`.execute(trx);
  try {
    const outcome = await step();
    await sql`release savepoint mutation`.execute(trx);
    return outcome;
  } catch (err) {
    const code = (err as { code?: unknown }).code;
    if (typeof code !== "string" || !SQL_INVALID.test(code)) throw err;
    await sql`rollback to savepoint mutation`.execute(trx);
    return rejected(
      code.startsWith("23")
        ? "The server could not store this record: it contradicts records already on the server."
        : "The server could not store this record: a value is outside what it can keep.",
    );
  }
}

export async function openCase(trx: Trx, digSiteId: string): Promise<boolean> {
  const open = await trx
    .selectFrom("injuryCase")
    .select("id")
    .where("digSiteId", "=", digSiteId)
    .where("deletedAt", "is", null)
    .where("status", "<>", "closed")
    .executeTakeFirst();
  return Boolean(open);
}

export const OPEN_CASE_REASON =
  "This dig has an open injury case: its dig, plants and photos are kept as evidence until the case is closed.";

// A put of an existing row, live or tombstoned (see merge.ts for the rules).
async function putExisting(
  ctx: PushContext,
  table: SyncedTable,
  row: StoredRow,
  args: Record<string, unknown>,
  m: PushedMutation,
  regionId: string,
  version: number,
): Promise<Outcome> {
  if (row.deletedAt) {
    if (!differsFromRow(table, row, args)) return applied("Already deleted on the server.");
    await recordConflict(ctx.trx, {
      regionId,
      table,
      recordId: row.id,
      field: DELETED_FIELD,
      serverValue: { deleted: true },
      clientValue: { deleted: false, record: recordPayload(table, args) },
      serverUserId: row.updatedBy,
      serverChangedAt: row.deletedAt,
      ...ctx.conflictBase(m),
    });
    await touchRecord(ctx.trx, table, row.id, version);
    return applied(
      "This record was deleted on the server: the deletion stands and this edit is kept for a supervisor to settle.",
    );
  }
  const merge = mergeFields(table, row, args, m.baseVersion, ctx.clientId);
  for (const c of merge.conflicts) {
    await recordConflict(ctx.trx, {
      regionId,
      table,
      recordId: row.id,
      field: c.field,
      serverValue: c.serverValue,
      clientValue: c.clientValue,
      serverUserId: c.serverUserId,
      serverChangedAt: c.serverChangedAt,
      ...ctx.conflictBase(m),
    });
  }
  if (Object.keys(merge.patch).length > 0) {
    await updateFields(ctx.trx, table, row, merge.patch, ctx.writer(version));
  } else if (merge.conflicts.length > 0) {
    await touchRecord(ctx.trx, table, row.id, version);
  }
  if (merge.conflicts.length === 0) return applied();
  const names = merge.conflicts.map((c) => c.field).join(", ");
  return applied(
    `Someone else changed ${names} since this device last synced: the server's value is kept and both are saved for a supervisor to settle.`,
  );
}

// A plant or photo written under a dig deleted on the server: the row is kept (hidden with its dig)
// and the dig gets a delete-versus-edit conflict, so a supervisor can bring the dig back.
async function childOfDeletedDig(
  ctx: PushContext,
  digSiteId: string,
  regionId: string,
  version: number,
  m: PushedMutation,
) {
  const dig = await lockRow(ctx.trx, "digSite", digSiteId);
  if (!dig?.deletedAt) return;
  await recordConflict(ctx.trx, {
    regionId,
    table: "digSite",
    recordId: digSiteId,
    field: DELETED_FIELD,
    serverValue: { deleted: true },
    clientValue: { deleted: false },
    serverUserId: dig.updatedBy,
    serverChangedAt: dig.deletedAt,
    ...ctx.conflictBase(m),
  });
  await touchRecord(ctx.trx, "digSite", digSiteId, version);
}

async function putDigSite(
  ctx: PushContext,
  args: Extract<Mutation, { name: "digSite.put" }>["args"],
  m: PushedMutation,
): Promise<Outcome> {
  const { trx } = ctx;
  const field = await trx
    .selectFrom("field")
    .select(["accountId", "deletedAt"])
    .where("id", "=", args.fieldId)
    .executeTakeFirst();
  if (!field) return rejected(`This dig's field ${NOT_VISIBLE}.`);
  const refusal = await ctx.refusal(field.accountId, "This dig's field");
  if (refusal) return rejected(refusal);
  const existing = await trx
    .selectFrom("digSite")
    .select(["accountId"])
    .where("id", "=", args.id)
    .executeTakeFirst();
  if (existing && existing.accountId !== field.accountId) {
    const other = await ctx.refusal(existing.accountId, "This dig");
    return rejected(other ?? "A dig can't move to another farm's field.");
  }
  if (!existing && field.deletedAt) return rejected("This dig's field has been removed on the server.");
  if (args.plantingId) {
    const planting = await trx
      .selectFrom("planting")
      .select(["fieldId"])
      .where("id", "=", args.plantingId)
      .executeTakeFirst();
    if (!planting || planting.fieldId !== args.fieldId) {
      return rejected("The planting chosen for this dig is not a planting of its field.");
    }
  }
  const access = (await ctx.access(field.accountId))!;
  const version = await ctx.version(access.regionId);
  return writeStep(trx, async () => {
    const row = await lockRow(trx, "digSite", args.id);
    ctx.touch(args.id, access.regionId);
    if (!row) {
      await insertRecord(
        trx,
        "digSite",
        { ...args, accountId: field.accountId, repId: ctx.actor.id },
        ctx.writer(version),
      );
      return applied();
    }
    return putExisting(ctx, "digSite", row, args, m, access.regionId, version);
  });
}

// The dig a plant or photo belongs to, and the refusal to write under it.
async function parentDig(
  ctx: PushContext,
  digSiteId: string,
): Promise<{ ok: true; accountId: string; regionId: string } | { ok: false; outcome: Outcome }> {
  const dig = await ctx.trx
    .selectFrom("digSite")
    .select(["accountId"])
    .where("id", "=", digSiteId)
    .executeTakeFirst();
  if (!dig) return { ok: false, outcome: rejected(`The dig this record belongs to ${NOT_VISIBLE}.`) };
  const refusal = await ctx.refusal(dig.accountId, "The dig this record belongs to");
  if (refusal) return { ok: false, outcome: rejected(refusal) };
  const access = (await ctx.access(dig.accountId))!;
  return { ok: true, accountId: dig.accountId, regionId: access.regionId };
}

async function putDugPlant(
  ctx: PushContext,
  args: Extract<Mutation, { name: "dugPlant.put" }>["args"],
  m: PushedMutation,
): Promise<Outcome> {
  const { trx } = ctx;
  const parent = await parentDig(ctx, args.digSiteId);
  if (!parent.ok) return parent.outcome;
  const existing = await trx
    .selectFrom("dugPlant")
    .select("digSiteId")
    .where("id", "=", args.id)
    .executeTakeFirst();
  if (existing && existing.digSiteId !== args.digSiteId) {
    return rejected("A dug plant can't move to another dig.");
  }
  const version = await ctx.version(parent.regionId);
  return writeStep(trx, async () => {
    await childOfDeletedDig(ctx, args.digSiteId, parent.regionId, version, m);
    const row = await lockRow(trx, "dugPlant", args.id);
    ctx.touch(args.digSiteId, parent.regionId);
    if (!row) {
      await insertRecord(trx, "dugPlant", { ...args }, ctx.writer(version));
      return applied();
    }
    return putExisting(ctx, "dugPlant", row, args, m, parent.regionId, version);
  });
}

async function putPhoto(
  ctx: PushContext,
  args: Extract<Mutation, { name: "photo.put" }>["args"],
  m: PushedMutation,
): Promise<Outcome> {
  const { trx } = ctx;
  const parent = await parentDig(ctx, args.digSiteId);
  if (!parent.ok) return parent.outcome;
  if (args.dugPlantId) {
    const plant = await trx
      .selectFrom("dugPlant")
      .select("digSiteId")
      .where("id", "=", args.dugPlantId)
      .executeTakeFirst();
    if (!plant || plant.digSiteId !== args.digSiteId) {
      return rejected("The plant this photo shows is not a plant of its dig.");
    }
  }
  const existing = await trx
    .selectFrom("photo")
    .select(["digSiteId", "sha256", "byteSize", "contentType"])
    .where("id", "=", args.id)
    .executeTakeFirst();
  if (existing) {
    if (existing.digSiteId !== args.digSiteId) return rejected("A photo can't move to another dig.");
    if (
      existing.sha256 !== args.sha256 ||
      existing.byteSize !== args.byteSize ||
      existing.contentType !== args.contentType
    ) {
      return rejected("A photo's picture can't change; take a new photo instead.");
    }
  }
  const object = await trx
    .selectFrom("photoObject")
    .select(["byteSize", "confirmedAt"])
    .where("sha256", "=", args.sha256)
    .executeTakeFirst();
  if (object && object.byteSize !== args.byteSize) {
    return rejected("The photo's size does not match the picture stored under its hash.");
  }
  if (!object && !existing) return { status: "held", reason: HELD_REASON };
  const version = await ctx.version(parent.regionId);
  return writeStep(trx, async () => {
    await childOfDeletedDig(ctx, args.digSiteId, parent.regionId, version, m);
    const row = await lockRow(trx, "photo", args.id);
    ctx.touch(args.digSiteId, parent.regionId);
    if (!row) {
      await insertRecord(
        trx,
        "photo",
        { ...args, objectKey: photoObjectKey(args.sha256), confirmedAt: object!.confirmedAt },
        ctx.writer(version),
      );
      return applied();
    }
    return putExisting(ctx, "photo", row, args, m, parent.regionId, version);
  });
}

export const photoObjectKey = (sha256: string) => `photos/${sha256}`;

async function deleteRecord(
  ctx: PushContext,
  table: SyncedTable,
  id: string,
  m: PushedMutation,
): Promise<Outcome> {
  const { trx } = ctx;
  const head =
    table === "digSite"
      ? await trx.selectFrom("digSite").select(["id as digSiteId"]).where("id", "=", id).executeTakeFirst()
      : table === "dugPlant"
        ? await trx.selectFrom("dugPlant").select("digSiteId").where("id", "=", id).executeTakeFirst()
        : await trx.selectFrom("photo").select("digSiteId").where("id", "=", id).executeTakeFirst();
  if (!head) return rejected("Nothing to delete: this record is not on the server.");
  const parent = await parentDig(ctx, head.digSiteId);
  if (!parent.ok) return parent.outcome;
  const version = await ctx.version(parent.regionId);
  return writeStep(trx, async () => {
    const row = await lockRow(trx, table, id);
    if (!row || row.deletedAt) return applied("Already deleted on the server.");
    if (await openCase(trx, head.digSiteId)) return rejected(OPEN_CASE_REASON);
    const edit = editSinceBase(table, row, m.baseVersion, ctx.clientId);
    await setDeleted(trx, table, id, true, ctx.writer(version));
    if (table !== "digSite") ctx.touch(head.digSiteId, parent.regionId);
    if (!edit) return applied();
    await recordConflict(trx, {
      regionId: parent.regionId,
      table,
      recordId: id,
      field: DELETED_FIELD,
      serverValue: { deleted: false, record: recordPayload(table, row) },
      clientValue: { deleted: true },
      serverUserId: edit.userId,
      serverChangedAt: edit.at,
      ...ctx.conflictBase(m),
    });
    return applied(
      "Someone else edited this record since this device last synced: it is deleted, and the edit is kept for a supervisor to settle.",
    );
  });
}

async function applyMutation(ctx: PushContext, m: PushedMutation): Promise<Outcome> {
  const mutation = m.mutation;
  switch (mutation.name) {
    case "digSite.put":
      return putDigSite(ctx, mutation.args, m);
    case "dugPlant.put":
      return putDugPlant(ctx, mutation.args, m);
    case "photo.put":
      return putPhoto(ctx, mutation.args, m);
    case "digSite.delete":
      return deleteRecord(ctx, "digSite", mutation.args.id, m);
    case "dugPlant.delete":
      return deleteRecord(ctx, "dugPlant", mutation.args.id, m);
    case "photo.delete":
      return deleteRecord(ctx, "photo", mutation.args.id, m);
  }
}

function mutationName(raw: Record<string, unknown>): string {
  const inner = raw.mutation as { name?: unknown } | undefined;
  return typeof inner?.name === "string" ? inner.name.slice(0, 100) : "unknown";
}

type Claim = { ok: true; lastMutationId: number } | { ok: false; error: string };

// The client group is the user's (made on first use); the client is made on its first push and locked.
async function claimClient(trx: Trx, actor: Actor, clientGroupId: string, clientId: string): Promise<Claim> {
  await trx
    .insertInto("syncClientGroup")
    .values({ id: clientGroupId, userId: actor.id })
    .onConflict((oc) => oc.column("id").doNothing())
    .execute();
  const group = await trx
    .selectFrom("syncClientGroup")
    .select("userId")
    .where("id", "=", clientGroupId)
    .executeTakeFirstOrThrow();
  if (group.userId !== actor.id) {
    return { ok: false, error: "This device's sync identity belongs to another user." };
  }
  await trx
    .insertInto("syncClient")
    .values({ id: clientId, clientGroupId })
    .onConflict((oc) => oc.column("id").doNothing())
    .execute();
  const client = await trx
    .selectFrom("syncClient")
    .select(["clientGroupId", "lastMutationId"])
    .where("id", "=", clientId)
    .forUpdate()
    .executeTakeFirstOrThrow();
  if (client.clientGroupId !== clientGroupId) {
    return { ok: false, error: "This sync client belongs to another device." };
  }
  return { ok: true, lastMutationId: client.lastMutationId };
}

const RETRYABLE = new Set(["40P01", "40001"]);

/** Applies one push for `actor` (see the contract at the top of this file). */
export async function pushMutations(actor: Actor, body: PushEnvelope): Promise<PushOutcome> {
  const entries = body.mutations;
  for (let i = 1; i < entries.length; i++) {
    if (entries[i]!.mutationId !== entries[i - 1]!.mutationId + 1) {
      return { kind: "invalid", error: "The mutation ids of a push must count up by one." };
    }
  }
  for (let attempt = 1; ; attempt++) {
    try {
      return await db.transaction().execute((trx) => pushOnce(trx, actor, body));
    } catch (err) {
      const code = (err as { code?: unknown }).code;
      if (attempt >= 3 || typeof code !== "string" || !RETRYABLE.has(code)) throw err;
    }
  }
}

async function pushOnce(trx: Trx, actor: Actor, body: PushEnvelope): Promise<PushOutcome> {
  const claim = await claimClient(trx, actor, body.clientGroupId, body.clientId);
  if (!claim.ok) return { kind: "forbidden", error: claim.error };
  const last = claim.lastMutationId;
  const fresh = body.mutations.filter((m) => m.mutationId > last);
  const first = fresh[0];
  if (first && first.mutationId !== last + 1) {
    return {
      kind: "gap",
      error: `Mutation ${last + 1} is missing: push the outbox from mutation ${last + 1} on.`,
      expectedMutationId: last + 1,
      lastMutationId: last,
    };
  }

  const ctx = new PushContext(trx, actor, body.clientId);
  const results: PushResult[] = [];
  const stored: {
    mutationId: number;
    name: string;
    status: "applied" | "rejected";
    reason: string | null;
  }[] = [];
  let lastMutationId = last;
  let held: { mutationId: number; reason: string } | null = null;
  for (const raw of fresh) {
    const parsed = pushedMutationSchema.safeParse({
      ...raw,
      mutation: upgradeMutation(body.schemaVersion, raw.mutation),
    });
    const outcome: Outcome = parsed.success
      ? await applyMutation(ctx, parsed.data)
      : rejected(`This record is not valid: ${issuesText(parsed.error)}`);
    if (outcome.status === "held") {
      held = { mutationId: raw.mutationId, reason: outcome.reason };
      break;
    }
    lastMutationId = raw.mutationId;
    const reason = "reason" in outcome ? outcome.reason : undefined;
    results.push({ mutationId: raw.mutationId, status: outcome.status, ...(reason ? { reason } : {}) });
    stored.push({
      mutationId: raw.mutationId,
      name: parsed.success ? parsed.data.mutation.name : mutationName(raw),
      status: outcome.status,
      reason: reason ?? null,
    });
  }

  const openedCaseIds: string[] = [];
  for (const [digSiteId, regionId] of ctx.touchedDigs) {
    const { openedCaseId } = await recomputeDig(trx, digSiteId, await ctx.version(regionId), actor.id);
    if (openedCaseId) openedCaseIds.push(openedCaseId);
  }
  if (stored.length > 0) {
    await trx
      .insertInto("syncMutationResult")
      .values(stored.map((s) => ({ clientId: body.clientId, ...s })))
      .execute();
  }
  await trx
    .updateTable("syncClient")
    .set({ lastMutationId, lastSeenAt: sql`now()` })
    .where("id", "=", body.clientId)
    .execute();

  const duplicateIds = body.mutations.filter((m) => m.mutationId <= last).map((m) => m.mutationId);
  const earlier =
    duplicateIds.length === 0
      ? []
      : await trx
          .selectFrom("syncMutationResult")
          .select(["mutationId", "status", "reason"])
          .where("clientId", "=", body.clientId)
          .where("mutationId", "in", duplicateIds)
          .orderBy("mutationId")
          .execute();
  const duplicates: PushResult[] = earlier.map((r) => ({
    mutationId: r.mutationId,
    status: r.status,
    ...(r.reason ? { reason: r.reason } : {}),
    duplicate: true,
  }));

  return {
    kind: "ok",
    response: {
      protocolVersion: PROTOCOL_VERSION,
      lastMutationId,
      results: [...duplicates, ...results],
      ...(held ? { heldAt: held.mutationId, reason: held.reason } : {}),
    },
    openedCaseIds,
  };
}
