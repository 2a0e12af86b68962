// Whether the production build is older than the sources, and the build itself.
import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
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

export function buildIsStale(): boolean {
  // public/sw.js is the last thing `npm run build` writes.
  const sw = path.join(root, "public", "sw.js");
  if (!existsSync(path.join(root, ".next", "BUILD_ID")) || !existsSync(sw)) return true;
  const built = statSync(sw).mtimeMs;
  const sources = [...SOURCES, ...SOURCE_FILES].map((s) => newestMtime(path.join(root, s)));
  return Math.max(...sources) > built;
}

export function build(childEnv: NodeJS.ProcessEnv) {
  console.log("Building the app (sources changed since the last build)…");
  execFileSync("npm", ["run", "build"], { cwd: root, stdio: "inherit", env: childEnv });
}
