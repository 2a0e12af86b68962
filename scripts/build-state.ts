// Whether the production build is older than the sources, and the build itself.
import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { root } from "./services";

const SOURCES = ["app", "lib", "db", "sync", "service-worker", "public"];
const SOURCE_FILES = [
  "package-lock.json",
  "next.config.js",
  "tailwind.config.ts",
  "postcss.config.mjs",
  "tsconfig.json",
];

function newestMtime(p: string): number {
  if (!existsSync(p)) return 0;
  const st = statSync(p);
  if (!st.isDirectory()) return path.basename(p).startsWith("sw.js") ? 0 : st.mtimeMs;
  let newest = 0;
  for (const entry of readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

// The build records when it started; a source saved after that moment makes it stale, even one saved
// while the build was running.
const STAMP = path.join(root, ".next", "trenchbook-build-started");

export function buildIsStale(): boolean {
  if (!existsSync(STAMP) || !existsSync(path.join(root, "public", "sw.js"))) return true;
  const started = Number(readFileSync(STAMP, "utf8"));
  const sources = [...SOURCES, ...SOURCE_FILES].map((s) => newestMtime(path.join(root, s)));
  return !(started > 0) || Math.max(...sources) >= started;
}

export function build(childEnv: NodeJS.ProcessEnv) {
  console.log("Building the app (sources changed since the last build)…");
  const started = Date.now();
  rmSync(STAMP, { force: true });
  execFileSync("npm", ["run", "build"], { cwd: root, stdio: "inherit", env: childEnv });
  writeFileSync(STAMP, String(started));
}
