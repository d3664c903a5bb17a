// Outgoing mail for every process (web invitations, worker notifications): nodemailer over SMTP,
// to the demo's local sink by default or to `SMTP_URL`.
import nodemailer, { type Transporter } from "nodemailer";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export const MAIL_FROM = process.env.MAIL_FROM ?? "Tidewell <alerts@tidewell.local>";

let transporter: Transporter | null = null;

function transport(): Transporter {
  transporter ??= nodemailer.createTransport(process.env.SMTP_URL ?? "smtp://127.0.0.1:2525", { from: MAIL_FROM });
  return transporter;
}

/** Sends one mail; resolves with the server's message id or rejects with the SMTP error. */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  const info = await transport().sendMail({ from: MAIL_FROM, ...mail });
  return info.messageId;
}

/** Base URL for deep links in mail. */
export function appUrl(): string {
  return (process.env.APP_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
}
