// The sync property test in bench mode: `npm run bench:sync-property [-- runs]` (default 10,000 runs)
// of tests/integration/sync-property.test.ts on throw-away services of its own; prints the seed and
// the throughput (runs/s, actions/s). Replay a failing seed with SYNC_PROPERTY_SEED (see the test).
import { spawnSync } from "node:child_process";
import { startBenchServices } from "./sync-services";

const runs = process.argv[2] ?? "10000";
const { stop } = await startBenchServices("bench-property", {
  pg: 54389,
  s3: 54390,
  smtp: 54385,
  mailWeb: 54386,
  app: 3400,
});
let status = 1;
try {
  const started = Date.now();
  const result = spawnSync(
    "npx",
    ["vitest", "run", "--project", "integration", "tests/integration/sync-property.test.ts"],
    { stdio: "inherit", env: { ...process.env, NODE_ENV: "test", SYNC_PROPERTY_RUNS: runs } },
  );
  status = result.status ?? 1;
  console.log(
    `\nbench:sync-property: ${runs} runs, ${((Date.now() - started) / 1000).toFixed(0)} s in all (exit ${status})`,
  );
} finally {
  await stop();
}
process.exit(status);
