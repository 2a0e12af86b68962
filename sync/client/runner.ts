import { liveQuery, type Subscription } from "dexie";
import { type FieldDatabase, fieldDb } from "./db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "./errors";
import type { FetchFn } from "./http";
import { type PutBytes, uploadPhotos } from "./photos";
import { pullNow } from "./pull";
import { type PushReport, push } from "./push";
import { classifyStorageError } from "./storage";

// The field app's sync loop (shared/SYNC.md, "Runner"): one tab at a time under a navigator.locks
// lock, a cycle of photo upload → push → pull on start, when the phone comes back online, when the
// app comes back to the foreground, on a timer and on "Sync now", with exponential backoff and
// jitter after a failure and no attempts while offline. Every failure reaches the status; none is
// swallowed.

export const SYNC_LOCK = "trenchbook-sync";
export const LAST_SYNC_AT = "lastSyncAt";

export type SyncPhase = "idle" | "uploading" | "pushing" | "pulling";
export type SyncFailureKind = "signedOut" | "version" | "rejected" | "network" | "server" | "storage";

export interface SyncFailure {
  kind: SyncFailureKind;
  message: string;
}

// A record the server refused for good, with its reason, as the rep should see it.
export interface RefusedRecord {
  table: "digSite" | "dugPlant" | "photo";
  id: string;
  digSiteId: string;
  reason: string;
}

export interface SyncRunnerStatus {
  phase: SyncPhase;
  // Of the current phase, 0–1.
  progress: number;
  pendingMutations: number;
  pendingPhotos: number;
  lastSuccessAt: string | null;
  error: SyncFailure | null;
  refused: RefusedRecord[];
  online: boolean;
  // Another tab holds the sync lock and syncs for this one.
  otherTab: boolean;
  // When the next automatic attempt is due (after a failure: the backoff).
  nextAttemptAt: string | null;
}

export function failureOf(err: unknown): SyncFailure {
  // A failure whose own recording failed too: the first is what happened.
  if (err instanceof AggregateError && err.errors.length > 0) return failureOf(err.errors[0]);
  const message = err instanceof Error ? err.message : String(err);
  if (err instanceof SignedOutError) return { kind: "signedOut", message };
  if (err instanceof UnsupportedVersionError) return { kind: "version", message };
  if (err instanceof SyncHttpError) return { kind: err.status === null ? "network" : "server", message };
  if (classifyStorageError(err) !== "other") return { kind: "storage", message };
  return { kind: "server", message };
}

export interface CycleOptions {
  fetch?: FetchFn;
  put?: PutBytes;
  batchSize?: number;
  now?: () => Date;
  onPhase?: (phase: SyncPhase, progress: number) => void;
  // Tries per photo within a cycle (the runner's backoff retries the rest).
  photoAttempts?: number;
  photoRetryDelayMs?: number;
}

export interface CycleReport {
  pushes: PushReport[];
  photosConfirmed: number;
}

// How often a cycle goes back to the uploader for a push held at a photo before it gives up.
const MAX_HOLDS = 5;

/**
 * One sync cycle with the real device code: upload waiting photos, push the outbox (uploading a
 * photo the push is held at, then pushing again), pull. Throws the first failure; what was
 * acknowledged before it stays acknowledged, the rest stays in the outbox.
 */
export async function syncOnce(db: FieldDatabase, options: CycleOptions = {}): Promise<CycleReport> {
  const phase = options.onPhase ?? (() => undefined);
  const upload = async (only?: string[]) => {
    phase("uploading", 0);
    const r = await uploadPhotos(db, {
      fetch: options.fetch,
      put: options.put,
      only,
      attempts: options.photoAttempts,
      retryDelayMs: options.photoRetryDelayMs,
      onProgress: (sent, total) => phase("uploading", total === 0 ? 1 : sent / total),
    });
    return r.confirmed.length;
  };
  const report: CycleReport = { pushes: [], photosConfirmed: await upload() };
  for (let holds = 0; ; holds++) {
    phase("pushing", 0);
    const pushed = await push(db, {
      fetch: options.fetch,
      batchSize: options.batchSize,
      onProgress: (done, total) => phase("pushing", total === 0 ? 1 : done / total),
    });
    report.pushes.push(pushed);
    if (!pushed.held) break;
    if (holds >= MAX_HOLDS) {
      throw new SyncHttpError(`The server still waits for a photo: ${pushed.held.reason}`, 200);
    }
    report.photosConfirmed += await upload([pushed.held.photoId]);
  }
  phase("pulling", 0);
  await pullNow(db, { fetch: options.fetch as typeof fetch | undefined, now: options.now?.() });
  phase("pulling", 1);
  await db.meta.put({ key: LAST_SYNC_AT, value: (options.now?.() ?? new Date()).toISOString() });
  return report;
}

// What the runner needs from the page; tests give their own.
export interface RunnerEnv {
  locks: { request: LockManager["request"] } | null;
  isOnline(): boolean;
  isVisible(): boolean;
  listen(event: "online" | "offline" | "visibilitychange", handler: () => void): () => void;
}

export function browserEnv(): RunnerEnv {
  return {
    locks: typeof navigator !== "undefined" && navigator.locks ? navigator.locks : null,
    isOnline: () => typeof navigator === "undefined" || navigator.onLine !== false,
    isVisible: () => typeof document === "undefined" || document.visibilityState === "visible",
    listen: (event, handler) => {
      const target = event === "visibilitychange" ? document : window;
      target.addEventListener(event, handler);
      return () => target.removeEventListener(event, handler);
    },
  };
}

export interface SyncRunnerOptions extends Omit<CycleOptions, "onPhase"> {
  onStatus?: (status: SyncRunnerStatus) => void;
  // The database, asked for afresh every cycle so a connection the browser closed is reopened.
  db?: () => FieldDatabase;
  env?: RunnerEnv;
  intervalMs?: number;
  backoffBaseMs?: number;
  backoffCapMs?: number;
  random?: () => number;
}

export interface SyncRunner {
  // Runs a cycle now (or right after the one running) and resolves when it has finished.
  syncNow(): Promise<void>;
  stop(): void;
  status(): SyncRunnerStatus;
}

/** Delay before attempt n+1 after n consecutive failures: doubling from base, capped, jittered. */
export function backoffDelay(failures: number, baseMs: number, capMs: number, random: () => number): number {
  const ceiling = Math.min(capMs, baseMs * 2 ** Math.max(0, failures - 1));
  // "Equal jitter": at least half the ceiling, so retries never bunch up at zero.
  return Math.round(ceiling / 2 + (random() * ceiling) / 2);
}

// Photos still to upload; one the server refused for good is shown as refused, not as waiting.
const waitingPhotoCount = (db: FieldDatabase) =>
  db.photos
    .where("uploaded")
    .equals(0)
    .filter((p) => p.syncState !== "rejected")
    .count();

async function refusedRecords(db: FieldDatabase): Promise<RefusedRecord[]> {
  return db.transaction("r", [db.digSites, db.dugPlants, db.photos], async () => {
    const sites = await db.digSites.where("syncState").equals("rejected").toArray();
    const plants = await db.dugPlants.where("syncState").equals("rejected").toArray();
    const photos = await db.photos.where("syncState").equals("rejected").toArray();
    return [
      ...sites.map((r) => ({
        table: "digSite" as const,
        id: r.id,
        digSiteId: r.id,
        reason: r.rejectionReason,
      })),
      ...plants.map((r) => ({
        table: "dugPlant" as const,
        id: r.id,
        digSiteId: r.digSiteId,
        reason: r.rejectionReason,
      })),
      ...photos.map((r) => ({
        table: "photo" as const,
        id: r.id,
        digSiteId: r.digSiteId,
        reason: r.rejectionReason,
      })),
    ].map((r) => ({ ...r, reason: r.reason ?? "The server refused this record." }));
  });
}

/**
 * Starts the page's sync loop. Call once per page (the field layout does); `stop()` on unmount.
 * Only one tab syncs at a time: when another holds the lock this one skips and tries again on its
 * timer. Nothing runs while the browser says it is offline; coming back online syncs at once.
 */
export function startSyncRunner(options: SyncRunnerOptions = {}): SyncRunner {
  const getDb = options.db ?? fieldDb;
  const env = options.env ?? browserEnv();
  const intervalMs = options.intervalMs ?? 60_000;
  const baseMs = options.backoffBaseMs ?? 5_000;
  const capMs = options.backoffCapMs ?? 5 * 60_000;
  const random = options.random ?? Math.random;
  const now = options.now ?? (() => new Date());

  let status: SyncRunnerStatus = {
    phase: "idle",
    progress: 0,
    pendingMutations: 0,
    pendingPhotos: 0,
    lastSuccessAt: null,
    error: null,
    refused: [],
    online: env.isOnline(),
    otherTab: false,
    nextAttemptAt: null,
  };
  let stopped = false;
  let failures = 0;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let running: Promise<void> | null = null;
  let again = false;
  let cycleError: SyncFailure | null = null;
  let localBusy = false;

  const emit = (patch: Partial<SyncRunnerStatus>) => {
    status = { ...status, ...patch };
    // A refused record is shown until it is dealt with, unless a failure is more urgent.
    const error = cycleError ?? (status.refused.length > 0 ? refusedFailure(status.refused) : null);
    status = { ...status, error };
    if (!stopped) options.onStatus?.(status);
  };

  const refreshCounts = async () => {
    const db = getDb();
    const [pendingMutations, pendingPhotos, refused, last] = await Promise.all([
      db.outbox.count(),
      waitingPhotoCount(db),
      refusedRecords(db),
      db.meta.get(LAST_SYNC_AT),
    ]);
    emit({
      pendingMutations,
      pendingPhotos,
      refused,
      lastSuccessAt: (last?.value as string | undefined) ?? null,
    });
  };

  // Counts follow the database as the rep saves (every tab sees the same IndexedDB).
  let watch: Subscription | null = null;
  const watchCounts = () => {
    watch?.unsubscribe();
    const db = getDb();
    watch = liveQuery(() => Promise.all([db.outbox.count(), waitingPhotoCount(db)])).subscribe({
      next: ([pendingMutations, pendingPhotos]) => emit({ pendingMutations, pendingPhotos }),
      error: (err: unknown) => {
        cycleError = failureOf(err);
        emit({});
      },
    });
  };

  const schedule = (ms: number) => {
    if (timer) clearTimeout(timer);
    timer = null;
    if (stopped || !env.isOnline()) {
      emit({ nextAttemptAt: null });
      return;
    }
    timer = setTimeout(() => {
      timer = null;
      void runSoon();
    }, ms);
    emit({ nextAttemptAt: new Date(now().getTime() + ms).toISOString() });
  };

  const withLock = async (fn: () => Promise<void>): Promise<boolean> => {
    if (env.locks) {
      return env.locks.request(SYNC_LOCK, { ifAvailable: true }, async (lock) => {
        if (!lock) return false;
        await fn();
        return true;
      });
    }
    // No Web Locks (an old browser): at least one cycle at a time in this tab.
    if (localBusy) return false;
    localBusy = true;
    try {
      await fn();
      return true;
    } finally {
      localBusy = false;
    }
  };

  const cycle = async () => {
    if (!env.isOnline()) {
      emit({ online: false, phase: "idle", nextAttemptAt: null });
      return;
    }
    let failed = false;
    const ran = await withLock(async () => {
      const db = getDb();
      try {
        await syncOnce(db, {
          ...options,
          now,
          onPhase: (phase, progress) => emit({ phase, progress }),
        });
        failures = 0;
        cycleError = null;
      } catch (err) {
        failed = true;
        failures++;
        cycleError = failureOf(err);
        console.error("Sync failed", err);
        // A connection the browser closed under us: the next cycle opens a fresh one.
        if (classifyStorageError(err) === "unavailable") db.close();
      }
    }).catch((err: unknown) => {
      // The lock itself or the database failed before the cycle began.
      failed = true;
      failures++;
      cycleError = failureOf(err);
      console.error("Sync could not start", err);
      return true;
    });
    emit({ phase: "idle", progress: 0, otherTab: !ran, online: env.isOnline() });
    await refreshCounts().catch((err: unknown) => {
      cycleError ??= failureOf(err);
      emit({});
    });
    schedule(failed ? backoffDelay(failures, baseMs, capMs, random) : intervalMs);
  };

  const runSoon = (): Promise<void> => {
    if (stopped) return Promise.resolve();
    if (running) {
      again = true;
      return running;
    }
    running = (async () => {
      try {
        do {
          again = false;
          await cycle();
        } while (again && !stopped);
      } finally {
        running = null;
      }
    })();
    return running;
  };

  const unlisten = [
    env.listen("online", () => {
      failures = 0;
      emit({ online: true });
      void runSoon();
    }),
    env.listen("offline", () => {
      if (timer) clearTimeout(timer);
      timer = null;
      emit({ online: false, nextAttemptAt: null });
    }),
    env.listen("visibilitychange", () => {
      if (env.isVisible()) {
        // Back from the background: the database connection may have been dropped meanwhile.
        watchCounts();
        void runSoon();
      }
    }),
  ];

  watchCounts();
  void refreshCounts().catch((err: unknown) => {
    cycleError = failureOf(err);
    emit({});
  });
  void runSoon();

  return {
    syncNow: () => {
      if (timer) clearTimeout(timer);
      timer = null;
      return runSoon();
    },
    stop: () => {
      stopped = true;
      if (timer) clearTimeout(timer);
      watch?.unsubscribe();
      for (const off of unlisten) off();
    },
    status: () => status,
  };
}

function refusedFailure(refused: RefusedRecord[]): SyncFailure {
  const first = refused[0]!;
  const what = first.table === "digSite" ? "A dig" : first.table === "dugPlant" ? "A plant" : "A photo";
  const more = refused.length > 1 ? ` (and ${refused.length - 1} more)` : "";
  return { kind: "rejected", message: `${what} was refused by the server${more}: ${first.reason}` };
}
