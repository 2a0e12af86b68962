import "server-only";
import { createTranslator } from "next-intl";
import type { Role } from "@/db/schema";
import { env } from "@/lib/env";
import { loadMessages } from "@/lib/i18n/messages";
import type { Mail } from "./transport";

// The e-mails Trenchbook sends: a plain-text part and a simple HTML part with one button. Links are
// absolute, built from APP_URL, because the mail is read outside the app.

export function appLink(path: string): string {
  return new URL(path, env.APP_URL.endsWith("/") ? env.APP_URL : `${env.APP_URL}/`).toString();
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

interface Parts {
  to: string;
  subject: string;
  greeting: string;
  body: string;
  action: string;
  link: string;
  expiry: string;
  ignore: string;
  signature: string;
  linkFallback: string;
  app: string;
}

function compose(p: Parts): Mail {
  const text = [p.greeting, "", p.body, "", p.link, "", p.expiry, p.ignore, "", p.signature, ""].join("\n");
  const e = escapeHtml;
  const html = `<!doctype html>
<html lang="en">
<body style="margin:0;padding:24px;background:#faf7f2;color:#2a2016;font-family:system-ui,sans-serif;font-size:16px;line-height:1.5">
<div style="max-width:560px;margin:0 auto;background:#ffffff;border:1px solid #e2d5bf;border-radius:14px;padding:24px">
<p style="margin:0 0 16px;font-size:22px;font-weight:700;color:#245c30">${e(p.app)}</p>
<p>${e(p.greeting)}</p>
<p>${e(p.body)}</p>
<p style="margin:24px 0"><a href="${e(p.link)}" style="display:inline-block;background:#245c30;color:#ffffff;font-weight:600;text-decoration:none;padding:12px 20px;border-radius:14px">${e(p.action)}</a></p>
<p>${e(p.expiry)}</p>
<p style="font-size:14px;color:#5a4529">${e(p.linkFallback)}<br><a href="${e(p.link)}" style="color:#174f78;word-break:break-all">${e(p.link)}</a></p>
<p style="font-size:14px;color:#5a4529">${e(p.ignore)}</p>
<p>${e(p.signature)}</p>
</div>
</body>
</html>
`;
  return { to: p.to, subject: p.subject, text, html };
}

async function translators() {
  const messages = await loadMessages("en");
  return {
    t: createTranslator({ locale: "en", messages, namespace: "auth.mail" }),
    common: createTranslator({ locale: "en", messages, namespace: "common" }),
  };
}

export async function invitationMail(input: {
  to: string;
  name: string;
  role: Role;
  inviterName: string;
  token: string;
  ttlHours: number;
}): Promise<Mail> {
  const { t, common } = await translators();
  const app = common("appName");
  return compose({
    to: input.to,
    app,
    subject: t("invite.subject", { app }),
    greeting: t("greeting", { name: input.name }),
    body: t("invite.body", { app, inviter: input.inviterName, role: common(`roles.${input.role}`) }),
    action: t("invite.action"),
    link: appLink(`invite/${encodeURIComponent(input.token)}`),
    expiry: t("invite.expiry", { hours: input.ttlHours }),
    ignore: t("invite.ignore"),
    signature: t("signature", { app }),
    linkFallback: t("linkFallback"),
  });
}

export async function passwordResetMail(input: {
  to: string;
  name: string;
  token: string;
  ttlMinutes: number;
}): Promise<Mail> {
  const { t, common } = await translators();
  const app = common("appName");
  return compose({
    to: input.to,
    app,
    subject: t("reset.subject", { app }),
    greeting: t("greeting", { name: input.name }),
    body: t("reset.body", { app }),
    action: t("reset.action"),
    link: appLink(`reset-password/${encodeURIComponent(input.token)}`),
    expiry: t("reset.expiry", { minutes: input.ttlMinutes }),
    ignore: t("reset.ignore"),
    signature: t("signature", { app }),
    linkFallback: t("linkFallback"),
  });
}
