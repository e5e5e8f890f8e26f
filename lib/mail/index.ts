/**
 * Outgoing mail over SMTP (nodemailer). In development and tests the SMTP server is the local
 * mail sink (maildev on 127.0.0.1:1025, web UI on :1080). MAIL_TRANSPORT=json keeps messages in
 * memory instead (unit tests), readable through `outbox()`.
 */
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

export interface Mail {
  to: string;
  subject: string;
  /** Plain-text body; the HTML body is derived from it unless given. */
  text: string;
  html?: string;
}

interface Holder {
  transport?: Transporter;
  outbox: Mail[];
}
const holder: Holder = ((globalThis as { __loopwrightMail?: Holder }).__loopwrightMail ??= { outbox: [] });

function transport(): Transporter {
  if (holder.transport) return holder.transport;
  const e = env();
  holder.transport =
    e.MAIL_TRANSPORT === "json"
      ? nodemailer.createTransport({ jsonTransport: true })
      : nodemailer.createTransport({
          host: e.SMTP_HOST,
          port: e.SMTP_PORT,
          secure: e.SMTP_SECURE === "true",
          auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? "" } : undefined,
          // The local sink speaks plain SMTP; a real relay negotiates STARTTLS itself.
          ignoreTLS: e.SMTP_HOST === "127.0.0.1" || e.SMTP_HOST === "localhost",
          connectionTimeout: 5000,
          greetingTimeout: 5000,
        });
  return holder.transport;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);
}

/** A minimal HTML rendering of a plain-text mail: paragraphs, links made clickable. */
function htmlFromText(text: string): string {
  const body = text
    .split(/\n{2,}/)
    .map((p) => `<p>${escapeHtml(p).replace(/\n/g, "<br>").replace(/(https?:\/\/[^\s<]+)/g, '<a href="$1">$1</a>')}</p>`)
    .join("\n");
  return `<div style="font-family:Inter,Helvetica,Arial,sans-serif;color:#2a2c2e;line-height:1.5;max-width:560px">${body}<p style="color:#75736d;font-size:12px">Loopwright</p></div>`;
}

/** Send one mail. Resolves true when handed to the server; false (logged) when it could not be. */
export async function sendMail(mail: Mail): Promise<boolean> {
  try {
    await transport().sendMail({ from: env().MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html ?? htmlFromText(mail.text) });
    if (env().MAIL_TRANSPORT === "json") holder.outbox.push(mail);
    return true;
  } catch (err) {
    console.error(`[loopwright] mail to ${mail.to} failed:`, err instanceof Error ? err.message : err);
    return false;
  }
}

/** Messages "sent" with MAIL_TRANSPORT=json (tests). */
export function outbox(): Mail[] {
  return holder.outbox;
}
