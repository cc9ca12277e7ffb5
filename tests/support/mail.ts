import { readMailbox, type StoredMail } from "../../app/utils/mailbox.server";

/** Waits for a message to `to` in the local fake SMTP's store and returns it. */
export async function waitForMail(to: string, subjectIncludes: string, timeoutMs = 10_000): Promise<StoredMail> {
  const dir = process.env.MAIL_DIR ?? ".data/mail-test";
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const mail = (await readMailbox(dir)).find((m) => m.to.includes(to) && m.subject.includes(subjectIncludes));
    if (mail) return mail;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No mail to ${to} with "${subjectIncludes}" within ${timeoutMs} ms`);
}

export function firstLink(text: string): URL {
  const m = text.match(/https?:\/\/\S+/);
  if (!m) throw new Error(`No link in mail: ${text}`);
  return new URL(m[0]);
}
