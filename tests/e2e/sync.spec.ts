import { randomUUID } from "node:crypto";
import path from "node:path";
import { HeadObjectCommand } from "@aws-sdk/client-s3";
import { type Browser, devices, expect, type Page, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { DEMO_PASSWORD } from "../../db/seed/demo-users";
import { hashPassword } from "../../lib/auth/password";
import { bucket, s3 } from "../../lib/storage/s3";
import { waitForOfflineReady } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// Sync in Chromium with the real app, PostgreSQL and the S3 fake (shared/SYNC.md):
// - a burn dig with photos made offline syncs when the phone is back online: the photos are in the
//   bucket, the rows in PostgreSQL, one injury case, the photo bytes leave the phone once confirmed;
// - fault 9: the tab is closed while its push is in flight, and the reopened app syncs everything once;
// - fault 15: the runner's pull is never answered from a cache (the service-worker routes themselves:
//   tests/e2e/field-shell.spec.ts "sync and sign-in calls are never answered from a cache").
// Each test runs as a rep of a region of its own, so the demo data stays as it is.

const FIXTURES = path.resolve(import.meta.dirname, "..", "fixtures");
const LANDSCAPE = path.join(FIXTURES, "roots-landscape.jpg");
const PORTRAIT = path.join(FIXTURES, "roots-portrait.jpg");

const db = createDb(testEnv.databaseUrl, 2);
test.afterAll(async () => {
  await db.destroy();
});

interface Fixture {
  email: string;
  userId: string;
  fieldId: string;
  fieldName: string;
}

async function createRep(label: string): Promise<Fixture> {
  const suffix = `${label}-${randomUUID().slice(0, 8)}`;
  const region = await db
    .insertInto("region")
    .values({ name: `E2E Sync ${suffix}` })
    .returning("id")
    .executeTakeFirstOrThrow();
  const email = `e2e-sync-${suffix}@trenchbook.test`;
  const user = await db
    .insertInto("appUser")
    .values({
      email,
      name: `Sync Rep ${suffix}`,
      role: "rep",
      regionId: region.id,
      passwordHash: await hashPassword(DEMO_PASSWORD),
      status: "active",
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const account = await db
    .insertInto("account")
    .values({ regionId: region.id, name: `Sync Farm ${suffix}`, locality: "Test bench" })
    .returning("id")
    .executeTakeFirstOrThrow();
  await db.insertInto("accountRep").values({ accountId: account.id, userId: user.id }).execute();
  const fieldName = `Sync Field ${suffix}`;
  const field = await db
    .insertInto("field")
    .values({ accountId: account.id, name: fieldName, soilTexture: "medium" })
    .returning("id")
    .executeTakeFirstOrThrow();
  return { email, userId: user.id, fieldId: field.id, fieldName };
}

async function openPhone(browser: Browser, fx: Fixture) {
  const context = await browser.newContext({ ...devices["Pixel 7"] });
  const page = await context.newPage();
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(fx.email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText(/Signed in as Sync Rep/)).toBeVisible();
  await page.goto("/field");
  // The runner's first cycle pulls the rep's field onto the phone.
  await expect
    .poll(async () => (await readStore<{ id: string }>(page, "fields")).map((f) => f.id), { timeout: 30_000 })
    .toContain(fx.fieldId);
  return { context, page };
}

async function readStore<T>(page: Page, store: string): Promise<T[]> {
  return page.evaluate(async (name) => {
    if (!(await indexedDB.databases()).some((d) => d.name === "trenchbook")) return [];
    return new Promise<T[]>((resolve, reject) => {
      const open = indexedDB.open("trenchbook");
      open.onerror = () => reject(open.error);
      open.onsuccess = () => {
        const idb = open.result;
        if (!idb.objectStoreNames.contains(name)) {
          idb.close();
          resolve([]);
          return;
        }
        const req = idb.transaction(name, "readonly").objectStore(name).getAll();
        req.onsuccess = () => {
          idb.close();
          resolve(
            (req.result as unknown[]).map((row) =>
              JSON.parse(
                JSON.stringify(row, (_k, v) => (v instanceof ArrayBuffer ? { byteLength: v.byteLength } : v)),
              ),
            ) as T[],
          );
        };
        req.onerror = () => reject(req.error);
      };
    });
  }, store);
}

const bar = (page: Page) => page.getByRole("region", { name: "Sync status" });

// The dig form as a rep fills it: one plant, burnt toward the band (a case for review) or healthy.
async function recordDig(page: Page, fx: Fixture, options: { burn: boolean; photos: boolean }) {
  await page.goto("/field/digs/new");
  await expect(page.getByRole("heading", { level: 1, name: "New dig" })).toBeVisible();
  const dialog = page.getByRole("dialog", { name: "Before you dig today" });
  await dialog.getByRole("button", { name: "I have read these — start" }).click();
  await page.getByLabel("Field", { exact: true }).selectOption(fx.fieldId);
  await page.getByRole("radio", { name: "Moist" }).check();
  await page.getByLabel("Soil temperature").fill("57");
  await page.getByRole("radio", { name: "Not yet" }).check();
  const p1 = page.getByRole("region", { name: "Plant 1", exact: true });
  await p1.getByLabel("Leaf stage").selectOption("V3");
  await p1.getByLabel("Seeding depth").fill("1 3/4");
  await p1.getByLabel("Crown depth").fill("3/4");
  await p1.getByLabel("Mesocotyl").selectOption(options.burn ? "damaged" : "healthy");
  await p1.getByRole("radio", { name: options.burn ? /^2/ : /^5/ }).check();
  await p1.getByLabel("Nodal whorls").fill("2");
  await p1.getByLabel("Nodal roots counted").fill("9");
  await p1.getByLabel("Longest nodal root").fill("5");
  if (options.burn) {
    await p1
      .getByRole("group", { name: "Injury to seminal roots" })
      .getByRole("radio", { name: "Severe" })
      .check();
    await p1.getByRole("checkbox", { name: /Fertilizer burn/ }).check();
    await p1.getByLabel("Beside the seed").fill("1/2");
    await p1.getByLabel("Below the seed").fill("1");
    await page.getByLabel("Flag this dig for my supervisor").check();
  }
  if (options.photos) {
    await page.getByLabel("Add a photo of the dig").setInputFiles(LANDSCAPE);
    await expect(page.getByRole("img", { name: "Photo 1 of the dig" })).toBeVisible({ timeout: 30_000 });
    await page.getByLabel("Add a photo of plant 1").setInputFiles(PORTRAIT);
    await expect(page.getByRole("img", { name: "Photo 1 of plant 1" })).toBeVisible({ timeout: 30_000 });
  }
  const note = `dig ${randomUUID()}`;
  await page.getByLabel("Recommendation for the grower").fill(note);
  await page.getByRole("button", { name: "Save dig" }).click();
  await expect(page.getByRole("heading", { name: "Saved on this phone" })).toBeVisible();
  const site = (await readStore<{ id: string; recommendation: string }>(page, "digSites")).find(
    (s) => s.recommendation === note,
  );
  expect(site).toBeDefined();
  return site!.id;
}

const outboxCount = async (page: Page) => (await readStore(page, "outbox")).length;

test("a burn dig with photos made offline syncs when the phone is back online: bucket, rows and one case", async ({
  browser,
}) => {
  test.setTimeout(150_000);
  const fx = await createRep("online");
  const { context, page } = await openPhone(browser, fx);
  await page.goto("/field/digs/new");
  await waitForOfflineReady(page, "/field/digs/new", "/field/digs/edit");

  await context.setOffline(true);
  await page.reload();
  const digId = await recordDig(page, fx, { burn: true, photos: true });
  await expect(bar(page)).toContainText("4 changes and 2 photos waiting");
  await expect(bar(page)).toContainText("Offline");
  await expect(bar(page).getByRole("button", { name: "Sync now" })).toBeDisabled();
  expect(
    await db.selectFrom("digSite").select("id").where("id", "=", digId).executeTakeFirst(),
  ).toBeUndefined();

  // Back online: the browser's "online" event starts the runner at once.
  await context.setOffline(false);
  await expect(bar(page)).toContainText("Everything is sent", { timeout: 30_000 });
  await expect(bar(page)).toContainText("Last sync");
  expect(await outboxCount(page)).toBe(0);

  const site = await db.selectFrom("digSite").selectAll().where("id", "=", digId).executeTakeFirstOrThrow();
  expect(site.fieldId).toBe(fx.fieldId);
  expect(site.repId).toBe(fx.userId);
  expect(await db.selectFrom("dugPlant").select("id").where("digSiteId", "=", digId).execute()).toHaveLength(
    1,
  );
  const photos = await db.selectFrom("photo").selectAll().where("digSiteId", "=", digId).execute();
  expect(photos).toHaveLength(2);
  for (const photo of photos) {
    expect(photo.confirmedAt).not.toBeNull();
    const head = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key: photo.objectKey }));
    expect(head.ContentLength).toBe(photo.byteSize);
  }
  const cases = () => db.selectFrom("injuryCase").select("id").where("digSiteId", "=", digId).execute();
  expect(await cases()).toHaveLength(1);

  // Local bytes go once a pull has shown the photos confirmed; the rows stay, marked uploaded.
  await expect.poll(async () => (await readStore(page, "photoBytes")).length, { timeout: 20_000 }).toBe(0);
  const local = await readStore<{ id: string; uploaded: number; syncState: string }>(page, "photos");
  expect(local.map((p) => [p.uploaded, p.syncState])).toEqual([
    [1, "synced"],
    [1, "synced"],
  ]);

  // Syncing again changes nothing: still one case.
  await bar(page).getByRole("button", { name: "Sync now" }).click();
  await expect(bar(page)).toContainText("Everything is sent");
  expect(await cases()).toHaveLength(1);

  // Nothing of sync or of the bucket went into any cache.
  const cached = await page.evaluate(async () => {
    const urls: string[] = [];
    for (const name of await caches.keys()) {
      for (const req of await (await caches.open(name)).keys()) urls.push(req.url);
    }
    return urls;
  });
  expect(cached.filter((u) => u.includes("/api/") || !u.startsWith(new URL(page.url()).origin))).toEqual([]);

  // The session ends: the bar says what to do, and that nothing is lost.
  await context.clearCookies();
  await bar(page).getByRole("button", { name: "Sync now" }).click();
  const alert = bar(page).getByRole("alert");
  await expect(alert).toContainText("Sign in again — nothing on this phone is lost.");
  await expect(alert.getByRole("link", { name: "Sign in" })).toHaveAttribute("href", "/sign-in");
  await context.close();
});

test("fault 9: the tab closed while its push is in flight; reopened, everything syncs exactly once", async ({
  browser,
}) => {
  test.setTimeout(120_000);
  const fx = await createRep("closed");
  const { context, page } = await openPhone(browser, fx);
  let reached: () => void = () => undefined;
  const pushReachedServer = new Promise<void>((r) => {
    reached = r;
  });
  // The push goes to the server, which commits; its answer never comes back to this tab.
  await page.route("**/api/sync/push", async (route) => {
    await route.fetch();
    reached();
    await new Promise(() => undefined);
  });
  const digId = await recordDig(page, fx, { burn: false, photos: false });
  await pushReachedServer;
  const clientId = (await readStore<{ key: string; value: string }>(page, "meta")).find(
    (m) => m.key === "clientId",
  )!.value;
  expect(await outboxCount(page)).toBe(2);
  await page.close();
  // The server applied the push before the tab went.
  expect(
    await db.selectFrom("digSite").select("id").where("id", "=", digId).executeTakeFirst(),
  ).toBeDefined();

  const again = await context.newPage();
  await again.goto("/field");
  await expect(bar(again)).toContainText("Everything is sent", { timeout: 30_000 });
  expect(await outboxCount(again)).toBe(0);
  const results = await db
    .selectFrom("syncMutationResult")
    .select(["mutationId", "status"])
    .where("clientId", "=", clientId)
    .orderBy("mutationId")
    .execute();
  expect(results).toEqual([
    { mutationId: 1, status: "applied" },
    { mutationId: 2, status: "applied" },
  ]);
  expect(await db.selectFrom("dugPlant").select("id").where("digSiteId", "=", digId).execute()).toHaveLength(
    1,
  );
  const client = await db
    .selectFrom("syncClient")
    .select("lastMutationId")
    .where("id", "=", clientId)
    .executeTakeFirstOrThrow();
  expect(client.lastMutationId).toBe(2);
  const digs = await readStore<{ id: string; syncState: string }>(again, "digSites");
  expect(digs.find((d) => d.id === digId)?.syncState).toBe("synced");
  await context.close();
});

test("fault 15: the runner's pull is never answered from a cache; offline it waits and says so", async ({
  browser,
}) => {
  test.setTimeout(90_000);
  const fx = await createRep("nocache");
  const { context, page } = await openPhone(browser, fx);
  await waitForOfflineReady(page, "/field");
  const pulls: { fromServiceWorker: boolean; cacheControl: string | null }[] = [];
  page.on("response", (res) => {
    if (res.url().endsWith("/api/sync/pull")) {
      pulls.push({
        fromServiceWorker: res.fromServiceWorker(),
        cacheControl: res.headers()["cache-control"] ?? null,
      });
    }
  });
  await bar(page).getByRole("button", { name: "Sync now" }).click();
  await expect.poll(() => pulls.length).toBeGreaterThan(0);
  expect(pulls.every((p) => !p.fromServiceWorker && p.cacheControl === "no-store")).toBe(true);

  await context.setOffline(true);
  await expect(bar(page)).toContainText("Offline");
  await expect(bar(page).getByRole("button", { name: "Sync now" })).toBeDisabled();
  // A pull asked for offline fails; nothing answers it from a cache.
  const offline = await page.evaluate(async () => {
    try {
      const res = await fetch("/api/sync/pull", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({
          protocolVersion: 1,
          schemaVersion: 1,
          clientGroupId: crypto.randomUUID(),
          cursor: null,
        }),
      });
      return `answered ${res.status}`;
    } catch (err) {
      return err instanceof TypeError ? "network error" : String(err);
    }
  });
  expect(offline).toBe("network error");
  await context.close();
});
