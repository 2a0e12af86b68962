import { randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { expect, type Page, test } from "@playwright/test";
import { sql } from "kysely";
import { createDb } from "../../db/client";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// The field map in Chromium: a grower's pins and nobody else's (also by guessing ids in the API), 5,000
// seeded pins drawn as clusters that split on zooming in, and no serious or critical axe violations.

const db = createDb(testEnv.databaseUrl, 2);
const PINS = 5000;
const suffix = randomUUID().slice(0, 8);
const fx = { accountId: "", fieldId: randomUUID(), name: `Map Cluster Farm ${suffix}` };
// A 0.2° box of open ocean, away from the demo valley and the integration fixtures.
const LON0 = 60.5;
const LAT0 = -48.5;

test.beforeAll(async () => {
  // A run killed before its afterAll leaves its pins in this box: clear them so the counts hold.
  await sql`delete from dig_site where latitude between ${LAT0} and ${LAT0 + 0.2}
    and longitude between ${LON0} and ${LON0 + 0.2}`.execute(db);
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Upper Mesa")
    .executeTakeFirstOrThrow();
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: fx.name })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  const ring = [
    [LON0, LAT0],
    [LON0 + 0.2, LAT0],
    [LON0 + 0.2, LAT0 + 0.2],
    [LON0, LAT0 + 0.2],
    [LON0, LAT0],
  ];
  await db
    .insertInto("field")
    .values({
      id: fx.fieldId,
      accountId: fx.accountId,
      name: `Cluster field ${suffix}`,
      boundary: JSON.stringify({ type: "Polygon", coordinates: [ring] }),
      centroidLat: LAT0 + 0.1,
      centroidLon: LON0 + 0.1,
    })
    .execute();
  // A grid of pins, a tenth of them flagged by the rep, root indices over the whole range.
  await sql`
    insert into dig_site (id, field_id, account_id, dug_at, latitude, longitude, root_index, flagged_by_rep)
    select gen_random_uuid(), ${fx.fieldId}::uuid, ${fx.accountId}::uuid,
      timestamptz '2026-05-01 17:00Z' + (i % 20) * interval '1 day',
      ${LAT0} + 0.002 + (i / 100) * 0.0039, ${LON0} + 0.002 + (i % 100) * 0.00196,
      (i * 37) % 100, i % 10 = 0
    from generate_series(0, ${PINS - 1}) as i`.execute(db);
});

test.afterAll(async () => {
  await db.deleteFrom("digSite").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("field").where("id", "=", fx.fieldId).execute();
  await db.deleteFrom("account").where("id", "=", fx.accountId).execute();
  await db.destroy();
});

const markers = (page: Page) => page.locator(".trench-pin, .trench-cluster");

async function clusterCounts(page: Page): Promise<number[]> {
  const texts = await page.locator(".trench-cluster").allTextContents();
  return texts.map((t) => Number(t.replace(/\D/g, "")));
}

test("a grower sees their own pins on the map and no other farm's, in the page or by id", async ({
  page,
}) => {
  const own = await db
    .selectFrom("digSite")
    .innerJoin("account", "account.id", "digSite.accountId")
    .select(["digSite.id", "account.name"])
    .where("digSite.deletedAt", "is", null)
    .where("digSite.latitude", "is not", null)
    .where("account.name", "in", ["Alder Creek Farms", "Bellweather Ranch"])
    .execute();
  const alder = own.filter((d) => d.name === "Alder Creek Farms");
  const bell = own.filter((d) => d.name === "Bellweather Ranch");
  expect(alder.length).toBeGreaterThan(0);
  expect(bell.length).toBeGreaterThan(0);

  await signInAs(page, "grower1");
  await page.goto("/map");
  // What the map asks for, with the grower's session: their farm's pins only.
  const body = (await (await page.request.get("/api/map?bbox=-180,-90,180,90")).json()) as {
    features: { id: string; geometry: { type: string }; properties: { accountName: string } }[];
  };
  const digs = body.features.filter((f) => f.geometry.type === "Point");
  expect(digs.map((d) => d.id).sort()).toEqual(alder.map((d) => d.id).sort());
  expect(new Set(body.features.map((f) => f.properties.accountName))).toEqual(new Set(["Alder Creek Farms"]));
  // The map fits the farm: every pin in view, counted in the live summary, drawn as pins or clusters.
  await expect(page.getByTestId("map-summary")).toContainText(`${alder.length} digs in this view`);
  await expect(markers(page).first()).toBeVisible();
  await expect(page.getByRole("heading", { name: "Legend" })).toBeVisible();
  // Clusters zoom in until single pins show; a pin's popup summarises the dig and links to it.
  for (let i = 0; i < 6 && (await page.locator(".trench-pin").count()) === 0; i++) {
    await page.locator(".trench-cluster").first().click();
    await page.waitForTimeout(400);
  }
  await page.locator(".trench-pin").first().click();
  const popup = page.locator(".leaflet-popup-content");
  await expect(popup.getByRole("link", { name: "Open the dig" })).toHaveAttribute(
    "href",
    /^\/digs\/[0-9a-f-]{36}$/,
  );
  await expect(popup).toContainText("Alder Creek Farms");
  await page.getByText(/^List the digs in this view/).click();
  for (const d of bell) await expect(page.locator(`a[href="/digs/${d.id}"]`)).toHaveCount(0);
  // The account filter offers only the grower's own farm, so it is not shown.
  await expect(page.getByLabel("Account", { exact: true })).toHaveCount(0);

  // Another farm's dig by id: 404, as if it did not exist; one's own: 200.
  expect((await page.request.get(`/api/dig-sites/${bell[0]!.id}`)).status()).toBe(404);
  expect((await page.request.get(`/api/dig-sites/${alder[0]!.id}`)).status()).toBe(200);
  const other = await page.request.get(
    `/api/map?bbox=-180,-90,180,90&accountId=${(await db.selectFrom("account").select("id").where("name", "=", "Bellweather Ranch").executeTakeFirstOrThrow()).id}`,
  );
  expect(((await other.json()) as { features: unknown[] }).features).toEqual([]);
});

test("5,000 pins render as clusters with counts that split when zooming in", async ({ page }) => {
  await signInAs(page, "admin");
  await page.goto("/map");
  await expect(page.getByTestId("map-summary")).toContainText("in this view");
  const answer = page.waitForResponse((r) => r.url().includes(`accountId=${fx.accountId}`) && r.ok());
  await page.getByLabel("Account", { exact: true }).selectOption({ label: fx.name });
  await answer;
  await expect(page.getByTestId("map-summary")).toContainText("5,000 digs in this view, 500 flagged");
  await expect(page.locator(".trench-cluster").first()).toBeVisible();
  const before = await clusterCounts(page);
  const drawn = await markers(page).count();
  expect(drawn).toBeLessThan(PINS / 10);
  expect(before.every((n) => n >= 2)).toBe(true);
  // Every pin is in a cluster or drawn alone.
  const singles = await page.locator(".trench-pin").count();
  expect(before.reduce((a, b) => a + b, 0) + singles).toBe(PINS);

  // Selecting the biggest cluster zooms to where it splits.
  const biggest = Math.max(...before);
  await page.locator(".trench-cluster").nth(before.indexOf(biggest)).click();
  await expect.poll(async () => Math.max(0, ...(await clusterCounts(page)))).toBeLessThan(biggest);
  await expect(page.getByTestId("map-summary")).not.toContainText("5,000 digs");
});

test("the map page has no serious or critical accessibility violations", async ({ page }) => {
  await signInAs(page, "rep1");
  await page.goto("/map");
  await expect(page.getByTestId("map-summary")).toContainText("in this view");
  await expect(markers(page).first()).toBeVisible();
  await expect(page.getByLabel("Account", { exact: true })).toBeVisible();
  const result = await new AxeBuilder({ page }).analyze();
  const serious = result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => n.target.join(" ")) }));
  expect(serious).toEqual([]);
});
