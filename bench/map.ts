// Field map benchmark: prints figures, asserts nothing. `npm run bench:map`
//   1. GET /api/map for a view holding 10,000 dig pins (and their field): server time on loopback
//      (median and p95 over repeated requests) and response bytes, raw and gzip
//   2. Chromium: time from navigation to /map until the 10,000 pins are drawn (as clusters, with the
//      live summary counting them all), then until the map has redrawn after a zoom step (target for
//      both together: ≤ 1 s)
// It starts its own throw-away services on its own ports (bench/sync-services.ts).
import { randomUUID } from "node:crypto";
import { gzipSync } from "node:zlib";
import { startBenchServices } from "./sync-services";

const { env, stop } = await startBenchServices("bench-map", {
  pg: 54399,
  s3: 54400,
  smtp: 54395,
  mailWeb: 54396,
  app: 3500,
});

const { sql } = await import("kysely");
const { createDb } = await import("@/db/client");
const { hashPassword } = await import("@/lib/auth/password");
const { DEMO_PASSWORD } = await import("@/db/seed/demo-users");
const { ApiClient } = await import("../tests/helpers/session");

const PINS = 10_000;
const REQUESTS = 30;
const BROWSER_RUNS = 5;
const CHROMIUM = process.env.CHROME_PATH ?? "/usr/bin/chromium";
const base = env.APP_URL;
const db = createDb(env.DATABASE_URL, 2);
// A 0.3° box with a grid of pins: a large farm's seasons of digs, far from the demo valley.
const LON0 = -101.2;
const LAT0 = 41.1;
const BBOX = `${LON0},${LAT0},${LON0 + 0.3},${LAT0 + 0.3}`;

const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))]!;
};
const ms = (x: number) => `${x.toFixed(0)} ms`;
const kb = (bytes: number) => `${(bytes / 1024).toFixed(1)} KB`;

// A grower whose farm has the 10,000 digs, so /map fits exactly them.
async function fixture() {
  const tag = randomUUID().slice(0, 6);
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Upper Mesa")
    .executeTakeFirstOrThrow();
  const email = `bench-map-${tag}@trenchbook.test`;
  const user = await db
    .insertInto("appUser")
    .values({
      email,
      name: `Bench grower ${tag}`,
      role: "grower",
      regionId: region.id,
      passwordHash: await hashPassword(DEMO_PASSWORD),
      status: "active",
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const account = await db
    .insertInto("account")
    .values({ regionId: region.id, name: `Bench map farm ${tag}` })
    .returning("id")
    .executeTakeFirstOrThrow();
  await db.insertInto("accountGrower").values({ accountId: account.id, userId: user.id }).execute();
  const fieldId = randomUUID();
  const ring = [
    [LON0, LAT0],
    [LON0 + 0.3, LAT0],
    [LON0 + 0.3, LAT0 + 0.3],
    [LON0, LAT0 + 0.3],
    [LON0, LAT0],
  ];
  await db
    .insertInto("field")
    .values({
      id: fieldId,
      accountId: account.id,
      name: `Bench section ${tag}`,
      boundary: JSON.stringify({ type: "Polygon", coordinates: [ring] }),
      areaAcres: 47_000,
      centroidLat: LAT0 + 0.15,
      centroidLon: LON0 + 0.15,
    })
    .execute();
  const plantingId = randomUUID();
  await db
    .insertInto("planting")
    .values({
      id: plantingId,
      fieldId,
      accountId: account.id,
      hybrid: "bench 108-day",
      plantedOn: "2026-04-15",
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  // Realistic rows: an assessment with its stage and a flag or two, a tenth flagged by the rep.
  await sql`
    insert into dig_site (id, field_id, planting_id, account_id, dug_at, latitude, longitude, root_index,
      flagged_by_rep, assessment)
    select gen_random_uuid(), ${fieldId}::uuid, ${plantingId}::uuid, ${account.id}::uuid,
      timestamptz '2026-05-01 17:00Z' + (i % 30) * interval '1 day',
      ${LAT0} + 0.001 + (i / 100) * 0.00298, ${LON0} + 0.001 + (i % 100) * 0.00298,
      (i * 37) % 100, i % 10 = 0,
      jsonb_build_object('leafCollars', 1 + i % 6, 'siteIndex', (i * 37) % 100,
        'flags', case when (i * 37) % 100 < 40 then
          '[{"code":"low_root_index","severity":"critical","message":"Site root index is low."}]'::jsonb
          else '[]'::jsonb end,
        'flagForReview', jsonb_build_object('flag', (i * 37) % 100 < 40))
    from generate_series(0, ${PINS - 1}) as i`.execute(db);
  return { email, actor: { id: user.id, role: "grower" as const, regionId: region.id } };
}

// The query and the GeoJSON built in this process, without HTTP, JSON text or gzip.
async function queryFigures(actor: { id: string; role: "grower"; regionId: string }) {
  const { findMapFeatures } = await import("@/db/queries/map");
  const { parseBounds } = await import("@/lib/geo/bounds");
  const parsed = parseBounds(BBOX);
  if (!parsed.ok) throw new Error(parsed.message);
  const times: number[] = [];
  const stringify: number[] = [];
  for (let i = 0; i < REQUESTS + 3; i++) {
    const t0 = performance.now();
    const collection = await findMapFeatures(actor, { bounds: parsed.bounds });
    const t1 = performance.now();
    JSON.stringify(collection);
    const t2 = performance.now();
    if (i >= 3) {
      times.push(t1 - t0);
      stringify.push(t2 - t1);
    }
  }
  console.log(
    `  of which     queries + GeoJSON objects median ${ms(quantile(times, 0.5))}, JSON text ${ms(quantile(stringify, 0.5))} (in the bench process)`,
  );
}

async function apiFigures(api: InstanceType<typeof ApiClient>) {
  const times: number[] = [];
  let body = "";
  let encoding = "";
  for (let i = 0; i < REQUESTS + 3; i++) {
    const t0 = performance.now();
    const res = await api.fetch(`/api/map?bbox=${BBOX}`, { headers: { "accept-encoding": "gzip" } });
    body = await res.text();
    const dt = performance.now() - t0;
    encoding = res.headers.get("content-encoding") ?? "none";
    if (i >= 3) times.push(dt); // the first requests warm the pool and the JIT
  }
  const pins = (JSON.parse(body) as { features: { geometry: { type: string } }[] }).features.filter(
    (f) => f.geometry.type === "Point",
  ).length;
  const raw = Buffer.byteLength(body);
  console.log(`\nMap API, ${pins} pins + 1 field in view (${REQUESTS} requests, loopback):`);
  console.log(`  server time  median ${ms(quantile(times, 0.5))}, p95 ${ms(quantile(times, 0.95))}`);
  console.log(
    `  bytes        raw ${kb(raw)} (${(raw / pins).toFixed(0)} B/pin), gzip ${kb(gzipSync(body).length)} (the app sent content-encoding: ${encoding})`,
  );
}

async function browserFigures(email: string) {
  const { chromium } = await import("playwright-core");
  const browser = await chromium.launch({
    executablePath: CHROMIUM,
    args: ["--no-sandbox", "--disable-gpu"],
  });
  const drawn: number[] = [];
  const zoomed: number[] = [];
  const api: number[] = [];
  try {
    const context = await browser.newContext({
      serviceWorkers: "block",
      viewport: { width: 1280, height: 900 },
    });
    const page = await context.newPage();
    await page.goto(`${base}/sign-in`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((u) => !u.pathname.startsWith("/sign-in"));
    for (let run = 0; run < BROWSER_RUNS + 1; run++) {
      await page.goto(`${base}/map`);
      // Drawn: the clusters are on the map and the live summary counts all 10,000 pins.
      await page.waitForFunction(
        () =>
          document.querySelector(".trench-cluster") !== null &&
          /10,000 digs in this view/.test(
            document.querySelector("[data-testid=map-summary]")?.textContent ?? "",
          ),
        null,
        { timeout: 30_000, polling: "raf" },
      );
      const t = await page.evaluate(() => {
        const nav = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming | undefined;
        const req = performance.getEntriesByType("resource").find((e) => e.name.includes("/api/map?")) as
          | PerformanceResourceTiming
          | undefined;
        return {
          drawn: performance.now() - (nav?.startTime ?? 0),
          api: req ? req.responseEnd - req.startTime : 0,
        };
      });
      // Responding: one zoom step in, until the clusters are redrawn for the new view.
      const before = await page.getByTestId("map-summary").textContent();
      const t0 = await page.evaluate(() => performance.now());
      await page.locator(".leaflet-control-zoom-in").click();
      await page.waitForFunction(
        (old) => document.querySelector("[data-testid=map-summary]")?.textContent !== old,
        before,
        { timeout: 10_000, polling: "raf" },
      );
      const t1 = await page.evaluate(() => performance.now());
      if (run === 0) continue; // the first visit compiles and caches the map's scripts
      drawn.push(t.drawn);
      api.push(t.api);
      zoomed.push(t1 - t0);
    }
  } finally {
    await browser.close();
  }
  console.log(
    `\nChromium, /map with ${PINS} pins (1280×900, median of ${BROWSER_RUNS} visits after a first one):`,
  );
  console.log(`  navigation → pins drawn      ${ms(quantile(drawn, 0.5))} (max ${ms(Math.max(...drawn))})`);
  console.log(`    of which the map request   ${ms(quantile(api, 0.5))}`);
  console.log(`  zoom step → clusters redrawn ${ms(quantile(zoomed, 0.5))} (max ${ms(Math.max(...zoomed))})`);
  console.log(
    `  interactive (drawn + zoom)   ${ms(quantile(drawn, 0.5) + quantile(zoomed, 0.5))} (target ≤ 1000 ms)`,
  );
}

try {
  const { email, actor } = await fixture();
  const api = new ApiClient(base);
  const error = await api.signIn(email, DEMO_PASSWORD);
  if (error) throw new Error(`bench sign-in failed: ${error}`);
  await apiFigures(api);
  await queryFigures(actor);
  await browserFigures(email);
} finally {
  await db.destroy();
  await stop();
}
