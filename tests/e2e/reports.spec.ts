import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { createDb } from "../../db/client";
import { signInAs } from "../helpers/browser";
import { testEnv } from "../helpers/env";

// The field report page and the reports list: no serious or critical axe violations, and the report
// offers the PDF, the CSV exports and (to the rep) sending to the grower.

test("the field report and the reports list have no serious or critical accessibility violations", async ({
  page,
}) => {
  const db = createDb(testEnv.databaseUrl, 1);
  const field = await db
    .selectFrom("field")
    .innerJoin("account", "account.id", "field.accountId")
    .select(["field.id", "field.name", "field.accountId"])
    .where("account.name", "=", "Alder Creek Farms")
    .where("field.deletedAt", "is", null)
    .orderBy("field.name")
    .executeTakeFirstOrThrow();
  // One failed report, so the list shows its table and a status with an error; removed at the end.
  const report = await db
    .insertInto("fieldReport")
    .values({
      fieldId: field.id,
      accountId: field.accountId,
      createdBy: null,
      objectKey: "reports/e2e-a11y.pdf",
      byteSize: 1000,
      sha256: "0".repeat(64),
      recipients: ["grower@example.test"],
      status: "failed",
      error: "connection refused",
    })
    .returning("id")
    .executeTakeFirstOrThrow();

  const serious = async () =>
    (await new AxeBuilder({ page }).analyze()).violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => ({ id: v.id, nodes: v.nodes.map((n) => n.target.join(" ")) }));

  try {
    await signInAs(page, "rep1");
    await page.goto(`/fields/${field.id}/report`);
    await expect(page.getByRole("heading", { level: 1, name: `Field report: ${field.name}` })).toBeVisible();
    await expect(page.getByRole("link", { name: "Download PDF" })).toHaveAttribute(
      "href",
      `/api/fields/${field.id}/report`,
    );
    await expect(page.getByRole("button", { name: "Send to grower" })).toBeVisible();
    expect(await serious()).toEqual([]);

    await page.goto("/reports");
    await expect(page.getByRole("heading", { level: 1, name: "Reports" })).toBeVisible();
    await expect(page.getByText("Error: connection refused")).toBeVisible();
    expect(await serious()).toEqual([]);
  } finally {
    await db.deleteFrom("fieldReport").where("id", "=", report.id).execute();
    await db.destroy();
  }
});
