// E-mail through an outbox table: a message is written in the transaction of the change it
// reports and sent after commit, so SMTP being down never loses a state change or a message.
// A drain runs after each enqueue and on a timer in the server process (started lazily).
import { Op, type Transaction } from "sequelize";
import { OutboxMessage } from "../../db/models";
import { retryDelayMs } from "../../lib/retry";
import { db } from "../utils/db.server";
import { sendMail, type OutgoingMail } from "../utils/email.server";
import { createDrainer } from "../utils/drainer.server";

const TICK_MS = 5_000;
const BATCH = 20;

export async function enqueueMail(mail: OutgoingMail & { organisationId?: number | null }, transaction?: Transaction): Promise<void> {
  db();
  await OutboxMessage.create(
    { organisationId: mail.organisationId ?? null, toAddress: mail.to, subject: mail.subject, text: mail.text, html: mail.html ?? null, nextAttemptAt: new Date() },
    { transaction },
  );
  if (transaction) transaction.afterCommit(() => void kickOutbox());
  else void kickOutbox();
}

/** Sends the due messages once; each is claimed with a row lock so two processes never send it twice. */
export async function drainOutbox(): Promise<{ sent: number; failed: number }> {
  const sequelize = db();
  let sent = 0;
  let failed = 0;
  for (;;) {
    const batch = await sequelize.transaction(async (transaction) => {
      const due = await OutboxMessage.findAll({
        where: { status: "pending", nextAttemptAt: { [Op.lte]: new Date() } },
        order: [["nextAttemptAt", "ASC"], ["id", "ASC"]],
        limit: BATCH,
        lock: transaction.LOCK.UPDATE,
        skipLocked: true,
        transaction,
      });
      for (const message of due) {
        try {
          await sendMail({ to: message.toAddress, subject: message.subject, text: message.text, ...(message.html ? { html: message.html } : {}) });
          await message.update({ status: "sent", sentAt: new Date(), attempts: message.attempts + 1, lastError: null }, { transaction });
          sent++;
        } catch (error) {
          const attempts = message.attempts + 1;
          await message.update({ attempts, lastError: String((error as Error).message ?? error).slice(0, 2000), nextAttemptAt: new Date(Date.now() + retryDelayMs(attempts)) }, { transaction });
          failed++;
        }
      }
      return due.length;
    });
    // A failure means SMTP is probably down: wait for the next tick rather than spin.
    if (batch < BATCH || failed > 0) return { sent, failed };
  }
}

const drainer = createDrainer("outbox", drainOutbox, TICK_MS);

/** Starts a drain now (or queues one after the drain in progress). */
export const kickOutbox = drainer.kick;

/** The retry timer of this server process; idempotent, and it never keeps the process alive. */
export const startOutboxTimer = drainer.start;

export async function outboxStatus(organisationId: number) {
  db();
  const [pending, sent] = await Promise.all([
    OutboxMessage.count({ where: { organisationId, status: "pending" } }),
    OutboxMessage.count({ where: { organisationId, status: "sent" } }),
  ]);
  return { pending, sent };
}

/** Stops the retry timer and waits for a drain in progress (graceful shutdown). */
export const stopOutbox = drainer.stop;
