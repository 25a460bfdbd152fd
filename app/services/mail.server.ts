import nodemailer, { type Transporter } from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import { env } from "~/utils/env.server";

let transport: Transporter | undefined;

function transporter(): Transporter {
  const url = env().SMTP_URL;
  if (!url) throw new Error("SMTP_URL is not set: e-mail cannot be sent");
  // The local capture speaks plain SMTP on loopback; a real relay's URL carries its own TLS settings.
  const options: SMTPTransport.Options | string = url.startsWith("smtp://127.0.0.1") ? { url, secure: false, ignoreTLS: true } : url;
  transport ??= nodemailer.createTransport(options);
  return transport;
}

/** Names the organisation a message is about, for the local mailbox page (an admin reads the organisation's). */
export const ORGANISATION_HEADER = "X-Spanwright-Organisation";

export interface Mail {
  to: string;
  /** The organisation whose work the message is about. */
  organisationId: string;
  subject: string;
  /** Plain-text body; the HTML version is built from the same paragraphs. */
  paragraphs: string[];
  link?: { href: string; label: string };
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** Sends one message with plain-text and HTML versions. Messages carry links, never secrets beyond a one-time link. */
export async function sendMail(mail: Mail): Promise<void> {
  const text = [...mail.paragraphs, ...(mail.link ? [`${mail.link.label}: ${mail.link.href}`] : []), "— Spanwright"].join("\n\n");
  const html = [
    ...mail.paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`),
    ...(mail.link ? [`<p><a href="${escapeHtml(mail.link.href)}">${escapeHtml(mail.link.label)}</a></p>`] : []),
    "<p>— Spanwright</p>",
  ].join("\n");
  await transporter().sendMail({ from: env().MAIL_FROM, to: mail.to, subject: mail.subject, text, html, headers: { [ORGANISATION_HEADER]: mail.organisationId } });
}
