import { createHash, randomBytes, randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { expect, type Page, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { DEMO_PASSWORD, DEMO_USERS } from "../../db/seed/demo-users";
import { hashPassword } from "../../lib/auth/password";
import { testEnv } from "../helpers/env";
import { linkIn, waitForMail } from "../helpers/mailbox";

const db = createDb(testEnv.databaseUrl, 2);
const suffix = randomUUID().slice(0, 8);
const regionName = `Mesa Verde Test ${suffix}`;
const accountName = `Juniper Draw Farm ${suffix}`;
const ids = { region: "", account: "" };
const emails: string[] = [];

function newEmail(label: string) {
  const email = `${label}-${randomUUID()}@example.test`;
  emails.push(email);
  return email;
}

async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

async function expectNoA11yViolations(page: Page) {
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa"]).analyze();
  expect(results.violations.map((v) => `${v.id}: ${v.help}`)).toEqual([]);
}

test.beforeAll(async () => {
  ids.region = (
    await db.insertInto("region").values({ name: regionName }).returning("id").executeTakeFirstOrThrow()
  ).id;
  ids.account = (
    await db
      .insertInto("account")
      .values({ regionId: ids.region, name: accountName, locality: "Upper draw" })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
});

test.afterAll(async () => {
  if (emails.length) {
    await db.deleteFrom("appUser").where("email", "in", emails).execute();
    await db.deleteFrom("signInAttempt").where("email", "in", emails).execute();
  }
  await db.deleteFrom("account").where("id", "=", ids.account).execute();
  await db.deleteFrom("region").where("id", "=", ids.region).execute();
  await db.destroy();
});

test("an admin invites a rep from the admin page; the rep sets a password from the e-mail and signs in", async ({
  page,
  browser,
}) => {
  const admin = DEMO_USERS.find((u) => u.key === "admin")!;
  const email = newEmail("e2e-invitee");
  const name = "Wren Castellano";

  await signIn(page, admin.email, DEMO_PASSWORD);
  await expect(page.getByText(`Signed in as ${admin.name}`)).toBeVisible();
  await page.goto("/admin/users/invite");
  await expect(page.getByRole("heading", { level: 1, name: "Invite a user" })).toBeVisible();

  // Submitting with nothing filled in marks the fields.
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "Check the marked fields" })).toBeVisible();
  await expect(page.getByLabel("E-mail")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByText("Enter a valid e-mail address")).toBeVisible();

  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Name").fill(name);
  await page.getByLabel("Role").selectOption({ label: "Field rep" });
  await expect(page.getByText("Choose a region to see its accounts.")).toBeVisible();
  await page.getByLabel("Region").selectOption({ label: regionName });
  await page.getByRole("checkbox", { name: accountName }).check();
  await expectNoA11yViolations(page);
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("status").filter({ hasText: `Invitation sent to ${email}.` })).toBeVisible();
  await expect(page.getByLabel("E-mail")).toHaveValue("");

  const [mail] = await waitForMail(email);
  const { url } = linkIn(mail!, "invite");

  // The invitee opens the link in their own browser.
  const context = await browser.newContext();
  const invitee = await context.newPage();
  await invitee.goto(url);
  await expect(invitee.getByRole("heading", { level: 1, name: "Set your password" })).toBeVisible();
  await expect(invitee.getByText(`Welcome to Trenchbook, ${name}.`)).toContainText(email);
  await expectNoA11yViolations(invitee);

  await invitee.getByLabel("New password").fill("short");
  await invitee.getByRole("button", { name: "Set password and continue" }).click();
  await expect(invitee.getByText("Use at least 10 characters.")).toBeVisible();
  await expect(invitee.getByLabel("New password")).toHaveAttribute("aria-invalid", "true");

  await invitee.getByLabel("New password").fill("dig before the first irrigation");
  await invitee.getByLabel("Repeat the password").fill("dig before the second irrigation");
  await invitee.getByRole("button", { name: "Set password and continue" }).click();
  await expect(invitee.getByText("The two passwords are different.")).toBeVisible();

  await invitee.getByLabel("Repeat the password").fill("dig before the first irrigation");
  await invitee.getByRole("button", { name: "Set password and continue" }).click();
  await expect(invitee.getByRole("status").filter({ hasText: "Your password is set." })).toBeVisible();
  await invitee.getByRole("link", { name: "Go to sign in" }).click();

  await signIn(invitee, email, "dig before the first irrigation");
  await expect(invitee.getByRole("heading", { level: 1, name: "Your accounts" })).toBeVisible();
  await expect(invitee.getByText(`Signed in as ${name} (Field rep)`)).toBeVisible();
  await expect(invitee.getByRole("heading", { name: accountName })).toBeVisible();

  // The link works once.
  await invitee.goto(url);
  await expect(
    invitee.getByRole("alert").filter({ hasText: "This link has already been used." }),
  ).toBeVisible();
  await context.close();
});

test("an expired invitation link explains itself", async ({ page }) => {
  const email = newEmail("e2e-expired");
  const user = await db
    .insertInto("appUser")
    .values({ email, name: "Late Opener", role: "supervisor", regionId: ids.region, status: "invited" })
    .returning("id")
    .executeTakeFirstOrThrow();
  const token = randomBytes(32).toString("base64url");
  await db
    .insertInto("oneTimeToken")
    .values({
      userId: user.id,
      purpose: "invite",
      tokenHash: createHash("sha256").update(token).digest("hex"),
      expiresAt: new Date(Date.now() - 60_000),
      createdBy: null,
    })
    .execute();

  await page.goto(`/invite/${token}`);
  await expect(page.getByRole("alert").filter({ hasText: "This link has expired." })).toBeVisible();
  await expect(
    page.getByRole("alert").filter({ hasText: "Ask your admin to send a new invitation." }),
  ).toBeVisible();
  await expect(page.getByLabel("New password")).toHaveCount(0);

  await page.goto(`/invite/${randomBytes(32).toString("base64url")}`);
  await expect(page.getByRole("alert").filter({ hasText: "This link is not valid." })).toBeVisible();
});

test("a forgotten password is reset from the sign-in page", async ({ page }) => {
  const email = newEmail("e2e-reset");
  await db
    .insertInto("appUser")
    .values({
      email,
      name: "Basil Oduya",
      role: "grower",
      passwordHash: await hashPassword("forgotten password 1"),
      status: "active",
    })
    .execute();

  await page.goto("/sign-in");
  await page.getByRole("link", { name: "Forgot your password?" }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Reset your password" })).toBeVisible();
  await page.getByLabel("E-mail").fill("not an address");
  await page.getByRole("button", { name: "Send reset link" }).click();
  await expect(page.getByText("Enter a valid e-mail address")).toBeVisible();
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Send reset link" }).click();
  await expect(page.getByRole("status").filter({ hasText: "a reset link has been sent" })).toBeVisible();

  const [mail] = await waitForMail(email);
  await page.goto(linkIn(mail!, "reset-password").url);
  await expect(page.getByText(`Choose a new password for ${email}.`)).toBeVisible();
  await page.getByLabel("New password").fill("remembered password 2");
  await page.getByLabel("Repeat the password").fill("remembered password 2");
  await page.getByRole("button", { name: "Save new password" }).click();
  await expect(page.getByRole("status").filter({ hasText: "Your password has been changed." })).toBeVisible();

  await signIn(page, email, "remembered password 2");
  await expect(page.getByRole("heading", { level: 1, name: "Your farm" })).toBeVisible();
});

test("a rep does not get the invite page", async ({ page }) => {
  const rep = DEMO_USERS.find((u) => u.key === "rep1")!;
  await signIn(page, rep.email, DEMO_PASSWORD);
  await expect(page.getByText(`Signed in as ${rep.name}`)).toBeVisible();
  await page.goto("/admin/users/invite");
  await expect(page.getByRole("heading", { level: 1, name: "Not found" })).toBeVisible();
});
