// Bundles service-worker/sw.ts with esbuild, then lets workbox-build inject the precache manifest of
// the built app (.next/static) into public/sw.js. Runs as part of `npm run build`.
import path from "node:path";
import { build } from "esbuild";
import { injectManifest } from "workbox-build";

const root = path.resolve(import.meta.dirname, "..");
const bundled = path.join(root, ".next", "sw.bundle.js");

await build({
  entryPoints: [path.join(root, "service-worker", "sw.ts")],
  bundle: true,
  format: "iife",
  minify: true,
  target: "es2020",
  outfile: bundled,
  define: { "process.env.NODE_ENV": '"production"' },
});

const { count, size, warnings } = await injectManifest({
  swSrc: bundled,
  swDest: path.join(root, "public", "sw.js"),
  globDirectory: path.join(root, ".next", "static"),
  globPatterns: ["**/*.{js,css,woff2}"],
  modifyURLPrefix: { "": "/_next/static/" },
  injectionPoint: "self.__WB_MANIFEST",
  maximumFileSizeToCacheInBytes: 5 * 1024 * 1024,
});
for (const w of warnings) console.warn(w);
console.log(`service worker: ${count} files precached (${(size / 1024).toFixed(0)} KB)`);
