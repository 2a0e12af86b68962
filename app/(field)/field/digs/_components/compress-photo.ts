import imageCompression, { type Options } from "browser-image-compression";
import { MAX_PHOTO_BYTES } from "@/sync/protocol";

// A camera photo made ready to keep on the phone: compressed to about 2048 px on the long edge and
// about 400 KB, hashed, with its size and when it was taken. Works offline and fetches nothing: never
// the library's own worker (it loads the library from a CDN), but our bundled worker, or the page when
// that worker cannot start. (A Turbopack worker answered from the service worker's precache loses the
// bootstrap parameters carried in its URL fragment and fails to start; the page then does the work.)

export const MAX_EDGE_PX = 2048;
/** Target size: 400 KB (browser-image-compression counts 1 MB as 1024 × 1024 bytes). */
export const TARGET_MB = 400 / 1024;

const OPTIONS: Options = {
  maxWidthOrHeight: MAX_EDGE_PX,
  maxSizeMB: TARGET_MB,
  initialQuality: 0.85,
  fileType: "image/jpeg",
};

export interface PreparedPhoto {
  bytes: ArrayBuffer;
  sha256: string;
  byteSize: number;
  contentType: "image/jpeg";
  width: number;
  height: number;
  capturedAt: string;
  /** "worker" or "page": where the compression ran. */
  ranIn: "worker" | "page";
}

// Once a worker has failed to start on this page it is not tried again: the page compresses instead.
let workerFailed = false;

function compressInWorker(file: File, onProgress: (p: number) => void): Promise<Blob> {
  return new Promise((resolve, reject) => {
    let worker: Worker;
    try {
      worker = new Worker(new URL("./compress-worker.ts", import.meta.url), { type: "module" });
    } catch (err) {
      reject(err);
      return;
    }
    worker.addEventListener(
      "message",
      (event: MessageEvent<{ progress?: number; blob?: Blob; error?: string }>) => {
        if (event.data.progress !== undefined) return onProgress(event.data.progress);
        worker.terminate();
        if (event.data.blob) resolve(event.data.blob);
        else reject(new Error(event.data.error ?? "Compression failed."));
      },
    );
    worker.addEventListener("error", (event) => {
      worker.terminate();
      workerFailed = true;
      reject(new Error(event.message || "The compression worker did not start."));
    });
    worker.postMessage({ file, options: OPTIONS });
  });
}

async function sha256Hex(bytes: ArrayBuffer): Promise<string> {
  const digest = await crypto.subtle.digest("SHA-256", bytes);
  return [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
}

async function dimensions(blob: Blob): Promise<{ width: number; height: number }> {
  const bitmap = await createImageBitmap(blob);
  try {
    return { width: bitmap.width, height: bitmap.height };
  } finally {
    bitmap.close();
  }
}

export class PhotoTooLargeError extends Error {
  override name = "PhotoTooLargeError";
}

/**
 * Compresses, measures and hashes one photo. `onProgress` gets 0–100. Throws when the file is not an
 * image the browser can read, or when even compressed it is over the protocol's limit.
 */
export async function preparePhoto(
  file: File,
  onProgress: (p: number) => void = () => {},
): Promise<PreparedPhoto> {
  const capturedAt = new Date(file.lastModified || Date.now()).toISOString();
  let blob: Blob | null = null;
  let ranIn: PreparedPhoto["ranIn"] = "worker";
  if (!workerFailed && typeof Worker !== "undefined") {
    try {
      blob = await compressInWorker(file, onProgress);
    } catch (err) {
      console.warn("Compressing on the page: the worker was not available", err);
    }
  }
  if (!blob) {
    ranIn = "page";
    blob = await imageCompression(file, { ...OPTIONS, useWebWorker: false, onProgress });
  }
  const bytes = await blob.arrayBuffer();
  if (bytes.byteLength > MAX_PHOTO_BYTES)
    throw new PhotoTooLargeError("The photo is too large even after compression.");
  const { width, height } = await dimensions(blob);
  return {
    bytes,
    sha256: await sha256Hex(bytes),
    byteSize: bytes.byteLength,
    contentType: "image/jpeg",
    width,
    height,
    capturedAt,
    ranIn,
  };
}
