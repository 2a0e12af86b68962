import { expect, type Page, test } from "@playwright/test";
import { DEMO_FIELDS } from "../../db/seed/fields";
import { DEMO_PLANTINGS } from "../../db/seed/plantings";
import { demoWeather } from "../../db/seed/weather";
import { digWindow, stageOnDate } from "../../lib/agronomy";
import tailwind from "../../tailwind.config";
import { cachedPaths, signInAs, waitForOfflineReady } from "../helpers/browser";

// The installable shell of the field app: what the service worker serves with no signal, what it must
// never serve from a cache, the manifest and icons, and how device storage trouble is reported.

const FIELD_PAGES = ["/field", "/field/digs", "/field/calculator", "/field/offline"];

async function openTodayOnline(page: Page) {
  await signInAs(page, "rep1");
  await page.goto("/field");
  await expect(page.getByRole("heading", { level: 1, name: "Today" })).toBeVisible();
  await waitForOfflineReady(page, ...FIELD_PAGES);
}

test("after one online visit the app shell, Today, the digs list and the calculator open offline", async ({
  page,
  context,
}) => {
  await openTodayOnline(page);
  // The first visit downloads the rep's fields on its own.
  await expect(page.getByRole("heading", { level: 3, name: "North 40" })).toBeVisible();

  await context.setOffline(true);
  await page.reload();
  await expect(page.getByRole("heading", { level: 1, name: "Today" })).toBeVisible();
  await expect(page.getByRole("status").filter({ hasText: "Offline" })).toBeVisible();
  // Read from the phone's database, not the network.
  await expect(page.getByRole("heading", { level: 3, name: "North 40" })).toBeVisible();
  await expect(page.getByRole("button", { name: "Refresh data" })).toBeDisabled();
  await expect(page.getByText("Connect to refresh.")).toBeVisible();

  await page.getByRole("navigation", { name: "Field app" }).getByRole("link", { name: "Calculator" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Field calculator" })).toBeVisible();
  await page.getByRole("tab", { name: "GDD & stage" }).click();
  await page.getByLabel("Day's high").fill("80");
  await page.getByLabel("Day's low").fill("55");
  // 80/55 °F → (80 + 55) / 2 − 50 = 17.5 GDD (Nielsen, Purdue Extension, worked value).
  await expect(page.getByText("17.5", { exact: true })).toBeVisible();

  await page.goto("/field/digs");
  await expect(page.getByRole("heading", { level: 1, name: "Digs" })).toBeVisible();
});

test("a field page never stored on the phone shows the offline page, not the browser's error", async ({
  page,
  context,
}) => {
  await openTodayOnline(page);
  await context.setOffline(true);
  const res = await page.goto("/field/a-page-never-opened");
  expect(res?.status()).toBe(200);
  await expect(page.getByRole("heading", { level: 1, name: "Not on this phone yet" })).toBeVisible();
  await expect(page.getByRole("link", { name: "Today" }).first()).toBeVisible();
});

test("sync and sign-in calls are never answered from a cache, online or off", async ({ page, context }) => {
  await openTodayOnline(page);
  // Online, both answer from the server (and would be stored by a careless service worker).
  const online = await page.evaluate(async () => {
    const session = await fetch("/api/auth/session");
    const pull = await fetch("/api/sync/pull", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ protocolVersion: 1, schemaVersion: 1, clientGroupId: "x", cursor: null }),
    });
    return [session.status, pull.status];
  });
  expect(online[0]).toBe(200);
  expect(online[1]).toBeGreaterThanOrEqual(400); // a bad body, but an answer from the server

  await context.setOffline(true);
  expect(await page.evaluate(() => navigator.serviceWorker.controller !== null)).toBe(true);
  const offline = await page.evaluate(async () => {
    const attempt = async (url: string, init?: RequestInit) => {
      try {
        const res = await fetch(url, init);
        return `answered ${res.status} (${res.type})`;
      } catch (err) {
        return err instanceof TypeError ? "network error" : `threw ${String(err)}`;
      }
    };
    return {
      pull: await attempt("/api/sync/pull", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: "{}",
      }),
      pullGet: await attempt("/api/sync/pull"),
      session: await attempt("/api/auth/session"),
    };
  });
  expect(offline).toEqual({ pull: "network error", pullGet: "network error", session: "network error" });

  const paths = await cachedPaths(page);
  expect(paths).toEqual(expect.arrayContaining(FIELD_PAGES));
  expect(paths.filter((p) => p.startsWith("/api/"))).toEqual([]);
});

function pngSize(bytes: Buffer): string {
  // PNG signature (8 bytes), IHDR length and type (8 bytes), then width and height (big-endian).
  expect(bytes.subarray(1, 4).toString("latin1")).toBe("PNG");
  return `${bytes.readUInt32BE(16)}x${bytes.readUInt32BE(20)}`;
}

test("the web app manifest names the app, opens on Today and its icons load", async ({ page, request }) => {
  const res = await request.get("/manifest.webmanifest");
  expect(res.status()).toBe(200);
  const manifest = await res.json();
  const colors = tailwind.theme?.extend?.colors as Record<string, Record<number, string>>;
  expect(manifest).toMatchObject({
    name: "Trenchbook",
    short_name: "Trenchbook",
    start_url: "/field",
    display: "standalone",
    theme_color: colors.sprout?.[900],
    background_color: colors.soil?.[50],
  });
  const pngs = (manifest.icons as { src: string; sizes: string; type: string; purpose: string }[]).filter(
    (i) => i.type === "image/png",
  );
  expect(pngs.map((i) => `${i.sizes} ${i.purpose}`).sort()).toEqual([
    "192x192 any",
    "512x512 any",
    "512x512 maskable",
  ]);
  for (const icon of pngs) {
    const img = await request.get(icon.src);
    expect(img.status(), icon.src).toBe(200);
    expect(img.headers()["content-type"]).toBe("image/png");
    expect(pngSize(await img.body()), icon.src).toBe(icon.sizes);
  }

  await signInAs(page, "rep1");
  await page.goto("/field");
  await expect(page.locator('link[rel="manifest"]')).toHaveAttribute("href", /manifest\.webmanifest/);
});

test("the field app asks to keep its storage and says plainly when the browser refuses", async ({ page }) => {
  await page.addInitScript(() => {
    const w = window as unknown as { persistCalls: number };
    w.persistCalls = 0;
    Object.defineProperty(navigator.storage, "persisted", { value: async () => false });
    Object.defineProperty(navigator.storage, "persist", {
      value: async () => {
        w.persistCalls++;
        return false;
      },
    });
  });
  await signInAs(page, "rep1");
  await page.goto("/field");
  const warning = page.getByText("This browser may clear Trenchbook's data on this phone");
  await expect(warning).toBeVisible();
  expect(await page.evaluate(() => (window as unknown as { persistCalls: number }).persistCalls)).toBe(1);
  await page.getByRole("button", { name: "Dismiss" }).click();
  await expect(warning).toBeHidden();
});

test("no warning when the browser grants persistent storage", async ({ page }) => {
  await page.addInitScript(() => {
    Object.defineProperty(navigator.storage, "persisted", { value: async () => false });
    Object.defineProperty(navigator.storage, "persist", { value: async () => true });
  });
  await signInAs(page, "rep1");
  await page.goto("/field");
  await expect(page.getByRole("heading", { level: 3, name: "North 40" })).toBeVisible();
  await expect(page.getByText("This browser may clear Trenchbook's data")).toHaveCount(0);
});

test("IndexedDB that will not open gets a plain full-width alert with what to do", async ({ page }) => {
  await signInAs(page, "rep1");
  await page.addInitScript(() => {
    IDBFactory.prototype.open = () => {
      throw new DOMException("IndexedDB is disabled for this test.", "InvalidStateError");
    };
  });
  await page.goto("/field");
  const alert = page.getByRole("alert").filter({ hasText: "storage for Trenchbook cannot be opened" });
  await expect(alert).toBeVisible();
  await expect(alert).toContainText("Nothing can be saved on this phone until this is fixed.");
  await expect(alert).toContainText("What to do:");
  await expect(alert.getByRole("button", { name: "Reload" })).toBeVisible();
  // The views that read the phone say so too, instead of showing an empty list as if nothing were there.
  await expect(page.getByText("No fields on this phone yet.")).toHaveCount(0);
});

test("before any download Today says to connect once, and a refused sync says what to do", async ({
  page,
  context,
}) => {
  await signInAs(page, "rep1");
  await context.route("**/api/sync/pull", (route) =>
    route.fulfill({ status: 401, contentType: "application/json", body: '{"error":"Sign in."}' }),
  );
  await page.goto("/field");
  await expect(page.getByText("No fields on this phone yet.")).toBeVisible();
  await expect(page.getByText("Connect once to download your fields.")).toBeVisible();
  await expect(
    page.getByText("you are signed out. Sign in again; nothing on this phone is lost."),
  ).toBeVisible();
  await expect(page.getByRole("link", { name: "Sign in again" })).toHaveAttribute("href", "/sign-in");
  await expect(page.getByText("Not synced yet on this phone.")).toBeVisible();
});

test("Today shows the rep's own fields with their predicted stage once data is pulled", async ({ page }) => {
  // A fixed day inside the demo season's weather: every stage comes from recorded temperatures. The
  // stage and window come from the agronomy core (checked against REFERENCES.md in tests/unit/agronomy);
  // this check is that Today shows them for the rep's own fields.
  const today = "2026-05-01";
  await page.clock.setFixedTime(new Date(`${today}T10:00:00`));
  await signInAs(page, "rep1");
  await page.goto("/field");

  const weather = demoWeather();
  const expected = DEMO_FIELDS.filter((f) =>
    ["Alder Creek Farms", "Bellweather Ranch"].includes(f.account),
  ).map((f) => {
    const planting = DEMO_PLANTINGS.filter((p) => p.field === f.key && p.plantedOn <= today).sort((a, b) =>
      b.plantedOn.localeCompare(a.plantedOn),
    )[0]!;
    const stage = stageOnDate(weather, planting.plantedOn, today);
    const window = digWindow({
      records: weather,
      plantingDate: planting.plantedOn,
      date: today,
      firstIrrigationDate: f.firstIrrigationOn,
    });
    return { name: f.name, stage: stage.stage, digNow: window.digNow };
  });
  const fields = page.getByRole("region", { name: "Your fields" }).getByRole("listitem");
  for (const f of expected) {
    const card = fields.filter({ has: page.getByRole("heading", { level: 3, name: f.name, exact: true }) });
    await expect(card).toContainText(f.stage === "planted" ? "Planted, not yet emerged" : `Stage ${f.stage}`);
    await expect(card).not.toContainText("projected");
    if (f.digNow) await expect(card).toContainText("Dig now");
  }
  // Fields of another rep's accounts never reach this phone.
  for (const f of DEMO_FIELDS.filter((d) => d.account === "Cottonwood Bend Dairy")) {
    await expect(page.getByRole("heading", { level: 3, name: f.name, exact: true })).toHaveCount(0);
  }
  // Fields to dig now come first.
  expect(expected.some((f) => f.digNow)).toBe(true);
  await expect(fields.first()).toContainText("Dig now");

  await expect(page.getByText(/^Last sync: /)).toBeVisible();
  await page.getByRole("button", { name: "Refresh data" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Up to date." })).toBeVisible();
});

test("the digs list shows where each dig stands in words, with its counts and a link to open it", async ({
  page,
}) => {
  await openTodayOnline(page);
  await expect(page.getByRole("heading", { level: 3, name: "Pivot Corner" })).toBeVisible();
  // Digs as the dig form and sync leave them on the phone: new, changed after sync, in conflict, refused.
  const ids = await page.evaluate(async () => {
    const db = await new Promise<IDBDatabase>((resolve, reject) => {
      const req = indexedDB.open("trenchbook");
      req.onsuccess = () => resolve(req.result);
      req.onerror = () => reject(req.error);
    });
    const all = <T>(store: string) =>
      new Promise<T[]>((resolve, reject) => {
        const req = db.transaction(store).objectStore(store).getAll();
        req.onsuccess = () => resolve(req.result as T[]);
        req.onerror = () => reject(req.error);
      });
    const fields = await all<{ id: string; name: string; accountId: string }>("fields");
    const byName = (n: string) => fields.find((f) => f.name === n)!;
    const site = (field: string, extra: Record<string, unknown>) => ({
      id: crypto.randomUUID(),
      fieldId: byName(field).id,
      accountId: byName(field).accountId,
      plantingId: null,
      dugAt: "2026-05-02T16:30:00.000Z",
      latitude: null,
      longitude: null,
      accuracyM: null,
      soilMoisture: null,
      soilTempF: null,
      irrigatedYet: false,
      recommendation: null,
      flaggedByRep: false,
      notes: null,
      rootIndex: null,
      assessment: null,
      rejectionReason: null,
      updatedLocallyAt: "2026-05-02T16:30:00.000Z",
      ...extra,
    });
    const local = site("Pivot Corner", { syncState: "waiting", serverVersion: null });
    const changed = site("Bench 80", { syncState: "waiting", serverVersion: 4 });
    const conflict = site("River 80", { syncState: "conflict", serverVersion: 5 });
    const refused = site("Levee 60", {
      syncState: "rejected",
      serverVersion: null,
      rejectionReason: "This field is no longer in your territory.",
    });
    const tx = db.transaction(["digSites", "dugPlants"], "readwrite");
    for (const s of [local, changed, conflict, refused]) tx.objectStore("digSites").put(s);
    for (const position of [1, 2]) {
      tx.objectStore("dugPlants").put({
        id: crypto.randomUUID(),
        digSiteId: local.id,
        position,
        syncState: "waiting",
      });
    }
    await new Promise((resolve, reject) => {
      tx.oncomplete = resolve;
      tx.onerror = () => reject(tx.error);
    });
    db.close();
    return { local: local.id };
  });

  await page.goto("/field/digs");
  const digs = page.getByRole("main").getByRole("listitem");
  const onlyHere = digs.filter({ hasText: "Only on this phone" });
  await expect(onlyHere).toHaveCount(1);
  await expect(onlyHere).toContainText("Pivot Corner");
  await expect(onlyHere).toContainText("2 plants · no photos");
  await expect(onlyHere.getByRole("link")).toHaveAttribute("href", new RegExp(ids.local));
  await expect(digs.filter({ hasText: "Changes waiting to sync" })).toContainText("Bench 80");
  await expect(digs.filter({ hasText: "Conflict: the server kept another value" })).toContainText("River 80");
  const refused = digs.filter({ hasText: "Refused by the server" });
  await expect(refused).toContainText("Levee 60");
  await expect(refused).toContainText("Reason: This field is no longer in your territory.");
  // The demo season's digs came down with the pull.
  await expect(digs.filter({ hasText: "Synced" }).first()).toBeVisible();
});
