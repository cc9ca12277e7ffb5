import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { getEnv } from "./env.server";

export interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  /** The HTML part, when the message has one. */
  html?: string;
}

/** Messages caught by the local fake SMTP server, newest first. */
export async function readMailbox(dir = getEnv().MAIL_DIR): Promise<StoredMail[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  const mails = await Promise.all(names.map(async (n) => JSON.parse(await readFile(path.join(dir, n), "utf8")) as StoredMail));
  return mails.sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id));
}
