import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { getTranslations } from "next-intl/server";
import {
  createFieldReport,
  type FieldReportListing,
  findFieldReport,
  listAccountGrowerEmails,
  setFieldReportStatus,
} from "@/db/queries/reports";
import type { FieldReport as FieldReportRow } from "@/db/schema";
import { appLink } from "@/lib/mail/templates";
import { sendMail } from "@/lib/mail/transport";
import { getObjectBytes, putObject } from "@/lib/storage/s3";
import type { FieldReport } from "./field-report";
import { renderFieldReportPdf } from "./field-report-pdf";

// Sending a field report: the PDF is stored first (reports/<id>.pdf), the row records it as
// 'sending', then the e-mail goes to the account's growers and the row becomes 'sent' or 'failed'
// with the error. A failed report is sent again from the stored PDF, so the grower gets the same file.

export type SendOutcome = { ok: true; report: FieldReportRow } | { ok: false; reason: "noGrower" };

export const reportObjectKey = (id: string) => `reports/${id}.pdf`;
export const reportFileName = (fieldName: string, day: string) =>
  `field-report-${fieldName.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "") || "field"}-${day}.pdf`;

async function deliver(
  row: FieldReportRow,
  bytes: Uint8Array,
  names: { field: string; account: string; sender: string },
): Promise<FieldReportRow> {
  const t = await getTranslations({ locale: "en", namespace: "reports" });
  const url = appLink(`/fields/${row.fieldId}/report`);
  try {
    await sendMail({
      to: row.recipients.join(", "),
      subject: t("mail.subject", { field: names.field, account: names.account }),
      text: t("mail.text", { field: names.field, account: names.account, url, sender: names.sender }),
      attachments: [
        {
          filename: reportFileName(names.field, row.createdAt.toISOString().slice(0, 10)),
          content: Buffer.from(bytes),
          contentType: "application/pdf",
        },
      ],
    });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    console.error(`[reports] sending report ${row.id} failed:`, err);
    return (await setFieldReportStatus(row.id, "failed", { error: message.slice(0, 500) })) ?? row;
  }
  return (await setFieldReportStatus(row.id, "sent")) ?? row;
}

/** Renders, stores and e-mails the report to the account's active growers (the caller checked `can`). */
export async function sendFieldReport(
  report: FieldReport,
  sender: { id: string; name: string },
): Promise<SendOutcome> {
  const recipients = await listAccountGrowerEmails(report.field.accountId);
  if (recipients.length === 0) return { ok: false, reason: "noGrower" };
  const bytes = await renderFieldReportPdf(report, sender.name);
  const id = randomUUID();
  const objectKey = reportObjectKey(id);
  await putObject(objectKey, bytes, "application/pdf");
  const row = await createFieldReport({
    id,
    fieldId: report.field.id,
    accountId: report.field.accountId,
    createdBy: sender.id,
    objectKey,
    byteSize: bytes.byteLength,
    sha256: createHash("sha256").update(bytes).digest("hex"),
    recipients,
  });
  const sent = await deliver(row, bytes, {
    field: report.field.name,
    account: report.field.accountName,
    sender: sender.name,
  });
  return { ok: true, report: sent };
}

/**
 * Sends a stored report again to the account's current growers (a failed send, or a grower who lost
 * the e-mail). The caller checked that the actor may write the report's field.
 */
export async function resendFieldReport(
  listing: Pick<FieldReportListing, "id" | "fieldName" | "accountName">,
  sender: { name: string },
): Promise<SendOutcome> {
  const row = await findFieldReport(listing.id);
  if (!row) throw new Error(`No report ${listing.id}`);
  const recipients = await listAccountGrowerEmails(row.accountId);
  if (recipients.length === 0) return { ok: false, reason: "noGrower" };
  const bytes = await getObjectBytes(row.objectKey);
  const sending = (await setFieldReportStatus(row.id, "sending", { recipients })) ?? row;
  const sent = await deliver(sending, bytes, {
    field: listing.fieldName,
    account: listing.accountName,
    sender: sender.name,
  });
  return { ok: true, report: sent };
}
