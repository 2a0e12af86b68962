import "server-only";
import { createTranslator } from "next-intl";
import type { CaseNoticeContext, Recipient } from "@/db/queries/case-actions";
import { loadMessages } from "@/lib/i18n/messages";
import { appLink } from "./templates";
import type { Mail } from "./transport";

// The injury case e-mails (strings in lib/i18n/messages/en/caseMail.json): to the region's
// supervisors on a new case, to the rep on a decision, to the grower when a case is shared. A plain
// text part and a simple HTML part, each with an absolute link back to the case page.

export type CaseNotice = "opened" | "decided" | "shared";

export function caseLink(caseId: string): string {
  return appLink(`cases/${encodeURIComponent(caseId)}`);
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

// The dig's day as the server reckons it (UTC), e.g. "May 14, 2026".
const dayFormat = new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeZone: "UTC" });

interface Parts {
  to: string;
  subject: string;
  greeting: string;
  body: string;
  why: string | null;
  action: string;
  link: string;
  linkFallback: string;
  signature: string;
  app: string;
}

function compose(p: Parts): Mail {
  const text = [p.greeting, "", p.body, ...(p.why ? ["", p.why] : []), "", p.link, "", p.signature, ""].join(
    "\n",
  );
  const e = escapeHtml;
  const html = `<!doctype html>
<html lang="en">
<body style="margin:0;padding:24px;background:#faf7f2;color:#2a2016;font-family:system-ui,sans-serif;font-size:16px;line-height:1.5">
<div style="max-width:560px;margin:0 auto;background:#ffffff;border:1px solid #e2d5bf;border-radius:14px;padding:24px">
<p style="margin:0 0 16px;font-size:22px;font-weight:700;color:#245c30">${e(p.app)}</p>
<p>${e(p.greeting)}</p>
<p>${e(p.body)}</p>
${p.why ? `<p style="white-space:pre-wrap">${e(p.why)}</p>\n` : ""}<p style="margin:24px 0"><a href="${e(p.link)}" style="display:inline-block;background:#245c30;color:#ffffff;font-weight:600;text-decoration:none;padding:12px 20px;border-radius:14px">${e(p.action)}</a></p>
<p style="font-size:14px;color:#5a4529">${e(p.linkFallback)}<br><a href="${e(p.link)}" style="color:#174f78;word-break:break-all">${e(p.link)}</a></p>
<p>${e(p.signature)}</p>
</div>
</body>
</html>
`;
  return { to: p.to, subject: p.subject, text, html };
}

/** The e-mails of one notice about a case, one per recipient (none when nobody is to be told). */
export async function caseNoticeMails(notice: CaseNotice, c: CaseNoticeContext): Promise<Mail[]> {
  const messages = await loadMessages("en");
  const t = createTranslator({ locale: "en", messages, namespace: "caseMail" });
  const app = createTranslator({ locale: "en", messages, namespace: "common" })("appName");
  const severity = t(`severity.${c.severity}`);
  const decision = c.decision ? t(`decision.${c.decision}`) : "";
  const values = {
    account: c.accountName,
    field: c.fieldName,
    dugOn: dayFormat.format(c.dugAt),
    rep: c.repName ?? t("unknownRep"),
    severity,
    decision,
  };
  const recipients: Recipient[] =
    notice === "opened" ? c.supervisors : notice === "decided" ? c.reps : c.growers;
  const why =
    notice === "opened"
      ? c.openedBody
        ? t("opened.why", { reasons: c.openedBody })
        : null
      : notice === "decided"
        ? t("decided.why", { reason: c.decisionReason ?? "" })
        : t("shared.why", { status: t(`status.${c.status}`) });
  return recipients.map((r) =>
    compose({
      to: r.email,
      app,
      subject: t(`${notice}.subject`, values),
      greeting: t("greeting", { name: r.name }),
      body: t(`${notice}.body`, values),
      why,
      action: t(`${notice}.action`),
      link: caseLink(c.caseId),
      linkFallback: t("linkFallback"),
      signature: t("signature", { app }),
    }),
  );
}
