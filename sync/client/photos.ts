import type { FieldDatabase, LocalPhoto } from "./db";
import { SignedOutError, SyncHttpError, UnsupportedVersionError } from "./errors";
import { defaultFetch, errorText, type FetchFn, postJson, readJson, refuse } from "./http";

// Photos upload first and are referenced second (shared/SYNC.md, "Photos"; the server side is
// sync/server/photos.ts): for each photo whose bytes are on this phone and not yet confirmed, ask
// for a presigned PUT keyed by its SHA-256 (nothing to send when the bucket already has it), PUT the
// bytes, have the server check size and hash, and only then mark it uploaded. The bytes stay on the
// phone until a pull shows the photo confirmed (sync/client/pull.ts drops them).

export const PRESIGN_URL = "/api/photos/presign";
export const CONFIRM_URL = "/api/photos/confirm";

/** Sends the bytes to a presigned URL; reports bytes sent so far; resolves with the HTTP status. */
export type PutBytes = (
  url: string,
  headers: Record<string, string>,
  bytes: ArrayBuffer,
  onProgress: (sent: number) => void,
) => Promise<number>;

export interface UploadOptions {
  fetch?: FetchFn;
  put?: PutBytes;
  // Bytes sent over bytes to send, across every photo of this run.
  onProgress?: (sent: number, total: number) => void;
  // Only these photos (the one a push is held at).
  only?: string[];
  // Tries per photo in this run, and the first wait between them (doubled each time).
  attempts?: number;
  retryDelayMs?: number;
  timeoutMs?: number;
  sleep?: (ms: number) => Promise<void>;
}

export interface UploadReport {
  // Confirmed by the server in this run, and those among them whose bytes it already had.
  confirmed: string[];
  alreadyStored: string[];
  // Refused for good (marked 'rejected' with the reason on the phone); these are never retried.
  refused: { photoId: string; reason: string }[];
}

class PermanentRefusal extends Error {}

// In the browser: XMLHttpRequest, the one API that reports upload progress. Elsewhere: fetch, with
// progress per photo.
export const defaultPut: PutBytes = (url, headers, bytes, onProgress) => {
  if (typeof XMLHttpRequest === "undefined") {
    return fetch(url, { method: "PUT", headers, body: bytes }).then(
      async (res) => {
        await res.arrayBuffer().catch(() => undefined);
        if (res.ok) onProgress(bytes.byteLength);
        return res.status;
      },
      (err: unknown) => {
        throw new SyncHttpError("The photo upload was cut off.", null, { cause: err });
      },
    );
  }
  return new Promise<number>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("PUT", url);
    for (const [k, v] of Object.entries(headers)) xhr.setRequestHeader(k, v);
    xhr.upload.onprogress = (e) => onProgress(e.loaded);
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) onProgress(bytes.byteLength);
      resolve(xhr.status);
    };
    const cut = () => reject(new SyncHttpError("The photo upload was cut off.", null));
    xhr.onerror = cut;
    xhr.onabort = cut;
    xhr.ontimeout = cut;
    xhr.timeout = 10 * 60_000;
    xhr.send(bytes);
  });
};

async function sha256Hex(bytes: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", bytes);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, "0")).join("");
}

// Photos waiting for upload, in the order their rows wait in the outbox (the order the rep took them).
async function waitingPhotos(db: FieldDatabase, only?: string[]) {
  return db.transaction("r", [db.photos, db.photoBytes, db.digSites, db.outbox], async () => {
    const queued = new Map<string, number>();
    for (const e of await db.outbox.toArray())
      if (!queued.has(e.recordId)) queued.set(e.recordId, e.mutationId);
    const rank = (id: string) => queued.get(id) ?? Number.MAX_SAFE_INTEGER;
    const photos = (await db.photos.where("uploaded").equals(0).toArray())
      .filter((p) => p.syncState !== "rejected" && (!only || only.includes(p.id)))
      .sort((a, b) => rank(a.id) - rank(b.id) || a.id.localeCompare(b.id));
    const out: { photo: LocalPhoto; bytes: ArrayBuffer; fieldId: string | null }[] = [];
    for (const photo of photos) {
      const stored = await db.photoBytes.get(photo.id);
      if (!stored) continue;
      const site = await db.digSites.get(photo.digSiteId);
      out.push({ photo, bytes: stored.bytes, fieldId: site?.fieldId ?? null });
    }
    return out;
  });
}

async function markRefused(db: FieldDatabase, photoId: string, reason: string) {
  await db.photos.update(photoId, { syncState: "rejected", rejectionReason: reason });
}

/**
 * Uploads every photo whose bytes are on this phone and not yet confirmed. Idempotent: a photo the
 * bucket already holds is only confirmed; the server checks size and hash before anything counts.
 * Each photo is tried `attempts` times with a doubling wait; the runner retries the rest later.
 * Throws SignedOutError at once on a 401 (nothing is marked), and after the run the last transient
 * failure (offline, a cut upload, a server error) when a photo is still not confirmed. A permanent
 * refusal (a dig the rep may no longer write, bytes on the phone that no longer match their hash)
 * marks that photo 'rejected' with the reason and is reported, not thrown.
 */
export async function uploadPhotos(db: FieldDatabase, options: UploadOptions = {}): Promise<UploadReport> {
  const doFetch = options.fetch ?? defaultFetch();
  const put = options.put ?? defaultPut;
  const attempts = Math.max(1, options.attempts ?? 3);
  const retryDelayMs = options.retryDelayMs ?? 1000;
  const timeoutMs = options.timeoutMs ?? 30_000;
  const sleep = options.sleep ?? ((ms: number) => new Promise<void>((r) => setTimeout(r, ms)));
  const report: UploadReport = { confirmed: [], alreadyStored: [], refused: [] };

  const photos = await waitingPhotos(db, options.only);
  const total = photos.reduce((n, p) => n + p.bytes.byteLength, 0);
  let done = 0;
  options.onProgress?.(0, total);
  let lastFailure: unknown = null;

  for (const { photo, bytes, fieldId } of photos) {
    const post = async (url: string, body: unknown) => {
      const res = await postJson(doFetch, url, body, timeoutMs);
      const json = await readJson(res);
      if (res.status === 401 || res.status === 409 || res.status === 426) refuse(res.status, json);
      return { res, json };
    };
    const uploadOnce = async (): Promise<"confirmed" | "alreadyStored"> => {
      if ((await sha256Hex(bytes)) !== photo.sha256 || bytes.byteLength !== photo.byteSize) {
        throw new PermanentRefusal("The picture stored on this phone is damaged and cannot be uploaded.");
      }
      const presign = await post(PRESIGN_URL, {
        photoId: photo.id,
        digSiteId: photo.digSiteId,
        fieldId,
        sha256: photo.sha256,
        byteSize: photo.byteSize,
        contentType: photo.contentType,
      });
      if ([403, 404, 413, 422].includes(presign.res.status)) {
        throw new PermanentRefusal(errorText(presign.json) ?? "The server refused this photo.");
      }
      if (!presign.res.ok || presign.json === null) refuse(presign.res.status, presign.json);
      const answer = presign.json as { exists?: unknown; url?: unknown; headers?: unknown };
      const stored = answer.exists === true;
      if (!stored) {
        if (typeof answer.url !== "string") {
          throw new SyncHttpError("The server's upload answer was not in the expected shape.", 200);
        }
        const headers = (answer.headers ?? {}) as Record<string, string>;
        const status = await put(answer.url, headers, bytes, (sent) =>
          options.onProgress?.(done + Math.min(sent, bytes.byteLength), total),
        );
        if (status < 200 || status >= 300) {
          throw new SyncHttpError(`The photo store answered ${status}.`, status);
        }
      }
      const confirm = await post(CONFIRM_URL, { sha256: photo.sha256, byteSize: photo.byteSize });
      // 422: the stored object is missing, short or wrong (a cut upload); the server dropped bad
      // bytes, so the next try uploads again.
      if (!confirm.res.ok || confirm.json?.confirmed !== true) refuse(confirm.res.status, confirm.json);
      return stored ? "alreadyStored" : "confirmed";
    };

    for (let attempt = 1; ; attempt++) {
      try {
        const outcome = await uploadOnce();
        await db.photos.update(photo.id, { uploaded: 1 });
        report.confirmed.push(photo.id);
        if (outcome === "alreadyStored") report.alreadyStored.push(photo.id);
        break;
      } catch (err) {
        if (err instanceof SignedOutError || err instanceof UnsupportedVersionError) throw err;
        if (err instanceof PermanentRefusal) {
          await markRefused(db, photo.id, err.message);
          report.refused.push({ photoId: photo.id, reason: err.message });
          break;
        }
        if (!(err instanceof SyncHttpError)) throw err;
        lastFailure = err;
        if (attempt >= attempts) break;
        await sleep(retryDelayMs * 2 ** (attempt - 1));
      }
    }
    done += bytes.byteLength;
    options.onProgress?.(done, total);
  }
  if (
    lastFailure &&
    photos.some((p) => !report.confirmed.includes(p.photo.id) && !isRefused(report, p.photo.id))
  ) {
    throw lastFailure;
  }
  return report;
}

const isRefused = (report: UploadReport, photoId: string) =>
  report.refused.some((r) => r.photoId === photoId);
