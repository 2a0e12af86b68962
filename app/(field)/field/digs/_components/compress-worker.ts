/// <reference lib="webworker" />
import imageCompression, { type Options } from "browser-image-compression";

// Compresses one photo off the main thread. This script is bundled with the app (and precached by the
// service worker), so, unlike the library's own worker that loads its code from a CDN, it needs no
// network. Inside a worker the library compresses in place.

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.addEventListener("message", async (event: MessageEvent<{ file: File; options: Options }>) => {
  const { file, options } = event.data;
  try {
    const out = await imageCompression(file, {
      ...options,
      useWebWorker: false,
      onProgress: (progress) => scope.postMessage({ progress }),
    });
    scope.postMessage({ blob: out });
  } catch (err) {
    scope.postMessage({ error: err instanceof Error ? err.message : String(err) });
  }
});
