import { PROTOCOL_VERSION, type PullResponse, pullResponseSchema, SCHEMA_VERSION } from "../protocol";
import type { FieldDatabase, LocalDigSite, LocalDugPlant, LocalPhoto, OutboxEntry } from "./db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "./errors";
import { getClientIdentity } from "./identity";
import { classifyStorageError } from "./storage";

// The read side of sync on the device (shared/SYNC.md, "Pull"): ask the server for what changed
// since the stored cursor, check the answer before trusting any of it, then apply the page and store
// the new cursor in ONE Dexie transaction, so a closed tab leaves either the old state or the new.

export const PULL_URL = "/api/sync/pull";

export const PULL_META = {
  cursor: "cursor",
  lastMutationIds: "lastMutationIds",
  lastPullAt: "lastPullAt",
  rejections: "rejections",
  lastError: "lastError",
} as const;

export interface PullOptions {
  fetch?: typeof fetch;
  url?: string;
  now?: Date;
}

export interface PullResult {
  // False when another tab applied a newer page while this one was in flight; nothing was changed.
  applied: boolean;
  // The server's copy replaced the device's (first pull, or the server asked for a reset).
  full: boolean;
}

/**
 * Pulls one page and applies it. Safe to repeat and to run from several tabs: a page is applied only
 * on top of the cursor it was asked with. Offline or signed out it throws (SyncHttpError with a null
 * status, SignedOutError) and changes nothing; the outbox is never touched except to drop the
 * entries the server reports as done. Local records with entries still waiting keep their local
 * values: the server's copy of them lands after their push is acknowledged.
 */
export async function pull(db: FieldDatabase, options: PullOptions = {}): Promise<PullResult> {
  const doFetch = options.fetch ?? globalThis.fetch.bind(globalThis);
  const identity = await getClientIdentity(db);
  const sentCursor = ((await db.meta.get(PULL_META.cursor))?.value as string | undefined) ?? null;
  const res = await doFetch(options.url ?? PULL_URL, {
    method: "POST",
    credentials: "same-origin",
    cache: "no-store",
    headers: { "content-type": "application/json", accept: "application/json" },
    body: JSON.stringify({
      protocolVersion: PROTOCOL_VERSION,
      schemaVersion: SCHEMA_VERSION,
      clientGroupId: identity.clientGroupId,
      cursor: sentCursor,
    }),
  }).catch((err: unknown) => {
    throw new SyncHttpError("Could not reach the server.", null, { cause: err });
  });
  const response = await readPullResponse(res);
  return applyPull(db, identity.clientId, sentCursor, response, options.now ?? new Date());
}

const isJson = (res: Response) =>
  /^application\/(?:[\w.+-]+\+)?json(?:;|$)/i.test((res.headers.get("content-type") ?? "").trim());

async function serverMessage(res: Response): Promise<string | null> {
  if (!isJson(res)) return null;
  const body = (await res.json().catch(() => null)) as { error?: unknown } | null;
  return typeof body?.error === "string" ? body.error : null;
}

// Status first, then content type, then shape: only a 2xx JSON answer in the protocol's shape counts.
async function readPullResponse(res: Response): Promise<PullResponse> {
  if (res.status === 401) throw new SignedOutError();
  if (res.status === 409 || res.status === 426) {
    throw new UnsupportedVersionError(
      (await serverMessage(res)) ?? "The server does not accept this version of the field app. Reload it.",
    );
  }
  if (!res.ok) {
    const message = await serverMessage(res);
    throw new SyncHttpError(`The server answered ${res.status}${message ? `: ${message}` : "."}`, res.status);
  }
  if (res.redirected || !isJson(res)) {
    throw new SyncHttpError(
      "The server's answer was not sync data (a sign-in page or a network login page?).",
      res.status,
    );
  }
  let body: unknown;
  try {
    body = await res.json();
  } catch (err) {
    throw new SyncHttpError("The server's answer was not valid JSON.", res.status, { cause: err });
  }
  const parsed = pullResponseSchema.safeParse(body);
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
  return parsed.data;
}

type Changes = PullResponse["changes"];
type RecordTable = "digSites" | "dugPlants" | "photos";

const TABLE_OF: Record<string, RecordTable> = { digSite: "digSites", dugPlant: "dugPlants", photo: "photos" };

/**
 * Applies a validated pull response in one transaction (exported for tests and for the runner).
 * `sentCursor` is the cursor the request carried: if the stored cursor has moved since, the page is
 * stale and ignored, so a slow older response never rolls the device back.
 */
export async function applyPull(
  db: FieldDatabase,
  clientId: string,
  sentCursor: string | null,
  response: PullResponse,
  now = new Date(),
): Promise<PullResult> {
  const at = now.toISOString();
  const { changes } = response;
  return db.transaction(
    "rw",
    [
      db.accounts,
      db.fields,
      db.plantings,
      db.fertilizerPasses,
      db.products,
      db.weather,
      db.digSites,
      db.dugPlants,
      db.photos,
      db.photoBytes,
      db.outbox,
      db.meta,
    ],
    async () => {
      const stored = ((await db.meta.get(PULL_META.cursor))?.value as string | undefined) ?? null;
      if (stored !== sentCursor) return { applied: false, full: false };

      // The server has applied or refused every mutation up to this id, and the rows below already
      // show their effect (same snapshot): those entries are done.
      const acked = response.lastMutationIds[clientId] ?? 0;
      const done = await db.outbox.where("mutationId").belowOrEqual(acked).toArray();
      await db.outbox.bulkDelete(done.map((e) => e.mutationId));
      const waiting = await db.outbox.toArray();
      const pending = new Set(waiting.map((e) => e.recordId));
      // A dig site with plants or photos still waiting stays, so they are never orphaned on the device.
      const anchored = new Set(pending);
      for (const plant of await db.dugPlants.bulkGet([...pending])) if (plant) anchored.add(plant.digSiteId);
      for (const photo of await db.photos.bulkGet([...pending])) if (photo) anchored.add(photo.digSiteId);

      const full = response.reset || sentCursor === null;
      if (full) await dropServerCopy(db, changes, anchored);

      await db.accounts.clear();
      await db.accounts.bulkPut(changes.accounts);
      await db.products.clear();
      await db.products.bulkPut(changes.products);
      await db.weather.clear();
      await db.weather.bulkPut(changes.weather);

      await applyVersioned(db.fields, changes.fields);
      await applyVersioned(db.plantings, changes.plantings);
      await applyVersioned(db.fertilizerPasses, changes.fertilizerPasses);

      for (const row of changes.digSites) {
        if (pending.has(row.id)) continue;
        if (row.deleted) {
          if (!anchored.has(row.id)) await deleteDigSite(db, row.id, pending);
          continue;
        }
        const { version, deleted: _, repId: __, ...site } = row;
        const old = await db.digSites.get(row.id);
        const local: LocalDigSite = {
          ...site,
          syncState: "synced",
          serverVersion: version,
          rejectionReason: null,
          updatedLocallyAt: old?.updatedLocallyAt ?? at,
        };
        await db.digSites.put(local);
      }
      for (const row of changes.dugPlants) {
        if (pending.has(row.id)) continue;
        if (row.deleted) {
          await db.dugPlants.delete(row.id);
          continue;
        }
        const { version, deleted: _, ...plant } = row;
        const old = await db.dugPlants.get(row.id);
        const local: LocalDugPlant = {
          ...plant,
          syncState: "synced",
          serverVersion: version,
          rejectionReason: null,
          updatedLocallyAt: old?.updatedLocallyAt ?? at,
        };
        await db.dugPlants.put(local);
      }
      for (const row of changes.photos) {
        if (pending.has(row.id)) continue;
        if (row.deleted) {
          await db.photos.delete(row.id);
          await db.photoBytes.delete(row.id);
          continue;
        }
        const { version, deleted: _, ...photo } = row;
        const old = await db.photos.get(row.id);
        const local: LocalPhoto = {
          ...photo,
          syncState: "synced",
          serverVersion: version,
          rejectionReason: null,
          updatedLocallyAt: old?.updatedLocallyAt ?? at,
          uploaded: photo.confirmedAt !== null ? 1 : (old?.uploaded ?? 0),
        };
        await db.photos.put(local);
        // The server holds the confirmed picture now: the phone's copy of the bytes can go.
        if (photo.confirmedAt !== null) await db.photoBytes.delete(row.id);
      }

      await markRejected(db, clientId, done, pending, response.rejections);

      await db.meta.bulkPut([
        { key: PULL_META.cursor, value: response.cursor },
        { key: PULL_META.lastMutationIds, value: response.lastMutationIds },
        { key: PULL_META.lastPullAt, value: at },
        { key: PULL_META.rejections, value: response.rejections },
      ]);
      return { applied: true, full };
    },
  );
}

// A full snapshot replaces the device's copy of server data. Records with entries still waiting
// (and dig sites holding such records) stay; photos still in the snapshot keep their local bytes.
async function dropServerCopy(db: FieldDatabase, changes: Changes, waiting: Set<string>) {
  // Records the server refused stay too (with their dig), showing their reason until the rep acts.
  const anchored = new Set(waiting);
  for (const id of await db.digSites.where("syncState").equals("rejected").primaryKeys()) anchored.add(id);
  for (const table of [db.dugPlants, db.photos] as const) {
    for (const row of await table.where("syncState").equals("rejected").toArray()) {
      anchored.add(row.id);
      anchored.add(row.digSiteId);
    }
  }
  await db.fields.clear();
  await db.plantings.clear();
  await db.fertilizerPasses.clear();
  const keepPhotos = new Set([...anchored, ...changes.photos.map((p) => p.id)]);
  const sites = await db.digSites.toCollection().primaryKeys();
  await db.digSites.bulkDelete(sites.filter((id) => !anchored.has(id)));
  const plants = await db.dugPlants.toCollection().primaryKeys();
  await db.dugPlants.bulkDelete(plants.filter((id) => !anchored.has(id)));
  const photos = await db.photos.toCollection().primaryKeys();
  await db.photos.bulkDelete(photos.filter((id) => !anchored.has(id)));
  const bytes = await db.photoBytes.toCollection().primaryKeys();
  await db.photoBytes.bulkDelete(bytes.filter((id) => !keepPhotos.has(id)));
}

interface Versioned {
  id: string;
  version: number;
  deleted: boolean;
}

async function applyVersioned<R extends Versioned>(
  table: { bulkDelete(keys: string[]): Promise<void>; bulkPut(rows: Omit<R, "deleted">[]): Promise<unknown> },
  rows: R[],
) {
  await table.bulkDelete(rows.filter((r) => r.deleted).map((r) => r.id));
  await table.bulkPut(rows.filter((r) => !r.deleted).map(({ deleted: _, ...row }) => row));
}

// A dig site the server deleted goes with its plants, photos and photo bytes, except anything waiting.
async function deleteDigSite(db: FieldDatabase, id: string, pending: Set<string>) {
  await db.digSites.delete(id);
  const plants = await db.dugPlants.where("digSiteId").equals(id).primaryKeys();
  await db.dugPlants.bulkDelete(plants.filter((p) => !pending.has(p)));
  const photos = (await db.photos.where("digSiteId").equals(id).primaryKeys()).filter((p) => !pending.has(p));
  await db.photos.bulkDelete(photos);
  await db.photoBytes.bulkDelete(photos);
}

// A change the server refused for good shows on its record with the reason, until the next change.
async function markRejected(
  db: FieldDatabase,
  clientId: string,
  done: OutboxEntry[],
  pending: Set<string>,
  rejections: PullResponse["rejections"],
) {
  const reasons = new Map(
    rejections.filter((r) => r.clientId === clientId).map((r) => [r.mutationId, r.reason]),
  );
  for (const entry of done) {
    const reason = reasons.get(entry.mutationId);
    const table = TABLE_OF[entry.name.split(".")[0] ?? ""];
    if (reason === undefined || !table || pending.has(entry.recordId)) continue;
    await db[table].update(entry.recordId, { syncState: "rejected", rejectionReason: reason });
  }
}

export type SyncErrorKind = "signed-out" | "unsupported-version" | "offline" | "server" | "storage" | "other";

export interface SyncErrorInfo {
  kind: SyncErrorKind;
  message: string;
  at: string;
}

export function syncErrorKind(err: unknown): SyncErrorKind {
  if (err instanceof SignedOutError) return "signed-out";
  if (err instanceof UnsupportedVersionError) return "unsupported-version";
  if (err instanceof SyncHttpError) return err.status === null ? "offline" : "server";
  return classifyStorageError(err) === "other" ? "other" : "storage";
}

/**
 * The top-level pull the app calls (on start, when back online, on a timer): records the outcome in
 * meta for `syncStatus` and rethrows any failure for the caller to show.
 */
export async function pullNow(db: FieldDatabase, options: PullOptions = {}): Promise<PullResult> {
  try {
    const result = await pull(db, options);
    await db.meta.put({ key: PULL_META.lastError, value: null });
    return result;
  } catch (err) {
    const info: SyncErrorInfo = {
      kind: syncErrorKind(err),
      message: err instanceof Error ? err.message : String(err),
      at: (options.now ?? new Date()).toISOString(),
    };
    try {
      await db.meta.put({ key: PULL_META.lastError, value: info });
    } catch (metaErr) {
      throw new AggregateError([err, metaErr], "Pull failed, and its failure could not be recorded.");
    }
    throw err;
  }
}

export interface SyncStatus {
  pendingMutations: number;
  pendingPhotos: number;
  lastPullAt: string | null;
  lastError: SyncErrorInfo | null;
}

// What the UI shows about sync: what is waiting, when the last pull succeeded, the last failure.
export async function syncStatus(db: FieldDatabase): Promise<SyncStatus> {
  return db.transaction("r", [db.outbox, db.photos, db.meta], async () => ({
    pendingMutations: await db.outbox.count(),
    pendingPhotos: await db.photos.where("uploaded").equals(0).count(),
    lastPullAt: ((await db.meta.get(PULL_META.lastPullAt))?.value as string | undefined) ?? null,
    lastError: ((await db.meta.get(PULL_META.lastError))?.value as SyncErrorInfo | null | undefined) ?? null,
  }));
}
