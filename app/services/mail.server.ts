import nodemailer, { type Transporter } from "nodemailer";
import { db } from "../../db";
import { env } from "../utils/env.server";

let transporter: Transporter | undefined;

function transport(): Transporter {
  if (transporter) return transporter;
  const e = env();
  transporter = nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASS ?? "" } : undefined,
    // The local fake speaks plain SMTP on loopback; a real server is configured through SMTP_* variables.
    ignoreTLS: !e.SMTP_SECURE && (e.SMTP_HOST === "127.0.0.1" || e.SMTP_HOST === "localhost"),
  });
  return transporter;
}

export type Mail = { to: string; subject: string; text: string; html?: string };

/** Sends one message through SMTP and records it in the outbox table (sent or failed, with the reason). */
export async function sendMail(mail: Mail): Promise<{ ok: boolean }> {
  const { EmailMessage } = db().models;
  try {
    const info = await transport().sendMail({ from: env().MAIL_FROM, ...mail });
    await EmailMessage.create({
      toAddress: mail.to,
      subject: mail.subject,
      textBody: mail.text,
      status: "sent",
      messageId: info.messageId ?? null,
    });
    return { ok: true };
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    console.error(`Mail to ${mail.to} failed: ${reason}`);
    await EmailMessage.create({ toAddress: mail.to, subject: mail.subject, textBody: mail.text, status: "failed", error: reason });
    return { ok: false };
  }
}
