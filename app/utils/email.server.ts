import nodemailer from "nodemailer";
import { getEnv } from "./env.server";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
}

let transport: ReturnType<typeof nodemailer.createTransport> | undefined;

/** Sends through SMTP; on a developer's machine that SMTP is the local fake (scripts/fake-smtp.ts). */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  const env = getEnv();
  transport ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    ignoreTLS: env.DUSKLINE_LOCAL,
  });
  await transport.sendMail({ from: env.MAIL_FROM, ...mail });
}
