import { expect, test } from "@playwright/test";
import { signInAs, waitForOfflineReady } from "../helpers/browser";

test("a rep runs the calculator offline after one online visit", async ({ page, context }) => {
  await signInAs(page, "rep1");
  await page.goto("/field/calculator");
  await expect(page.getByRole("heading", { level: 1, name: "Field calculator" })).toBeVisible();
  await waitForOfflineReady(page, "/field/calculator");

  await context.setOffline(true);
  await page.reload();
  await expect(page.getByRole("heading", { level: 1, name: "Field calculator" })).toBeVisible();
  await expect(page.getByRole("status").filter({ hasText: "Offline" })).toBeVisible();

  // Stand: 30-in rows → 17 ft 5 in of row is 1/1000 acre (UT Extension table; NC State IPM).
  const stand = page.getByRole("tabpanel", { name: "Stand" });
  await expect(stand.getByText("(17 ft 5 in)")).toBeVisible();
  await stand.getByLabel("Plants counted").fill("34");
  await expect(stand.getByText("34,000")).toBeVisible(); // 34 plants in 1/1000 acre × 1000 (arith)

  // Bad entry: a message at the field, no result.
  await stand.getByLabel("Row spacing").fill("-3");
  await expect(stand.getByText(/Enter a value from 7.5 to 60 in|length/i).first()).toBeVisible();
  await stand.getByLabel("Row spacing").fill("30");

  // GDD: 80/55 °F → 17.5 (Nielsen, Purdue Extension, worked value).
  await page.getByRole("tab", { name: "GDD & stage" }).click();
  const gdd = page.getByRole("tabpanel", { name: "GDD & stage" });
  await gdd.getByLabel("Day's high").fill("80");
  await gdd.getByLabel("Day's low").fill("55");
  await expect(gdd.getByText("17.5", { exact: true })).toBeVisible();
  // 120 GDD to VE + 2 × 82 per collar = 284 GDD → V2 (Nielsen, Purdue 2019).
  await gdd.getByLabel("GDD since planting").fill("290");
  await expect(gdd.getByText("V2", { exact: true })).toBeVisible();

  // Fertilizer: 10-34-0 at 7 gal/acre with the seed on sandy soil in 30-in rows:
  // 7 × 11.65 lb/gal × 10 % = 8.2 lb N, over the 6 lb/acre N + K2O limit (K-State eUpdate).
  await page.getByRole("tab", { name: "Fertilizer" }).click();
  const fert = page.getByRole("tabpanel", { name: "Fertilizer" });
  await expect(fert.getByText(/Anhydrous ammonia/)).toBeVisible();
  await fert.getByLabel("Product").selectOption({ label: "ammonium polyphosphate 10-34-0" });
  await fert.getByLabel(/^Rate \(/).fill("7");
  await fert.getByLabel("Soil texture").selectOption("coarse");
  await expect(fert.getByText("Not safe with the seed")).toBeVisible();
  await expect(fert.getByText("Limit: 6 lb N + K2O per acre.")).toBeVisible();

  // Nitrogen: 200 bu/acre grain → 200 × 56 ÷ 2000 × 24 = 134.4 lb N need (CDFA FREP, arith);
  // 10 ppm soil NO3-N over 1 ft × 4 = 40 lb credit (CDFA–FREP / UC Davis) → 94 lb N still needed.
  await page.getByRole("tab", { name: "N budget" }).click();
  const n = page.getByRole("tabpanel", { name: "N budget" });
  await n.getByLabel("Yield goal").fill("200");
  await n.getByLabel("Soil NO3-N").fill("10");
  await expect(n.getByText("94", { exact: true })).toBeVisible();

  // Yield: 30 ears × 16 rows × 35 kernels ÷ 90 = 186.7 bu/acre (yield component method, arith).
  await page.getByRole("tab", { name: "Yield" }).click();
  const y = page.getByRole("tabpanel", { name: "Yield" });
  await y.getByLabel("Ears in 1/1000 acre").fill("30");
  await y.getByLabel("Kernel rows per ear").fill("16");
  await y.getByLabel("Kernels per row").fill("35");
  await expect(y.getByText("187", { exact: true })).toBeVisible();
});

test("the service worker never answers an API sync or auth call from a cache", async ({ page }) => {
  await signInAs(page, "rep1");
  await page.goto("/field/calculator");
  await waitForOfflineReady(page, "/field/calculator");
  const cached = await page.evaluate(async () => {
    const keys: string[] = [];
    for (const name of await caches.keys()) {
      const cache = await caches.open(name);
      for (const req of await cache.keys()) keys.push(new URL(req.url).pathname);
    }
    return keys;
  });
  expect(cached.length).toBeGreaterThan(0);
  expect(cached.filter((p) => p.startsWith("/api/"))).toEqual([]);
});
