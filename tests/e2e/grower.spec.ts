import AxeBuilder from "@axe-core/playwright";
import { type Browser, expect, type Page, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { DEMO_USERS } from "../../db/seed/demo-users";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// Issue 6, the grower view in Chromium: grower1 signs in to their farm's home (map, fields, recent
// digs with root photos, their rep's recommendations), opens a dig, acknowledges the recommendation
// and comments on it. Axe finds no serious or critical violation on the grower home, the digs table
// and a dig page. The answers made here are removed afterwards, so the demo stays as it is.

const db = createDb(testEnv.databaseUrl, 2);
const started = new Date();
const grower1Email = DEMO_USERS.find((u) => u.key === "grower1")!.email;

test.afterAll(async () => {
  const user = await db
    .selectFrom("appUser")
    .select("id")
    .where("email", "=", grower1Email)
    .executeTakeFirst();
  if (user) {
    await db
      .deleteFrom("recommendationResponse")
      .where("userId", "=", user.id)
      .where("createdAt", ">=", started)
      .execute();
  }
  await db.destroy();
});

async function growerHome(browser: Browser): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  await signInAs(page, "grower1");
  await expect(page.getByRole("heading", { level: 1, name: "Your farm" })).toBeVisible();
  return page;
}

async function seriousViolations(page: Page) {
  const result = await new AxeBuilder({ page }).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.map((n) => n.target.join(" ")) }));
}

test("a grower sees their farm, opens a dig, acknowledges the recommendation and comments", async ({
  browser,
}) => {
  const page = await growerHome(browser);
  const fields = page.getByRole("region", { name: "Your fields" });
  await expect(fields.getByRole("link").first()).toBeVisible();
  const digs = page.getByRole("region", { name: "Recent digs" });
  const thumb = digs.getByRole("img").first();
  await expect(thumb).toBeVisible();
  // The photo really loaded through its presigned link.
  await expect
    .poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
    .toBeGreaterThan(0);
  // Another farm's field never shows.
  await expect(page.getByText("Cottonwood Bend Dairy")).toHaveCount(0);

  await expect(
    page.getByRole("region", { name: "Recommendations from your field rep" }).getByRole("blockquote").first(),
  ).toBeVisible();
  // Open a dig that has photos, from its card.
  await digs
    .getByRole("listitem")
    .filter({ has: page.getByRole("img") })
    .first()
    .getByRole("link")
    .click();
  await expect(page.getByRole("heading", { level: 1, name: /^Dig in / })).toBeVisible();
  await expect(page.getByRole("region", { name: "Photos" }).getByRole("img").first()).toBeVisible();
  const advice = page.getByRole("region", { name: "Recommendation" });
  await advice.getByRole("button", { name: "Acknowledge" }).click();
  await expect(advice.getByText("You acknowledged this recommendation.")).toBeVisible();
  const comment = `Thanks, we will side-dress after the wind drops (${Date.now()}).`;
  await advice.getByLabel("Your comment").fill(comment);
  await advice.getByRole("button", { name: "Send comment" }).click();
  await expect(advice.getByText(comment)).toBeVisible();
  // Still there after a reload: stored on the server, shown with the acknowledgement.
  await page.reload();
  await expect(advice.getByText(comment)).toBeVisible();
  await expect(advice.getByText(/acknowledged this recommendation/).first()).toBeVisible();
  await page.context().close();
});

test("the grower home, the digs and fields tables and a dig page have no serious or critical axe violations", async ({
  browser,
}) => {
  // Four pages, each with an axe scan: on a loaded 2-core machine this takes more than a minute.
  test.setTimeout(150_000);
  const page = await growerHome(browser);
  await expect(page.locator(".leaflet-container").first()).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  const digHref = await page
    .getByRole("region", { name: "Recent digs" })
    .getByRole("link")
    .first()
    .getAttribute("href");
  expect(digHref).toMatch(/^\/digs\/[0-9a-f-]{36}$/);

  await page.goto("/digs?sort=rootIndex&dir=asc");
  await expect(page.getByRole("columnheader", { name: /Root index/ })).toHaveAttribute(
    "aria-sort",
    "ascending",
  );
  expect(await seriousViolations(page)).toEqual([]);

  await page.goto("/fields");
  await expect(page.getByRole("heading", { level: 1, name: "Fields" })).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);

  await page.goto(digHref!);
  await expect(page.getByRole("heading", { level: 2, name: "The server's assessment" })).toBeVisible();
  await expect(page.locator(".leaflet-container").first()).toBeVisible();
  expect(await seriousViolations(page)).toEqual([]);
  await page.context().close();
});
