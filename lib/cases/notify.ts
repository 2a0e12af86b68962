import "server-only";
import { findCaseNoticeContext } from "@/db/queries/case-actions";
import { type CaseNotice, caseNoticeMails } from "@/lib/mail/case-templates";
import { sendMail } from "@/lib/mail/transport";

/**
 * Sends the e-mails of a case notice. Called only AFTER the change committed (a push that opened
 * cases, a decision, a share), so nobody is told of a change that rolled back. Never throws: the
 * change stands whether or not the mail server takes the message; a failure is logged.
 */
export async function notifyCase(notice: CaseNotice, caseId: string): Promise<void> {
  try {
    const context = await findCaseNoticeContext(caseId);
    if (!context) return;
    for (const mail of await caseNoticeMails(notice, context)) {
      try {
        await sendMail(mail);
      } catch (err) {
        console.error(`[mail] case ${notice} notice for ${caseId} to ${mail.to} failed:`, err);
      }
    }
  } catch (err) {
    console.error(`[mail] case ${notice} notice for ${caseId} failed:`, err);
  }
}

/** The notices for the cases a sync push opened (the region's supervisors), after its commit. */
export async function notifyOpenedCases(caseIds: readonly string[]): Promise<void> {
  for (const id of caseIds) await notifyCase("opened", id);
}
