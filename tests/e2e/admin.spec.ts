// The admin screens in the browser: finding users, changing a role, creating a region, assigning a rep
// to an account, keeping other roles out, and no serious accessibility problems on the three pages.
// Fixture users, an account and regions are created here and removed afterwards.
import { randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { expect, type Page, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { DEMO_USERS } from "../../db/seed/demo-users";
import { hashPassword } from "../../lib/auth/password";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

const db = createDb(testEnv.databaseUrl, 2);
const tag = randomUUID().slice(0, 8);
const fx = {
  regionId: "",
  changeling: { id: "", name: `Rosalind Ostrander ${tag}` },
  rep: { id: "", name: `Cornelius Pike ${tag}` },
  account: { id: "", name: `Admin Spec Orchard ${tag}` },
};
const regionName = `Admin Spec Region ${tag}`;

test.beforeAll(async () => {
  fx.regionId = (
    await db
      .selectFrom("region")
      .select("id")
      .where("name", "=", "Sandhollow Valley")
      .executeTakeFirstOrThrow()
  ).id;
  const passwordHash = await hashPassword(`fixture-${tag}-password`);
  for (const [key, user] of [
    ["changeling", fx.changeling],
    ["rep", fx.rep],
  ] as const) {
    user.id = (
      await db
        .insertInto("appUser")
        .values({
          email: `admin-spec-${key}-${tag}@trenchbook.test`,
          name: user.name,
          role: "rep",
          regionId: fx.regionId,
          passwordHash,
          status: "active",
        })
        .returning("id")
        .executeTakeFirstOrThrow()
    ).id;
  }
  fx.account.id = (
    await db
      .insertInto("account")
      .values({ regionId: fx.regionId, name: fx.account.name, locality: "Spec bench" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
});

test.afterAll(async () => {
  await db.deleteFrom("account").where("id", "=", fx.account.id).execute();
  await db.deleteFrom("appUser").where("email", "like", `admin-spec-%-${tag}@trenchbook.test`).execute();
  await db.deleteFrom("region").where("name", "ilike", `${regionName}%`).execute();
  await db.destroy();
});

// Rows of the admin table; on a phone the rows show as cards, so they are found by markup.
const rows = (page: Page) => page.locator("main table tbody tr");
const filters = (page: Page) => page.locator("main search");

async function openUsers(page: Page) {
  await signInAs(page, "admin");
  await page.getByRole("link", { name: "Admin", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Users" })).toBeVisible();
}

test("an admin searches users by name and filters them by role", async ({ page }) => {
  await openUsers(page);
  await filters(page).getByLabel("Name or e-mail").fill("Quintero");
  await page.getByRole("button", { name: "Search" }).click();
  await expect(page).toHaveURL(/q=Quintero/);
  await expect(rows(page)).toHaveCount(1);
  await expect(rows(page).first()).toContainText("Marisol Quintero");
  await expect(rows(page).first()).toContainText("marisol@trenchbook.test");

  await page.getByRole("link", { name: "Clear filters" }).click();
  await expect(page).toHaveURL(/\/admin\/users$/);
  await expect(filters(page).getByLabel("Name or e-mail")).toHaveValue("");
  await filters(page).getByLabel("Role", { exact: true }).selectOption({ label: "Grower" });
  await page.getByRole("button", { name: "Search" }).click();
  await expect(page).toHaveURL(/role=grower/);
  const growers = DEMO_USERS.filter((u) => u.role === "grower");
  expect(growers).toHaveLength(4);
  for (const g of growers) await expect(rows(page).filter({ hasText: g.name })).toHaveCount(1);
  // Every row shown is a grower: no rep, supervisor or admin slipped through the filter.
  const shown = await rows(page).count();
  expect(shown).toBeGreaterThanOrEqual(4);
  for (let i = 0; i < shown; i++) await expect(rows(page).nth(i)).toContainText("Role:Grower");
  await expect(rows(page).filter({ hasText: "Marisol Quintero" })).toHaveCount(0);
});

test("an admin changes a user's role and deactivates them, with a confirmation step", async ({ page }) => {
  await openUsers(page);
  await filters(page).getByLabel("Name or e-mail").fill(fx.changeling.name);
  await page.getByRole("button", { name: "Search" }).click();
  await expect(rows(page)).toHaveCount(1);
  const row = rows(page).first();
  await row.locator("summary").click();

  await row.getByLabel("Role", { exact: true }).selectOption("supervisor");
  await row.getByRole("button", { name: "Save role" }).click();
  await expect(row.getByRole("status").filter({ hasText: "Role saved" })).toHaveText(
    `Role saved for ${fx.changeling.name}.`,
  );
  await expect(row).toContainText("Role:Supervisor");
  await expect
    .poll(
      async () =>
        (await db.selectFrom("appUser").select("role").where("id", "=", fx.changeling.id).executeTakeFirst())
          ?.role,
    )
    .toBe("supervisor");

  await row.getByRole("button", { name: "Deactivate…" }).click();
  await expect(row.getByText(`Deactivate ${fx.changeling.name}?`)).toBeFocused();
  await row.getByRole("button", { name: "Yes, deactivate" }).click();
  await expect(row.getByRole("status").filter({ hasText: "is deactivated" })).toBeVisible();
  await expect(row).toContainText("Status:Deactivated");
  await expect(row.getByRole("button", { name: "Reactivate…" })).toBeVisible();
});

test("an admin cannot deactivate themselves", async ({ page }) => {
  await openUsers(page);
  await filters(page).getByLabel("Name or e-mail").fill("admin@trenchbook.test");
  await page.getByRole("button", { name: "Search" }).click();
  await expect(page).toHaveURL(/q=admin/);
  await expect(rows(page)).toHaveCount(1);
  const row = rows(page).first();
  await row.locator("summary").click();
  await row.getByRole("button", { name: "Deactivate…" }).click();
  await row.getByRole("button", { name: "Yes, deactivate" }).click();
  await expect(row.getByRole("alert")).toContainText("You cannot deactivate your own sign-in");
  await expect(row).toContainText("Status:Active");
});

test("an admin creates a region and is told clearly when the name is taken", async ({ page }) => {
  await signInAs(page, "admin");
  await page.goto("/admin/regions");
  await expect(page.getByRole("heading", { level: 1, name: "Regions" })).toBeVisible();
  await page.getByLabel("Region name").fill(regionName);
  await page.getByRole("button", { name: "Create region" }).click();
  await expect(page.getByRole("status").filter({ hasText: "created" })).toHaveText(
    `Region “${regionName}” created.`,
  );
  await expect(rows(page).filter({ hasText: regionName })).toHaveCount(1);
  await expect(page.getByLabel("Region name")).toHaveValue("");

  await page.getByLabel("Region name").fill(regionName.toLowerCase());
  await page.getByRole("button", { name: "Create region" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "already exists" })).toHaveText(
    `A region named “${regionName.toLowerCase()}” already exists. Choose another name.`,
  );
  await expect(page.getByLabel("Region name")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByLabel("Region name")).toHaveValue(regionName.toLowerCase());
  const made = await db.selectFrom("region").select("id").where("name", "ilike", regionName).execute();
  expect(made).toHaveLength(1);
});

test("an admin assigns a rep to an account", async ({ page }) => {
  await signInAs(page, "admin");
  await page.goto("/admin/accounts");
  await page.getByLabel("Account name or locality").fill(fx.account.name);
  await page.getByRole("button", { name: "Search" }).click();
  await expect(rows(page)).toHaveCount(1);
  await page.getByRole("link", { name: fx.account.name }).click();
  await expect(page.getByRole("heading", { level: 1, name: fx.account.name })).toBeVisible();

  const reps = page.getByRole("region", { name: "Field reps" });
  await expect(reps).toContainText("No field rep serves this account yet.");
  await reps.getByLabel("Add a field rep").selectOption({ label: fx.rep.name });
  await reps.getByRole("button", { name: "Assign rep" }).click();
  await expect(reps.getByRole("status").filter({ hasText: "assigned" })).toHaveText(
    `${fx.rep.name} assigned to this account.`,
  );
  await expect(reps.getByRole("listitem").filter({ hasText: fx.rep.name })).toBeVisible();
  const assigned = await db
    .selectFrom("accountRep")
    .select("userId")
    .where("accountId", "=", fx.account.id)
    .execute();
  expect(assigned.map((r) => r.userId)).toEqual([fx.rep.id]);

  await page.goto("/admin/accounts");
  await page.getByLabel("Account name or locality").fill(fx.account.name);
  await page.getByRole("button", { name: "Search" }).click();
  await expect(rows(page).first()).toContainText(fx.rep.name);
});

test("a rep who opens the admin screens gets the not-found page", async ({ page }) => {
  await signInAs(page, "rep1");
  await expect(page.getByRole("link", { name: "Admin", exact: true })).toHaveCount(0);
  for (const path of ["/admin/users", "/admin/regions", "/admin/accounts"]) {
    await page.goto(path);
    await expect(page.getByRole("heading", { level: 1, name: "Not found" })).toBeVisible();
    await expect(page.getByRole("heading", { level: 1, name: "Users" })).toHaveCount(0);
  }
});

test("the three admin pages have no serious or critical accessibility violations", async ({ page }) => {
  await signInAs(page, "admin");
  for (const path of ["/admin/users", "/admin/regions", "/admin/accounts"]) {
    await page.goto(path);
    await expect(page.getByRole("navigation", { name: "Administration" })).toBeVisible();
    const results = await new AxeBuilder({ page }).analyze();
    const serious = results.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => `${path} ${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(" ")).join(", ")})`);
    expect(serious).toEqual([]);
  }
});
