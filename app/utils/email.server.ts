import nodemailer from "nodemailer";
import { getEnv } from "./env.server";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

let transport: ReturnType<typeof nodemailer.createTransport> | undefined;

/**
 * Sends through SMTP now; on a developer's machine that SMTP is the local fake
 * (scripts/fake-smtp.ts). Application code enqueues through the outbox (services/outbox.server.ts),
 * which calls this and retries.
 */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  const env = getEnv();
  transport ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    ignoreTLS: env.DUSKLINE_LOCAL,
    // Fail fast when the relay hangs; the outbox retries.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
  await transport.sendMail({ from: env.MAIL_FROM, ...mail });
}
