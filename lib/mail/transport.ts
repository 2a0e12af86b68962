import "server-only";
import nodemailer from "nodemailer";
import { env } from "@/lib/env";

export const transport = nodemailer.createTransport({
  host: env.SMTP_HOST,
  port: env.SMTP_PORT,
  secure: false,
  // The local fake speaks plain SMTP on loopback; a hosted service gets credentials and STARTTLS.
  ignoreTLS: !env.SMTP_USER,
  auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? "" } : undefined,
});

export interface Mail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
}

export async function sendMail(mail: Mail) {
  return transport.sendMail({ from: env.MAIL_FROM, ...mail });
}

export async function checkMailServer(): Promise<void> {
  await transport.verify();
}
