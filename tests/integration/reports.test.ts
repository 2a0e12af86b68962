// Field reports: sending one renders the PDF, stores it in the bucket, e-mails it to the account's
// grower through the SMTP fake and records the send; the PDF in the e-mail is parsed back and names
// the field, the hybrid, a root index and the guidance note. Access: the rep serving the account sends,
// the grower may read but not send (403), another farm's rep sees nothing (404). Fixture rows live
// under a fixture field of Alder Creek Farms (rep1 serves it, grower1 owns it) and are removed after.
import { createHash, randomUUID } from "node:crypto";
import { DeleteObjectCommand } from "@aws-sdk/client-s3";
import type { Kysely } from "kysely";
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDb } from "@/db/client";
import type { Database } from "@/db/schema";
import { DEMO_USERS } from "@/db/seed/demo-users";
import { bucket, getObjectBytes, putObject, s3 } from "@/lib/storage/s3";
import { testEnv } from "../helpers/env";
import { type CaughtMail, waitForMail } from "../helpers/mailbox";
import { type ApiClient, signedInAs } from "../helpers/session";

const suffix = randomUUID().slice(0, 8);
const FIELD_NAME = `Report Fixture North ${suffix}`;
const HYBRID = `RX ${suffix} 108-day`;
const SITE_INDEX = 73.4;
const PLANT_INDICES = [71.2, 75.6];
const RECOMMENDATION = `Hold the side-dress until the next dig (${suffix}).`;
const PHOTO_CAPTION = `band beside the row ${suffix}`;
// A 1×1 PNG.
const PNG = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==",
  "base64",
);
const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");
const email = (key: string) => DEMO_USERS.find((u) => u.key === key)!.email;

let db: Kysely<Database>;
const fx = {
  accountId: "",
  fieldId: "",
  plantingId: "",
  productId: "",
  digSiteId: "",
  photoKey: `report-test/${suffix}/photo.png`,
};
const objectKeys: string[] = [];

interface MaildevMail extends CaughtMail {
  attachments?: { fileName?: string; generatedFileName?: string; contentType: string; length?: number }[];
}

beforeAll(async () => {
  db = createDb(testEnv.databaseUrl, 2);
  const rep1 = await db
    .selectFrom("appUser")
    .select("id")
    .where("email", "=", email("rep1"))
    .executeTakeFirstOrThrow();
  fx.accountId = (
    await db
      .selectFrom("account")
      .select("id")
      .where("name", "=", "Alder Creek Farms")
      .executeTakeFirstOrThrow()
  ).id;
  fx.productId = (
    await db
      .insertInto("product")
      .values({
        name: `report fixture ammonium polyphosphate 10-34-0 ${suffix}`,
        chemistry: "ammonium polyphosphate solution",
        form: "liquid",
        gradeN: 10,
        gradeP2o5: 34,
        gradeK2o: 0,
        lbPerGal: 11.65,
        densitySource: "report fixture",
        active: false,
      })
      .returning("id")
      .executeTakeFirstOrThrow()
  ).id;
  fx.fieldId = randomUUID();
  fx.plantingId = randomUUID();
  fx.digSiteId = randomUUID();
  await db
    .insertInto("field")
    .values({ id: fx.fieldId, accountId: fx.accountId, name: FIELD_NAME, areaAcres: 40 })
    .execute();
  await db
    .insertInto("planting")
    .values({
      id: fx.plantingId,
      fieldId: fx.fieldId,
      accountId: fx.accountId,
      hybrid: HYBRID,
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
      id: randomUUID(),
      fieldId: fx.fieldId,
      plantingId: fx.plantingId,
      accountId: fx.accountId,
      productId: fx.productId,
      appliedOn: "2026-04-20",
      rate: 5,
      rateUnit: "gal/ac",
      placement: "seed_placed",
    })
    .execute();
  await db
    .insertInto("digSite")
    .values({
      id: fx.digSiteId,
      fieldId: fx.fieldId,
      plantingId: fx.plantingId,
      accountId: fx.accountId,
      repId: rep1.id,
      dugAt: new Date("2026-05-14T16:00:00Z"),
      rootIndex: SITE_INDEX,
      recommendation: RECOMMENDATION,
    })
    .execute();
  await db
    .insertInto("dugPlant")
    .values(
      PLANT_INDICES.map((rootIndex, position) => ({
        id: randomUUID(),
        digSiteId: fx.digSiteId,
        position,
        leafStage: "V3",
        rootIndex,
      })),
    )
    .execute();
  await putObject(fx.photoKey, PNG, "image/png");
  objectKeys.push(fx.photoKey);
  await db
    .insertInto("photo")
    .values({
      id: randomUUID(),
      digSiteId: fx.digSiteId,
      sha256: sha256(PNG),
      byteSize: PNG.byteLength,
      contentType: "image/png",
      caption: PHOTO_CAPTION,
      objectKey: fx.photoKey,
      confirmedAt: new Date(),
    })
    .execute();
});

afterAll(async () => {
  const reports = await db
    .selectFrom("fieldReport")
    .select("objectKey")
    .where("fieldId", "=", fx.fieldId)
    .execute();
  objectKeys.push(...reports.map((r) => r.objectKey));
  await db.deleteFrom("fieldReport").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("photo").where("digSiteId", "=", fx.digSiteId).execute();
  await db.deleteFrom("dugPlant").where("digSiteId", "=", fx.digSiteId).execute();
  await db.deleteFrom("injuryCase").where("digSiteId", "=", fx.digSiteId).execute();
  await db.deleteFrom("digSite").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("fertilizerPass").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("planting").where("fieldId", "=", fx.fieldId).execute();
  await db.deleteFrom("field").where("id", "=", fx.fieldId).execute();
  await db.deleteFrom("product").where("id", "=", fx.productId).execute();
  for (const Key of objectKeys) await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key }));
  await db.destroy();
});

const pdfText = async (bytes: Uint8Array) => {
  // pdf.js takes over (detaches) the buffer it is given, so it gets a copy.
  const parser = new PDFParse({ data: bytes.slice() });
  try {
    return (await parser.getText()).text.replace(/\s+/g, " ");
  } finally {
    await parser.destroy();
  }
};

describe("field report", () => {
  let rep1: ApiClient;
  let grower1: ApiClient;
  let rep2: ApiClient;

  beforeAll(async () => {
    [rep1, grower1, rep2] = await Promise.all([
      signedInAs("rep1"),
      signedInAs("grower1"),
      signedInAs("rep2"),
    ]);
  });

  it("sends the PDF to the grower: attachment parses and names the field, hybrid, root index and guidance; the bucket holds the same bytes; the row is sent", async () => {
    const res = await rep1.fetch(`/api/fields/${fx.fieldId}/reports`, { method: "POST" });
    expect(res.status).toBe(201);
    const { report } = (await res.json()) as {
      report: { id: string; status: string; recipients: string[]; sha256: string; byteSize: number };
    };
    expect(report.status).toBe("sent");
    expect(report.recipients).toEqual([email("grower1")]);

    const mails = (await waitForMail(email("grower1"), 1)) as MaildevMail[];
    const mail = mails.find((m) => m.subject.includes(FIELD_NAME));
    expect(mail, "an e-mail about the fixture field").toBeDefined();
    expect(mail!.text).toContain(`${testEnv.appUrl.replace(/\/$/, "")}/fields/${fx.fieldId}/report`);
    const attachment = mail!.attachments?.find((a) => a.contentType === "application/pdf");
    expect(attachment, "a PDF attachment").toBeDefined();
    const fileName = attachment!.generatedFileName ?? attachment!.fileName!;
    const download = await fetch(
      `${testEnv.mailApi}/api/email/${mail!.id}/attachment/${encodeURIComponent(fileName)}`,
    );
    expect(download.status).toBe(200);
    const attached = new Uint8Array(await download.arrayBuffer());
    expect(Buffer.from(attached.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
    expect(sha256(attached)).toBe(report.sha256);

    const text = await pdfText(attached);
    expect(text).toContain(FIELD_NAME);
    expect(text).toContain(HYBRID);
    expect(text).toContain(SITE_INDEX.toFixed(1));
    // Root index by hybrid: n = 2, the arithmetic mean of the plants' indices (worked here by hand).
    expect(text).toContain(((PLANT_INDICES[0]! + PLANT_INDICES[1]!) / 2).toFixed(1));
    expect(text).toContain("Computed rates and limits are guidance");
    expect(text).toContain("licensed adviser");
    expect(text).toContain("Call 811");
    expect(text).toContain(RECOMMENDATION);
    expect(text).toContain(PHOTO_CAPTION);

    const row = await db
      .selectFrom("fieldReport")
      .selectAll()
      .where("id", "=", report.id)
      .executeTakeFirstOrThrow();
    expect(row).toMatchObject({
      fieldId: fx.fieldId,
      accountId: fx.accountId,
      status: "sent",
      error: null,
      recipients: [email("grower1")],
      objectKey: `reports/${report.id}.pdf`,
      byteSize: attached.byteLength,
    });
    expect(row.sentAt).not.toBeNull();
    const stored = await getObjectBytes(row.objectKey);
    expect(sha256(stored)).toBe(row.sha256);
  });

  it("lets the grower read the report and download the stored PDF, and keeps both from another farm", async () => {
    const page = await grower1.fetch(`/fields/${fx.fieldId}/report`);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain(FIELD_NAME);
    // The button, not the string in the page's message catalog.
    const sendButton = /<button[^>]*>Send to grower<\/button>/;
    expect(html).not.toMatch(sendButton);
    expect(await rep1.fetch(`/fields/${fx.fieldId}/report`).then((r) => r.text())).toMatch(sendButton);

    const pdf = await grower1.fetch(`/api/fields/${fx.fieldId}/report`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(await pdfText(new Uint8Array(await pdf.arrayBuffer()))).toContain(HYBRID);

    const listing = await grower1.fetch("/reports").then((r) => r.text());
    expect(listing).toContain(FIELD_NAME);
    expect(await rep2.fetch("/reports").then((r) => r.text())).not.toContain(FIELD_NAME);

    const row = await db
      .selectFrom("fieldReport")
      .selectAll()
      .where("fieldId", "=", fx.fieldId)
      .executeTakeFirstOrThrow();
    const link = await grower1.fetch(`/api/reports/${row.id}`);
    expect(link.status).toBe(303);
    const stored = await fetch(link.headers.get("location")!);
    expect(stored.status).toBe(200);
    expect(sha256(new Uint8Array(await stored.arrayBuffer()))).toBe(row.sha256);

    expect((await rep2.fetch(`/api/reports/${row.id}`)).status).toBe(404);
    expect((await rep2.fetch(`/api/fields/${fx.fieldId}/report`)).status).toBe(404);
    // The page streams behind the field's loading state, so its refusal shows as the not-found body.
    expect(await rep2.fetch(`/fields/${fx.fieldId}/report`).then((r) => r.text())).not.toContain(FIELD_NAME);
  });

  it("refuses to send for the grower (403), another farm's rep (404) and a malformed id (404), sending nothing", async () => {
    const before = await db
      .selectFrom("fieldReport")
      .select("id")
      .where("fieldId", "=", fx.fieldId)
      .execute();
    const grower = await grower1.fetch(`/api/fields/${fx.fieldId}/reports`, { method: "POST" });
    expect(grower.status).toBe(403);
    const other = await rep2.fetch(`/api/fields/${fx.fieldId}/reports`, { method: "POST" });
    expect(other.status).toBe(404);
    expect((await rep1.fetch("/api/fields/not-a-uuid/reports", { method: "POST" })).status).toBe(404);
    expect((await rep1.fetch(`/api/fields/${randomUUID()}/reports`, { method: "POST" })).status).toBe(404);
    const after = await db.selectFrom("fieldReport").select("id").where("fieldId", "=", fx.fieldId).execute();
    expect(after.length).toBe(before.length);
  });

  it("re-sends a failed report from the stored PDF and records it as sent", async () => {
    const row = await db
      .selectFrom("fieldReport")
      .selectAll()
      .where("fieldId", "=", fx.fieldId)
      .executeTakeFirstOrThrow();
    await db
      .updateTable("fieldReport")
      .set({ status: "failed", error: "connection refused", sentAt: null })
      .where("id", "=", row.id)
      .execute();
    expect((await grower1.fetch(`/api/reports/${row.id}/resend`, { method: "POST" })).status).toBe(403);
    const res = await rep1.fetch(`/api/reports/${row.id}/resend`, { method: "POST" });
    expect(res.status).toBe(200);
    const after = await db
      .selectFrom("fieldReport")
      .selectAll()
      .where("id", "=", row.id)
      .executeTakeFirstOrThrow();
    expect(after).toMatchObject({ status: "sent", error: null, sha256: row.sha256 });
    const mails = (await waitForMail(email("grower1"), 2)) as MaildevMail[];
    expect(mails.filter((m) => m.subject.includes(FIELD_NAME)).length).toBeGreaterThanOrEqual(2);
  });
});
