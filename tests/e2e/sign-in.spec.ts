import { expect, test } from "@playwright/test";
import { DEMO_PASSWORD, DEMO_USERS } from "../../db/seed/demo-users";

const homeHeadings: Record<string, string> = {
  admin: "Administration",
  supervisor: "Region overview",
  rep: "Your accounts",
  grower: "Your farm",
};

for (const key of ["admin", "supervisor", "rep1", "grower1"]) {
  const user = DEMO_USERS.find((u) => u.key === key)!;
  test(`${user.role} signs in and sees their own home`, async ({ page }) => {
    await page.goto("/");
    await expect(page).toHaveURL(/\/sign-in/);
    await page.getByLabel("E-mail").fill(user.email);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("heading", { level: 1, name: homeHeadings[user.role] })).toBeVisible();
    await expect(page.getByText(`Signed in as ${user.name}`)).toBeVisible();
  });
}

test("a wrong password shows a clear message", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill("renata@trenchbook.test");
  await page.getByLabel("Password").fill("definitely-wrong");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "do not match" })).toContainText(
    "That e-mail and password do not match",
  );
});

test("an API call without a session gets 401 JSON, not a redirect", async ({ request }) => {
  const res = await request.get("/api/accounts", { maxRedirects: 0 });
  expect(res.status()).toBe(401);
  expect(res.headers()["content-type"]).toContain("application/json");
  expect((await res.json()).error).toMatch(/sign in/i);
});

test("a signed-out visitor returns to the page they asked for after signing in", async ({ page }) => {
  const admin = DEMO_USERS.find((u) => u.key === "admin")!;
  await page.goto("/admin/regions?q=Sand");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fadmin%2Fregions%3Fq%3DSand$/);
  await page.getByLabel("E-mail").fill(admin.email);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/admin\/regions\?q=Sand$/);
  await expect(page.getByText(`Signed in as ${admin.name}`)).toBeVisible();
});
