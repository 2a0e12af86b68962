// First step of `npm start` and `npm test`, in plain Node so it runs before anything is installed:
// installs what is missing (npm packages, Debian's PostgreSQL 15, and Chromium for the tests).
import { execSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";

const forTests = process.argv.includes("--test") || process.env.npm_lifecycle_event === "test";
const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function run(cmd) {
  console.log(`$ ${cmd}`);
  execSync(cmd, { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
}

let aptUpdated = false;
function aptInstall(pkgs, why) {
  if (!isRoot) {
    console.error(`Missing ${why}. Install it with: sudo apt-get install -y ${pkgs.join(" ")}`);
    process.exit(1);
  }
  if (!aptUpdated) {
    run("apt-get update -qq");
    aptUpdated = true;
  }
  run(`apt-get install -y -qq ${pkgs.join(" ")}`);
}

// node_modules is current when it was installed from this exact lock file.
const lock = "package-lock.json";
const stamp = "node_modules/.trenchbook-lock-sha256";
const lockHash = existsSync(lock) ? createHash("sha256").update(readFileSync(lock)).digest("hex") : "none";
if (!existsSync(stamp) || readFileSync(stamp, "utf8") !== lockHash) {
  run(existsSync(lock) ? "npm ci --no-audit --no-fund" : "npm install --no-audit --no-fund");
  writeFileSync(stamp, lockHash);
}

if (!existsSync("/usr/lib/postgresql/15/bin/initdb")) {
  aptInstall(["postgresql-15", "postgresql-contrib"], "PostgreSQL 15 (Debian's postgresql-15 package)");
}
if (isRoot) {
  try {
    execSync("id -u postgres", { stdio: "ignore" });
  } catch {
    aptInstall(["postgresql-15"], "the postgres system user");
  }
}
if (forTests && !existsSync("/usr/bin/chromium")) {
  aptInstall(["chromium"], "Chromium for the end-to-end tests (Debian's chromium package)");
}
