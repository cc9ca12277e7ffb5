// Local stand-in for an SMTP relay: accepts every message on 127.0.0.1 and stores it as
// JSON in MAIL_DIR, where /dev/mail and the tests read it. Started by start.sh and test.sh.
import { mkdir, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";

const port = Number(process.env.SMTP_PORT ?? 2525);
const dir = process.env.MAIL_DIR ?? ".data/mail";
await mkdir(dir, { recursive: true });

const addresses = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((x) => x.value.map((v) => v.address ?? ""));

let counter = 0;
const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS", "AUTH"],
  logger: false,
  onData(stream, _session, callback) {
    simpleParser(stream)
      .then(async (mail) => {
        const receivedAt = new Date().toISOString();
        const id = `${receivedAt.replace(/[:.]/g, "-")}-${process.pid}-${++counter}`;
        const record = {
          id,
          receivedAt,
          from: mail.from?.text ?? "",
          to: addresses(mail.to),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
          html: typeof mail.html === "string" ? mail.html : "",
        };
        // Write then rename, so a reader never sees half a message.
        await writeFile(path.join(dir, `${id}.tmp`), JSON.stringify(record, null, 2));
        await rename(path.join(dir, `${id}.tmp`), path.join(dir, `${id}.json`));
        callback();
      })
      .catch((err: Error) => callback(err));
  },
});
server.listen(port, "127.0.0.1", () => console.log(`[mail] fake SMTP on 127.0.0.1:${port}, storing in ${dir}`));
const stop = () => server.close(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
