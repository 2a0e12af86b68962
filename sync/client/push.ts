import { PROTOCOL_VERSION, type PushResponse, pushResponseSchema } from "../protocol";
import type { FieldDatabase, OutboxEntry } from "./db";
import { SyncHttpError, UnsupportedVersionError } from "./errors";
import { defaultFetch, type FetchFn, postJson, readJson, refuse } from "./http";
import { getClientIdentity } from "./identity";
import { PULL_META } from "./pull";

// The write side of sync on the device (shared/SYNC.md, "Push"): send the outbox in mutation-id
// order and drop entries only up to the id the server acknowledged, in the same Dexie transaction
// that records what the server said about each of them.

export const PUSH_URL = "/api/sync/push";
// A batch stays small: one slow request on a rural link must not hold a week of work.
export const MAX_BATCH = 50;
// Highest mutation id the server has acknowledged to this device (never goes backwards).
export const LAST_ACKED = "lastAckedMutationId";
// [mutationId, photoId] of photo puts turned into deletes (see abandonHeldPhoto), until acknowledged.
const ABANDONED = "abandonedPhotoPuts";

export interface PushOptions {
  fetch?: FetchFn;
  url?: string;
  batchSize?: number;
  timeoutMs?: number;
  // Mutations acknowledged so far and the outbox size at the start.
  onProgress?: (done: number, total: number) => void;
}

export interface PushedNotice {
  mutationId: number;
  name: string;
  recordId: string;
  reason: string;
}

export interface PushReport {
  // Outbox entries the server acknowledged (applied or refused for good) and this push dropped.
  acknowledged: number;
  lastMutationId: number;
  requests: number;
  rejected: PushedNotice[];
  // The push stopped at a photo whose bytes the server has not confirmed: upload it, push again.
  held: { mutationId: number; photoId: string; reason: string } | null;
  // Queued photo puts this push turned into deletes: their bytes can never reach the server.
  abandonedPhotos: string[];
}

type RecordTable = "digSites" | "dugPlants" | "photos";
const TABLE_OF: Record<string, RecordTable> = { digSite: "digSites", dugPlant: "dugPlants", photo: "photos" };
const tableOf = (name: string) => TABLE_OF[name.split(".")[0] ?? ""];

// The next run of entries from `from` on: consecutive ids, one schema version (the push body states
// one; an outbox written by the previous app version goes in batches of its own).
async function nextBatch(db: FieldDatabase, from: number, size: number): Promise<OutboxEntry[]> {
  const entries = await db.outbox.where("mutationId").aboveOrEqual(from).limit(size).toArray();
  const batch: OutboxEntry[] = [];
  for (const e of entries) {
    const prev = batch[batch.length - 1];
    if (prev && (e.mutationId !== prev.mutationId + 1 || e.schemaVersion !== prev.schemaVersion)) break;
    batch.push(e);
  }
  return batch;
}

function pushBody(identity: { clientGroupId: string; clientId: string }, batch: OutboxEntry[]) {
  return {
    protocolVersion: PROTOCOL_VERSION,
    schemaVersion: batch[0]!.schemaVersion,
    clientGroupId: identity.clientGroupId,
    clientId: identity.clientId,
    mutations: batch.map((e) => ({
      mutationId: e.mutationId,
      baseVersion: e.baseVersion,
      observedAt: e.observedAt,
      mutation: { name: e.name, args: e.args },
    })),
  };
}

type Answer =
  | { kind: "ok"; response: PushResponse }
  | { kind: "gap"; expectedMutationId: number; lastMutationId: number; error: string };

async function readPushAnswer(res: Response): Promise<Answer> {
  const body = await readJson(res);
  if (res.status === 409 && typeof body?.expectedMutationId === "number") {
    return {
      kind: "gap",
      expectedMutationId: body.expectedMutationId,
      lastMutationId:
        typeof body.lastMutationId === "number" ? body.lastMutationId : body.expectedMutationId - 1,
      error: typeof body.error === "string" ? body.error : "The server is missing earlier changes.",
    };
  }
  if (!res.ok) refuse(res.status, body);
  if (body === null) {
    throw new SyncHttpError(
      "The server's answer was not sync data (a sign-in page or a network login page?).",
      res.status,
    );
  }
  const parsed = pushResponseSchema.safeParse(body);
  if (!parsed.success) {
    throw new SyncHttpError("The server's answer was not in the expected shape.", res.status, {
      cause: parsed.error,
    });
  }
  if (parsed.data.protocolVersion !== PROTOCOL_VERSION) {
    throw new UnsupportedVersionError(
      `The server speaks sync protocol ${parsed.data.protocolVersion}, this app ${PROTOCOL_VERSION}. Reload the app.`,
    );
  }
  return { kind: "ok", response: parsed.data };
}

/**
 * Records an acknowledgement in ONE transaction: drops the entries up to `lastMutationId`, marks
 * records the server refused ('rejected' with the reason) or merged over ('conflict'), unless a later
 * change of theirs is still waiting, and stores the acknowledged id. A refused delete (a dig kept as
 * evidence of an open injury case) leaves the device without a record the server still has, so the
 * next pull is a full one that brings it back.
 * Returns the refused mutations among `sent`.
 */
async function acknowledge(
  db: FieldDatabase,
  lastMutationId: number,
  sent: OutboxEntry[],
  results: PushResponse["results"],
): Promise<{ dropped: number; rejected: PushedNotice[] }> {
  return db.transaction("rw", [db.outbox, db.meta, db.digSites, db.dugPlants, db.photos], async () => {
    const done = await db.outbox.where("mutationId").belowOrEqual(lastMutationId).primaryKeys();
    await db.outbox.bulkDelete(done);
    const pending = new Set((await db.outbox.toArray()).map((e) => e.recordId));
    const abandoned = new Map(
      (((await db.meta.get(ABANDONED))?.value as [number, string][] | undefined) ?? []).map(([m, id]) => [
        m,
        id,
      ]),
    );
    const abandonedIds = new Set(abandoned.values());
    const byId = new Map(sent.map((e) => [e.mutationId, e]));
    const rejected: PushedNotice[] = [];
    let refusedDelete = false;
    for (const r of results) {
      const entry = byId.get(r.mutationId);
      if (!entry || r.mutationId > lastMutationId) continue;
      const table = tableOf(entry.name);
      if (r.status === "rejected") {
        // The refused "deletes" of a photo whose put was abandoned: nothing the rep needs to see.
        if (abandonedIds.has(entry.recordId) && entry.name === "photo.delete") continue;
        const reason = r.reason ?? "The server refused this change.";
        rejected.push({ mutationId: r.mutationId, name: entry.name, recordId: entry.recordId, reason });
        if (entry.name.endsWith(".delete")) refusedDelete = true;
        else if (table && !pending.has(entry.recordId)) {
          await db[table].update(entry.recordId, { syncState: "rejected", rejectionReason: reason });
        }
      } else if (r.reason && entry.name.endsWith(".put") && table && !pending.has(entry.recordId)) {
        await db[table].update(entry.recordId, { syncState: "conflict", rejectionReason: r.reason });
      }
    }
    if (refusedDelete) await db.meta.put({ key: PULL_META.cursor, value: null });
    for (const [m, id] of abandoned) if (!pending.has(id)) abandoned.delete(m);
    await db.meta.put({ key: ABANDONED, value: [...abandoned] });
    const before = ((await db.meta.get(LAST_ACKED))?.value as number | undefined) ?? 0;
    await db.meta.put({ key: LAST_ACKED, value: Math.max(before, lastMutationId) });
    return { dropped: done.length, rejected };
  });
}

// A queued photo put whose picture can never be uploaded (its bytes are gone from this phone, or the
// server refused the upload for good) would hold the queue forever. It becomes a delete under the
// same, never-acknowledged mutation id: the server refuses that as "nothing to delete", the counter
// moves on, and the photo stays on the phone marked with the reason (if it is still there).
async function abandonHeldPhoto(db: FieldDatabase, mutationId: number): Promise<string | null> {
  return db.transaction("rw", [db.outbox, db.photos, db.photoBytes, db.meta], async () => {
    const entry = await db.outbox.get(mutationId);
    if (entry?.name !== "photo.put") return null;
    const photo = await db.photos.get(entry.recordId);
    const bytes = await db.photoBytes.get(entry.recordId);
    if (bytes && photo && photo.syncState !== "rejected") return null;
    await db.outbox.put({ ...entry, name: "photo.delete", args: { id: entry.recordId } });
    const list = ((await db.meta.get(ABANDONED))?.value as [number, string][] | undefined) ?? [];
    await db.meta.put({ key: ABANDONED, value: [...list, [mutationId, entry.recordId]] });
    return entry.recordId;
  });
}

/**
 * Pushes the whole outbox, batch by batch, and returns what the server said. Idempotent and safe to
 * retry at any point: the server skips ids it has settled, and entries are dropped only once
 * acknowledged. Throws, leaving the outbox as it was past the last acknowledged batch:
 * SignedOutError (401), UnsupportedVersionError (409/426), SyncHttpError (offline: status null; any
 * other answer that is not a push response). A 409 gap resends from the id the server expects. A
 * held photo stops the push (report.held) for the uploader to run first.
 */
export async function push(db: FieldDatabase, options: PushOptions = {}): Promise<PushReport> {
  const doFetch = options.fetch ?? defaultFetch();
  const size = Math.max(1, Math.min(options.batchSize ?? MAX_BATCH, MAX_BATCH));
  const timeoutMs = options.timeoutMs ?? 60_000;
  const identity = await getClientIdentity(db);
  const total = await db.outbox.count();
  const report: PushReport = {
    acknowledged: 0,
    lastMutationId: ((await db.meta.get(LAST_ACKED))?.value as number | undefined) ?? 0,
    requests: 0,
    rejected: [],
    held: null,
    abandonedPhotos: [],
  };
  options.onProgress?.(0, total);
  let from = 0;
  let lastGap = -1;
  for (;;) {
    const batch = await nextBatch(db, from, size);
    if (batch.length === 0) break;
    report.requests++;
    const res = await postJson(doFetch, options.url ?? PUSH_URL, pushBody(identity, batch), timeoutMs);
    const answer = await readPushAnswer(res);
    if (answer.kind === "gap") {
      // The server has everything up to lastMutationId; it wants expectedMutationId next.
      await acknowledge(db, answer.lastMutationId, [], []);
      const expected = await db.outbox.get(answer.expectedMutationId);
      if (!expected || answer.expectedMutationId === lastGap) {
        throw new SyncHttpError(
          `The server is missing change ${answer.expectedMutationId} and this phone no longer has it. ${answer.error}`,
          409,
        );
      }
      lastGap = answer.expectedMutationId;
      from = answer.expectedMutationId;
      continue;
    }
    const { response } = answer;
    const ack = await acknowledge(db, response.lastMutationId, batch, response.results);
    report.acknowledged += ack.dropped;
    report.rejected.push(...ack.rejected);
    report.lastMutationId = Math.max(report.lastMutationId, response.lastMutationId);
    options.onProgress?.(Math.min(report.acknowledged, total), total);
    if (response.heldAt !== undefined) {
      const abandoned = await abandonHeldPhoto(db, response.heldAt);
      if (abandoned) {
        report.abandonedPhotos.push(abandoned);
        from = response.heldAt;
        continue;
      }
      const held = batch.find((e) => e.mutationId === response.heldAt);
      report.held = {
        mutationId: response.heldAt,
        photoId: held?.recordId ?? "",
        reason: response.reason ?? "Photo not uploaded yet.",
      };
      break;
    }
    if (response.lastMutationId < batch[batch.length - 1]!.mutationId) {
      // Nothing held, yet not everything acknowledged: a server this app does not understand.
      throw new SyncHttpError("The server acknowledged only part of the changes without saying why.", 200);
    }
    from = response.lastMutationId + 1;
  }
  return report;
}
