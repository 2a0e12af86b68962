import AxeBuilder from "@axe-core/playwright";
import { type Browser, devices, expect, type Page, test } from "@playwright/test";
import { signInAs } from "../helpers/browser";

// No serious or critical axe violations on the field app's pages, on a phone-sized screen, with the
// rep's data downloaded so the lists, badges and cards are on the page.

async function repPage(browser: Browser): Promise<Page> {
  // AxeBuilder needs a page from a context the test made itself.
  const context = await browser.newContext({ ...devices["Pixel 7"] });
  const page = await context.newPage();
  await signInAs(page, "rep1");
  await page.goto("/field");
  await expect(page.getByRole("heading", { level: 3, name: "North 40" })).toBeVisible();
  return page;
}

async function seriousViolations(page: Page) {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => n.target.join(" ")) }));
}

test("Today has no serious or critical accessibility violations", async ({ browser }) => {
  const page = await repPage(browser);
  await expect(page.getByRole("heading", { level: 2, name: "Recent digs" })).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await page.context().close();
});

test("the digs list has no serious or critical accessibility violations", async ({ browser }) => {
  const page = await repPage(browser);
  await page.goto("/field/digs");
  await expect(page.getByRole("heading", { level: 1, name: "Digs" })).toBeVisible();
  await expect(page.getByRole("main").getByRole("listitem").first()).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await page.context().close();
});

test("the calculator has no serious or critical accessibility violations", async ({ browser }) => {
  const page = await repPage(browser);
  await page.goto("/field/calculator");
  await expect(page.getByRole("heading", { level: 1, name: "Field calculator" })).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await page.context().close();
});

test("the offline page has no serious or critical accessibility violations", async ({ browser }) => {
  const page = await repPage(browser);
  await page.goto("/field/offline");
  await expect(page.getByRole("heading", { level: 1, name: "Not on this phone yet" })).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await page.context().close();
});
