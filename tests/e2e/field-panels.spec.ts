import { randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { devices, expect, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { DEMO_USERS } from "../../db/seed/demo-users";
import { addDays } from "../../lib/agronomy";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// The field page's weather import: a bad file shows its row errors and imports nothing, a good one
// draws the GDD curve. On a fixture farm and field of our own, removed afterwards.

const db = createDb(testEnv.databaseUrl, 2);
const suffix = randomUUID().slice(0, 8);
const fx = { accountId: "", fieldId: randomUUID(), plantingId: randomUUID() };
const today = new Date().toISOString().slice(0, 10);

test.beforeAll(async () => {
  const region = await db
    .selectFrom("region")
    .select("id")
    .where("name", "=", "Sandhollow Valley")
    .executeTakeFirstOrThrow();
  fx.accountId = (
    await db
      .insertInto("account")
      .values({ regionId: region.id, name: `Panels Fixture Farm ${suffix}` })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  const rep = DEMO_USERS.find((u) => u.key === "rep1")!;
  const repId = (
    await db.selectFrom("appUser").select("id").where("email", "=", rep.email).executeTakeFirstOrThrow()
  ).id;
  await db.insertInto("accountRep").values({ accountId: fx.accountId, userId: repId }).execute();
  await db
    .insertInto("field")
    .values({
      id: fx.fieldId,
      accountId: fx.accountId,
      name: `Panels strip ${suffix}`,
      centroidLat: 36.7,
      centroidLon: -119.4,
    })
    .execute();
  await db
    .insertInto("planting")
    .values({
      id: fx.plantingId,
      fieldId: fx.fieldId,
      accountId: fx.accountId,
      hybrid: "panels 104-day",
      plantedOn: addDays(today, -20),
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
});

test.afterAll(async () => {
  const field = await db
    .selectFrom("field")
    .select("weatherStationId")
    .where("id", "=", fx.fieldId)
    .executeTakeFirst();
  await db.deleteFrom("planting").where("id", "=", fx.plantingId).execute();
  await db.deleteFrom("field").where("id", "=", fx.fieldId).execute();
  if (field?.weatherStationId)
    await db.deleteFrom("weatherStation").where("id", "=", field.weatherStationId).execute();
  await db.deleteFrom("accountRep").where("accountId", "=", fx.accountId).execute();
  await db.deleteFrom("account").where("id", "=", fx.accountId).execute();
  await db.destroy();
});

test("a bad weather file shows its row errors and imports nothing; a good one draws the GDD curve", async ({
  browser,
}) => {
  // AxeBuilder needs a page from a context the test made itself.
  const context = await browser.newContext({ ...devices["Pixel 7"] });
  const page = await context.newPage();
  await signInAs(page, "rep1");
  await page.goto(`/fields/${fx.fieldId}`);
  const input = page.getByLabel("Temperature file (CSV)");
  const bad = "date,max,min\n2026-05-01,78,51\n2026-02-30,70,50\n2026-05-03,45,52\n";
  await input.setInputFiles({ name: "bad.csv", mimeType: "text/csv", buffer: Buffer.from(bad) });
  await page.getByRole("button", { name: "Import temperatures" }).click();
  const alert = page.getByRole("alert").filter({ hasText: "Nothing was imported" });
  await expect(alert).toContainText("Row 3: date 2026-02-30 is not a date.");
  await expect(alert).toContainText("Row 4: max 45 is below min 52.");
  await expect(input).toHaveAttribute("aria-invalid", "true");
  const untouched = await db
    .selectFrom("field")
    .select("weatherStationId")
    .where("id", "=", fx.fieldId)
    .executeTakeFirstOrThrow();
  expect(untouched.weatherStationId).toBeNull();

  // 80/55 °F every day from planting to yesterday.
  const days = Array.from({ length: 20 }, (_, i) => `${addDays(today, -20 + i)},80,55`);
  await input.setInputFiles({
    name: "good.csv",
    mimeType: "text/csv",
    buffer: Buffer.from(`date,max,min\n${days.join("\n")}\n`),
  });
  await page.getByRole("button", { name: "Import temperatures" }).click();
  await expect(page.getByText("Imported 20 days")).toBeVisible();
  await expect(
    page.getByRole("img", { name: /Cumulative growing degree days since planting/ }),
  ).toBeVisible();
  // 19 days × 17.5 GDD after the planting day, plus today projected at the same rate: 350 GDD, V2
  // (the 86/50 °F method and the leaf-collar GDD thresholds of REFERENCES.md, as in
  // tests/unit/weather-gdd-curve.test.ts; the arithmetic worked by hand).
  await expect(page.locator("p", { hasText: /predicted stage V2, 350 GDD/ })).toBeVisible();
  const station = await db
    .selectFrom("field")
    .innerJoin("weatherDaily", "weatherDaily.stationId", "field.weatherStationId")
    .select((eb) => eb.fn.countAll<number>().as("n"))
    .where("field.id", "=", fx.fieldId)
    .executeTakeFirstOrThrow();
  expect(Number(station.n)).toBe(20);

  const axe = await new AxeBuilder({ page }).include('section[aria-labelledby^="panel-"]').analyze();
  expect(
    axe.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => ({ id: v.id, nodes: v.nodes.map((n) => n.target.join(" ")) })),
  ).toEqual([]);
  await context.close();
});
