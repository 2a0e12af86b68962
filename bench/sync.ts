// Sync benchmark: prints figures, asserts nothing. `npm run bench:sync`
//   1. merge: 500 digs × 5 plants through /api/sync/push in the device's batches (50 mutations), and
//      the same rows through one raw multi-row INSERT … ON CONFLICT per table, in the same run
//   2. pull: 10,000 changes as one delta (time, bytes per record), and the device's first pull of
//      them into IndexedDB (fake-indexeddb) with the real client code
//   3. 100 reps (10 regions × 10) pushing 20-mutation batches at once on loopback: latency, errors
//   4. a week offline, 200 digs × 5 plants, synced by the real device code: round trips and time
// It starts its own throw-away services on its own ports (bench/sync-services.ts).
import "fake-indexeddb/auto";
import { randomUUID } from "node:crypto";
import { startBenchServices } from "./sync-services";

const { env, stop } = await startBenchServices("bench-sync", {
  pg: 54379,
  s3: 54380,
  smtp: 54375,
  mailWeb: 54376,
  app: 3300,
});

const { sql } = await import("kysely");
const { createDb } = await import("@/db/client");
const { hashPassword } = await import("@/lib/auth/password");
const { DEMO_PASSWORD } = await import("@/db/seed/demo-users");
const { ApiClient } = await import("../tests/helpers/session");
const { PROTOCOL_VERSION, SCHEMA_VERSION } = await import("@/sync/protocol");
const { openFieldDb } = await import("@/sync/client/db");
const { saveDig } = await import("@/sync/client/records");
const { syncOnce } = await import("@/sync/client/runner");
const { pull } = await import("@/sync/client/pull");

type Api = InstanceType<typeof ApiClient>;
const db = createDb(env.DATABASE_URL, 4);
const passwordHash = await hashPassword(DEMO_PASSWORD);
const base = env.APP_URL;

// ---- fixtures ------------------------------------------------------------------------------------

async function region(name: string) {
  return (await db.insertInto("region").values({ name }).returning("id").executeTakeFirstOrThrow()).id;
}

// A rep with a farm and a field of their own in `regionId`, signed in.
async function rep(regionId: string, label: string) {
  const tag = `${label}-${randomUUID().slice(0, 6)}`;
  const email = `bench-${tag}@trenchbook.test`;
  const user = await db
    .insertInto("appUser")
    .values({ email, name: `Bench ${tag}`, role: "rep", regionId, passwordHash, status: "active" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const account = await db
    .insertInto("account")
    .values({ regionId, name: `Bench farm ${tag}`, locality: "Bench" })
    .returning("id")
    .executeTakeFirstOrThrow();
  await db.insertInto("accountRep").values({ accountId: account.id, userId: user.id }).execute();
  const field = await db
    .insertInto("field")
    .values({ accountId: account.id, name: `Bench field ${tag}`, soilTexture: "medium" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const api = new ApiClient(base);
  const error = await api.signIn(email, DEMO_PASSWORD);
  if (error) throw new Error(`sign-in failed: ${error}`);
  return { api, userId: user.id, accountId: account.id, fieldId: field.id, regionId };
}

function site(fieldId: string, n: number) {
  return {
    id: randomUUID(),
    fieldId,
    plantingId: null,
    dugAt: new Date(Date.UTC(2026, 4, 10, 14, n % 60)).toISOString(),
    latitude: 36.7 + (n % 100) / 10_000,
    longitude: -119.6,
    accuracyM: 5,
    soilMoisture: "moist" as const,
    soilTempF: 58 + (n % 10),
    irrigatedYet: false,
    recommendation: null,
    flaggedByRep: false,
    notes: `bench dig ${n}`,
  };
}

function plant(digSiteId: string, position: number) {
  return {
    id: randomUUID(),
    digSiteId,
    position,
    leafStage: "V3" as const,
    seedingDepthIn: 2,
    crownDepthIn: 0.75,
    mesocotyl: "healthy" as const,
    seminalScore: 5,
    nodalWhorls: 2,
    nodalCount: 8 + position,
    longestNodalIn: 4.5,
    seminalInjury: "none" as const,
    nodalInjury: "none" as const,
    findings: [],
    bandBesideIn: 2,
    bandBelowIn: 2,
    notes: null,
  };
}

function digRecords(fieldId: string, digs: number, plantsPerDig: number) {
  const out: { site: ReturnType<typeof site>; plants: ReturnType<typeof plant>[] }[] = [];
  for (let n = 0; n < digs; n++) {
    const s = site(fieldId, n);
    out.push({ site: s, plants: Array.from({ length: plantsPerDig }, (_, k) => plant(s.id, k + 1)) });
  }
  return out;
}

// A client of its own pushing raw mutations in order (what the device sends, without the device).
class RawClient {
  readonly clientGroupId = randomUUID();
  readonly clientId = randomUUID();
  next = 1;
  constructor(readonly api: Api) {}

  mutations(records: ReturnType<typeof digRecords>) {
    const observedAt = new Date().toISOString();
    return records
      .flatMap((r) => [
        { name: "digSite.put", args: r.site },
        ...r.plants.map((p) => ({ name: "dugPlant.put", args: p })),
      ])
      .map((mutation) => ({ mutationId: this.next++, baseVersion: null, observedAt, mutation }));
  }

  async push(mutations: unknown[]): Promise<{ status: number; ms: number; body: unknown }> {
    const started = performance.now();
    const res = await this.api.json("/api/sync/push", "POST", {
      protocolVersion: PROTOCOL_VERSION,
      schemaVersion: SCHEMA_VERSION,
      clientGroupId: this.clientGroupId,
      clientId: this.clientId,
      mutations,
    });
    const body = await res.json().catch(() => null);
    return { status: res.status, ms: performance.now() - started, body };
  }

  async pushAll(mutations: unknown[], batch: number) {
    for (let i = 0; i < mutations.length; i += batch) {
      const r = await this.push(mutations.slice(i, i + batch));
      if (r.status !== 200) throw new Error(`push answered ${r.status}: ${JSON.stringify(r.body)}`);
      const refused = (r.body as { results: { status: string }[] }).results.filter(
        (x) => x.status !== "applied",
      );
      if (refused.length > 0) throw new Error(`push refused ${refused.length} mutations`);
    }
  }
}

const fmt = (n: number, digits = 0) =>
  n.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits });
const quantile = (sorted: number[], q: number) =>
  sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)]!;

// ---- 1. merge through push versus one raw INSERT ---------------------------------------------------

async function mergeBench() {
  const r0 = await region(`Bench merge ${randomUUID().slice(0, 6)}`);
  const a = await rep(r0, "merge");
  const rows = 500 * 6;

  const client = new RawClient(a.api);
  const viaPush = client.mutations(digRecords(a.fieldId, 500, 5));
  const t0 = performance.now();
  await client.pushAll(viaPush, 50);
  const pushMs = performance.now() - t0;

  const big = new RawClient(a.api);
  const viaBigPush = big.mutations(digRecords(a.fieldId, 500, 5));
  const t1 = performance.now();
  await big.pushAll(viaBigPush, 500);
  const bigPushMs = performance.now() - t1;

  const raw = digRecords(a.fieldId, 500, 5);
  const t2 = performance.now();
  await db.transaction().execute(async (trx) => {
    const { version } = await trx
      .updateTable("syncCursor")
      .set({ version: sql`version + 1` })
      .where("regionId", "=", r0)
      .returning("version")
      .executeTakeFirstOrThrow();
    const common = { version, fieldVersions: JSON.stringify({}), createdBy: a.userId, updatedBy: a.userId };
    await trx
      .insertInto("digSite")
      .values(raw.map((r) => ({ ...r.site, accountId: a.accountId, repId: a.userId, ...common })))
      .onConflict((oc) => oc.column("id").doNothing())
      .execute();
    await trx
      .insertInto("dugPlant")
      .values(
        raw.flatMap((r) => r.plants.map((p) => ({ ...p, findings: p.findings as string[], ...common }))),
      )
      .onConflict((oc) => oc.column("id").doNothing())
      .execute();
  });
  const rawMs = performance.now() - t2;

  const pushRate = rows / (pushMs / 1000);
  const rawRate = rows / (rawMs / 1000);
  console.log("\n1. Merge 500 digs × 5 plants (3,000 rows)");
  console.log(`  push, 60 batches of 50:      ${fmt(pushMs)} ms  ${fmt(pushRate)} rows/s`);
  console.log(
    `  push, 6 batches of 500:      ${fmt(bigPushMs)} ms  ${fmt(rows / (bigPushMs / 1000))} rows/s`,
  );
  console.log(`  raw INSERT … ON CONFLICT:    ${fmt(rawMs)} ms  ${fmt(rawRate)} rows/s`);
  console.log(
    `  ratio push/raw: ${(pushRate / rawRate).toFixed(3)} (${pushRate / rawRate >= 0.5 ? "meets" : "misses"} ≥ 0.5)`,
  );
}

// ---- 2. pull of 10,000 changes ---------------------------------------------------------------------

async function pullBench() {
  const r1 = await region(`Bench pull ${randomUUID().slice(0, 6)}`);
  const a = await rep(r1, "pull");
  const groupId = randomUUID();
  const pullBody = (cursor: string | null) => ({
    protocolVersion: PROTOCOL_VERSION,
    schemaVersion: SCHEMA_VERSION,
    clientGroupId: groupId,
    cursor,
  });
  const first = (await (await a.api.json("/api/sync/pull", "POST", pullBody(null))).json()) as {
    cursor: string;
  };
  const client = new RawClient(a.api);
  await client.pushAll(client.mutations(digRecords(a.fieldId, 2000, 4)), 500);

  const t0 = performance.now();
  const res = await a.api.json("/api/sync/pull", "POST", pullBody(first.cursor));
  const text = await res.text();
  const ms = performance.now() - t0;
  const body = JSON.parse(text) as { changes: { digSites: unknown[]; dugPlants: unknown[] } };
  const records = body.changes.digSites.length + body.changes.dugPlants.length;

  const device = openFieldDb(`bench-pull-${randomUUID()}`);
  const t1 = performance.now();
  await pull(device, {
    fetch: ((url: string, init?: RequestInit) => a.api.fetch(url, init)) as typeof fetch,
  });
  const deviceMs = performance.now() - t1;
  const held = (await device.digSites.count()) + (await device.dugPlants.count());
  device.close();
  await openFieldDb(device.name).delete();

  console.log("\n2. Pull of 10,000 changes (2,000 digs × 4 plants)");
  console.log(
    `  delta pull over HTTP: ${records} records in ${fmt(ms)} ms, ${fmt(text.length / 1024, 1)} KB, ${fmt(text.length / records)} bytes/record`,
  );
  console.log(
    `  device's first pull (real client into fake-indexeddb): ${held} records in ${fmt(deviceMs)} ms`,
  );
}

// ---- 3. 100 reps pushing at once -------------------------------------------------------------------

async function concurrencyBench() {
  const regions = await Promise.all(
    Array.from({ length: 10 }, (_, i) => region(`Bench load ${i} ${randomUUID().slice(0, 6)}`)),
  );
  const reps = [];
  for (const [i, r] of regions.entries())
    for (let k = 0; k < 10; k++) reps.push(await rep(r, `load${i}-${k}`));
  const latencies: number[] = [];
  let errors = 0;
  const rounds = 10;
  const started = performance.now();
  await Promise.all(
    reps.map(async (r) => {
      const client = new RawClient(r.api);
      for (let round = 0; round < rounds; round++) {
        // 20 mutations: 4 digs × (site + 4 plants).
        const result = await client.push(client.mutations(digRecords(r.fieldId, 4, 4))).catch(() => null);
        if (result?.status !== 200) errors++;
        else latencies.push(result.ms);
      }
    }),
  );
  const seconds = (performance.now() - started) / 1000;
  latencies.sort((x, y) => x - y);
  const p95 = quantile(latencies, 0.95);
  console.log("\n3. 100 reps (10 regions × 10) each pushing 10 batches of 20 mutations at once, loopback");
  console.log(
    `  ${latencies.length + errors} pushes in ${seconds.toFixed(1)} s (${fmt(latencies.length / seconds, 1)} pushes/s, ${fmt((latencies.length * 20) / seconds)} mutations/s)`,
  );
  console.log(
    `  latency p50 ${fmt(quantile(latencies, 0.5))} ms, p95 ${fmt(p95)} ms, max ${fmt(latencies.at(-1) ?? 0)} ms; errors ${errors} (${p95 <= 300 && errors === 0 ? "meets" : "misses"} p95 ≤ 300 ms, no errors)`,
  );
}

// ---- 4. a week offline -----------------------------------------------------------------------------

async function weekOfflineBench() {
  const r2 = await region(`Bench week ${randomUUID().slice(0, 6)}`);
  const a = await rep(r2, "week");
  const device = openFieldDb(`bench-week-${randomUUID()}`);
  const week = Date.now() - 7 * 86_400_000;
  for (const [n, r] of digRecords(a.fieldId, 200, 5).entries()) {
    await saveDig(
      device,
      {
        site: { ...r.site, accountId: a.accountId },
        plants: r.plants,
        newPhotos: [],
        removedPlantIds: [],
        removedPhotoIds: [],
      },
      new Date(week + n * 3_000_000),
    );
  }
  const calls = new Map<string, number>();
  let bytesUp = 0;
  const fetchFn = async (url: string, init?: RequestInit) => {
    calls.set(url, (calls.get(url) ?? 0) + 1);
    bytesUp += String(init?.body ?? "").length;
    return a.api.fetch(url, init);
  };
  const queued = await device.outbox.count();
  const t0 = performance.now();
  await syncOnce(device, { fetch: fetchFn });
  const ms = performance.now() - t0;
  const left = await device.outbox.count();
  device.close();
  await openFieldDb(device.name).delete();
  const trips = [...calls.values()].reduce((x, y) => x + y, 0);
  console.log("\n4. A week offline: 200 digs × 5 plants, synced by the real device code");
  console.log(
    `  ${queued} mutations → ${trips} round trips (${[...calls].map(([u, c]) => `${u} ×${c}`).join(", ")}), ${fmt(ms)} ms, ${fmt(bytesUp / 1024)} KB up; ${left} left waiting`,
  );
}

try {
  await mergeBench();
  await pullBench();
  await concurrencyBench();
  await weekOfflineBench();
} finally {
  await db.destroy();
  await stop();
}
