import { randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// The field page in Chromium on a fixture field of Alder Creek Farms (rep1's account): a rep raises a
// seed-placed pass's rate and the placement audit turns from OK to Exceeds; no serious or critical axe
// violations. The fixture rows are removed afterwards; the demo data is not touched.

const db = createDb(testEnv.databaseUrl, 2);
const fieldId = randomUUID();
const plantingId = randomUUID();
const passId = randomUUID();
const fieldName = `E2E field page ${fieldId.slice(0, 8)}`;
// An invented boundary, so the page draws its map.
const BOX = [
  [-120.393, 36.879],
  [-120.388, 36.879],
  [-120.388, 36.882],
  [-120.393, 36.882],
  [-120.393, 36.879],
];

test.beforeAll(async () => {
  const account = await db
    .selectFrom("account")
    .select("id")
    .where("name", "=", "Alder Creek Farms")
    .executeTakeFirstOrThrow();
  // 10-34-0 with the seed in 30-in rows on medium soil: K-State's limit is 8 lb N + K2O per acre, so
  // 3 gal/acre (about 3.5 lb) is within it and 8 gal/acre (about 9.3 lb) over it.
  const product = await db
    .selectFrom("product")
    .select("id")
    .where("gradeN", "=", 10)
    .where("gradeP2o5", "=", 34)
    .where("gradeK2o", "=", 0)
    .where("form", "=", "liquid")
    .where("active", "=", true)
    .executeTakeFirstOrThrow();
  await db
    .insertInto("field")
    .values({
      id: fieldId,
      accountId: account.id,
      name: fieldName,
      soilTexture: "medium",
      boundary: JSON.stringify({ type: "Polygon", coordinates: [BOX] }),
      areaAcres: 40,
      centroidLat: 36.8805,
      centroidLon: -120.3905,
    })
    .execute();
  await db
    .insertInto("planting")
    .values({
      id: plantingId,
      fieldId,
      accountId: account.id,
      hybrid: "E2E 104-day",
      plantedOn: "2026-04-20",
      seedingRate: 34_000,
      seedingDepthIn: 2,
      rowSpacingIn: 30,
      soilTexture: "medium",
    })
    .execute();
  await db
    .insertInto("fertilizerPass")
    .values({
      id: passId,
      fieldId,
      plantingId,
      accountId: account.id,
      productId: product.id,
      appliedOn: "2026-04-20",
      rate: 3,
      rateUnit: "gal/ac",
      placement: "seed_placed",
    })
    .execute();
});

test.afterAll(async () => {
  await db.deleteFrom("fertilizerPass").where("fieldId", "=", fieldId).execute();
  await db.deleteFrom("planting").where("fieldId", "=", fieldId).execute();
  await db.deleteFrom("field").where("id", "=", fieldId).execute();
  await db.destroy();
});

test("a rep raises a pass's rate and sees its placement audit change from OK to Exceeds", async ({
  page,
}) => {
  await signInAs(page, "rep1");
  await page.goto(`/fields/${fieldId}`);
  await expect(page.getByRole("heading", { level: 1, name: fieldName })).toBeVisible();
  const pass = page
    .locator("li.card")
    .filter({ has: page.getByRole("heading", { level: 3 }) })
    .first();
  await expect(pass.locator("[data-audit-status]")).toHaveAttribute("data-audit-status", "ok");
  await expect(pass.getByText("Result: OK")).toBeVisible();
  await expect(pass.getByText("Limit: 8 lb N + K2O per acre for 30-in rows on Medium soil.")).toBeVisible();

  await pass.getByText("Edit this pass").click();
  const rate = pass.getByLabel("Rate", { exact: true });
  await rate.fill("8");
  await pass.getByRole("button", { name: "Save pass" }).click();
  await expect(pass.getByText("Saved the pass.")).toBeVisible();

  await expect(pass.locator("[data-audit-status]")).toHaveAttribute("data-audit-status", "exceeds");
  await expect(pass.getByText("Result: Exceeds")).toBeVisible();
  await expect(pass.getByTestId("pass-rate")).toHaveText("8 gal/acre");
  const stored = await db
    .selectFrom("fertilizerPass")
    .select(["rate", "version"])
    .where("id", "=", passId)
    .executeTakeFirstOrThrow();
  expect(stored.rate).toBe(8);
  expect(stored.version).toBeGreaterThan(0);

  // A bad entry is refused at the field and changes nothing.
  await rate.fill("900");
  await pass.getByRole("button", { name: "Save pass" }).click();
  await expect(rate).toHaveAttribute("aria-invalid", "true");
  await expect(pass.getByText("Enter the rate from 0 to 500.")).toBeVisible();
  const after = await db
    .selectFrom("fertilizerPass")
    .select("rate")
    .where("id", "=", passId)
    .executeTakeFirstOrThrow();
  expect(after.rate).toBe(8);
});

test("the field page has no serious or critical accessibility violations", async ({ page }) => {
  await signInAs(page, "rep1");
  await page.goto(`/fields/${fieldId}`);
  await expect(page.getByRole("heading", { level: 2, name: "Fertilizer program" })).toBeVisible();
  // Open the forms so they are checked too.
  await expect(page.locator(".leaflet-container").first()).toBeVisible();
  await page.getByText("Add a fertilizer pass").click();
  await page.getByText("Draw the boundary").click();
  await expect(page.locator(".leaflet-container")).toHaveCount(2);
  await page.getByText("Edit planting E2E 104-day (2026-04-20)").click();
  const result = await new AxeBuilder({ page }).analyze();
  const serious = result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => n.target.join(" ")) }));
  expect(serious).toEqual([]);
});
