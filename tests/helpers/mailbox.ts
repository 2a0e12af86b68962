// Reads the SMTP fake's inbox through its REST API (GET /api/email, DELETE /api/email/all).
import { testEnv } from "./env";

export interface CaughtMail {
  id: string;
  subject: string;
  to: { address: string; name?: string }[];
  text: string;
  html: string;
}

export async function clearMailbox(): Promise<void> {
  const res = await fetch(`${testEnv.mailApi}/api/email/all`, { method: "DELETE" });
  if (!res.ok) throw new Error(`Clearing the mailbox failed: ${res.status}`);
}

export async function listMail(): Promise<CaughtMail[]> {
  const res = await fetch(`${testEnv.mailApi}/api/email`);
  if (!res.ok) throw new Error(`Reading the mailbox failed: ${res.status}`);
  return (await res.json()) as CaughtMail[];
}

export async function mailTo(address: string): Promise<CaughtMail[]> {
  const want = address.toLowerCase();
  return (await listMail()).filter((m) => m.to.some((t) => t.address.toLowerCase() === want));
}

// Waits until `count` messages to the address have arrived and returns them, oldest first.
export async function waitForMail(address: string, count = 1, timeoutMs = 15_000): Promise<CaughtMail[]> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = await mailTo(address);
    if (found.length >= count) return found;
    if (Date.now() > deadline)
      throw new Error(`Expected ${count} e-mail(s) to ${address}, found ${found.length}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

// The one-time link for `path` ("invite" or "reset-password") in the plain-text part.
export function linkIn(mail: CaughtMail, path: "invite" | "reset-password"): { url: string; token: string } {
  const base = testEnv.appUrl.replace(/\/$/, "");
  const escaped = `${base}/${path}/`.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const match = mail.text.match(new RegExp(`${escaped}([A-Za-z0-9_-]+)`));
  if (!match) throw new Error(`No ${path} link in the e-mail "${mail.subject}"`);
  return { url: match[0], token: match[1]! };
}
