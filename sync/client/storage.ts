// Device storage: ask the browser to keep our data, and turn storage failures into plain words.

export type PersistResult = "persisted" | "refused" | "unsupported";

export async function requestPersistentStorage(): Promise<PersistResult> {
  if (typeof navigator === "undefined" || !navigator.storage?.persist) return "unsupported";
  if (await navigator.storage.persisted()) return "persisted";
  return (await navigator.storage.persist()) ? "persisted" : "refused";
}

export async function storageEstimate(): Promise<{ usage: number; quota: number } | null> {
  if (typeof navigator === "undefined" || !navigator.storage?.estimate) return null;
  const { usage = 0, quota = 0 } = await navigator.storage.estimate();
  return { usage, quota };
}

export type StorageErrorKind = "quota" | "unavailable" | "other";

// Dexie wraps the browser's error; the kind tells the UI what to say. Never swallow the error: show it.
export function classifyStorageError(err: unknown): StorageErrorKind {
  const names: string[] = [];
  let e: unknown = err;
  for (let i = 0; e && i < 5; i++) {
    const rec = e as { name?: string; inner?: unknown; cause?: unknown };
    if (rec.name) names.push(rec.name);
    e = rec.inner ?? rec.cause;
  }
  if (names.some((n) => n === "QuotaExceededError")) return "quota";
  if (
    names.some((n) =>
      [
        "OpenFailedError",
        "DatabaseClosedError",
        "InvalidStateError",
        "MissingAPIError",
        "UnknownError",
      ].includes(n),
    )
  ) {
    return "unavailable";
  }
  return "other";
}
