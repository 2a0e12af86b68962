import { randomUUID } from "node:crypto";
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { signInAs } from "../helpers/browser";

test("an admin adds a product to the catalog and a rep can use it in the calculator", async ({ browser }) => {
  const name = `calcium nitrate 15.5-0-0 test ${randomUUID().slice(0, 8)}`;
  const adminContext = await browser.newContext();
  const admin = await adminContext.newPage();
  await signInAs(admin, "admin");
  await admin.goto("/admin/products");
  await expect(admin.getByRole("heading", { level: 1, name: "Product catalog" })).toBeVisible();

  // A liquid with no density, and a salt index with no source, are refused at the fields.
  const form = admin.locator("form").filter({ hasText: "Add a product" });
  await form.getByLabel("Name", { exact: true }).fill(name);
  await form.getByLabel("Chemistry").fill("calcium nitrate solution");
  await form.getByLabel("N %").fill("9");
  await form.getByLabel("P2O5 %").fill("0");
  await form.getByLabel("K2O %").fill("0");
  await form.getByLabel("Salt index (sodium nitrate = 100)").fill("50");
  await form.getByRole("button", { name: "Add product" }).click();
  await expect(form.getByRole("alert")).toContainText("Some values need attention");
  await expect(form.getByText("Enter the density (lb/gal) of a liquid product")).toBeVisible();
  await expect(form.getByLabel("Name", { exact: true })).toHaveValue(name);

  await form.getByLabel("Density (lb/gal)").fill("12.6");
  await form.getByLabel("Source of the density").fill("supplier sheet (test)");
  await form.getByLabel("Salt index (sodium nitrate = 100)").fill("");
  await form.getByRole("button", { name: "Add product" }).click();
  await expect(admin.getByRole("status").filter({ hasText: "was added to the catalog" })).toBeVisible();
  await expect(admin.getByRole("rowheader", { name: new RegExp(name) })).toBeVisible();
  const axe = await new AxeBuilder({ page: admin }).analyze();
  expect(axe.violations.filter((v) => v.impact === "serious" || v.impact === "critical")).toEqual([]);

  // 10 gal/acre × 12.6 lb/gal × 9 % N = 11.3 lb N/acre (arithmetic on the grade).
  const repContext = await browser.newContext();
  const rep = await repContext.newPage();
  await signInAs(rep, "rep1");
  await rep.goto("/field/calculator");
  await rep.getByRole("tab", { name: "Fertilizer" }).click();
  const fert = rep.getByRole("tabpanel", { name: "Fertilizer" });
  await fert.getByLabel("Product").selectOption({ label: name });
  await fert.getByLabel(/^Rate \(/).fill("10");
  await fert.getByLabel("Placement", { exact: true }).selectOption("broadcast");
  await expect(fert.getByRole("cell", { name: "11.3", exact: true })).toBeVisible();
  await adminContext.close();
  await repContext.close();
});

test("a rep cannot open the product catalog admin page", async ({ page }) => {
  await signInAs(page, "rep1");
  await page.goto("/admin/products");
  await expect(page.getByRole("heading", { name: "Not found" })).toBeVisible();
});
