// Webhooks (issue 12): an organisation's endpoints are told about events. An event writes one
// delivery row per subscribed endpoint, in the transaction of the change it reports, so nothing
// is announced that did not happen and nothing that happened is lost. A dispatcher in every app
// process claims due deliveries (SELECT … FOR UPDATE SKIP LOCKED, then a lease), posts them
// signed (lib/webhooks/signature.ts), and on failure schedules the next attempt with back-off.
// Delivery is at least once: an instance killed mid-post leaves the row to be sent again when
// its lease ends; receivers de-duplicate by the Duskline-Delivery header.
import { randomBytes } from "node:crypto";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { Webhook, WebhookDelivery } from "../../db/models";
import { retryDelayMs } from "../../lib/retry";
import { DELIVERY_HEADER, EVENT_HEADER, SIGNATURE_HEADER, TIMESTAMP_HEADER, signWebhook } from "../../lib/webhooks/signature";
import type { WebhookEvent, WebhookInput } from "../../shared/webhook-schemas";
import { db } from "../utils/db.server";
import { getEnv } from "../utils/env.server";
import { createDrainer } from "../utils/drainer.server";
import { audit, type Actor } from "./audit.server";
import { InputError, NotFoundError } from "./errors.server";

/** Attempts before a delivery is given up (about 2 h of back-off at the default base of 30 s). */
export const MAX_DELIVERY_ATTEMPTS = 8;
/** How long a claimed delivery is held by the instance posting it. */
const LEASE_MS = 60_000;
const POST_TIMEOUT_MS = 10_000;
const BATCH = 10;
const RESPONSE_KEPT_CHARS = 2000;

const LOOPBACK_HOSTS = new Set(["127.0.0.1", "localhost", "[::1]"]);

/** HTTPS anywhere; plain http only to this machine's loopback, and only on a local installation. */
function checkedUrl(raw: string): string {
  let url: URL;
  try {
    url = new URL(raw);
  } catch {
    throw new InputError("Give a full URL, e.g. https://assets.example/duskline-events.", "url", 422);
  }
  if (url.username || url.password) throw new InputError("Leave user names and passwords out of the URL; deliveries are signed instead.", "url", 422);
  if (url.protocol === "https:") return url.toString();
  if (url.protocol === "http:" && LOOPBACK_HOSTS.has(url.hostname) && getEnv().DUSKLINE_LOCAL) return url.toString();
  throw new InputError("Use an https:// URL (plain http is accepted only for this machine's loopback address on a local installation).", "url", 422);
}

export function webhookJson(w: Webhook) {
  return {
    id: w.id,
    url: w.url,
    description: w.description,
    events: w.events,
    active: w.active,
    secretPrefix: `${w.secret.slice(0, 10)}…`,
    createdAt: w.createdAt.toISOString(),
  };
}

export function deliveryJson(d: WebhookDelivery) {
  return {
    id: d.id,
    webhookId: d.webhookId,
    event: d.event,
    state: d.state,
    attempts: d.attempts,
    nextAttemptAt: d.state === "pending" ? (d.nextAttemptAt?.toISOString() ?? null) : null,
    lastStatus: d.lastStatus,
    lastResponse: d.lastResponse,
    lastError: d.lastError,
    lastAttemptAt: d.lastAttemptAt?.toISOString() ?? null,
    deliveredAt: d.deliveredAt?.toISOString() ?? null,
    createdAt: d.createdAt.toISOString(),
  };
}

/** Registers an endpoint; the signing secret is returned here and never again. */
export async function createWebhook(actor: Actor, input: WebhookInput, transaction?: Transaction): Promise<{ webhook: Webhook; secret: string }> {
  const url = checkedUrl(input.url);
  const secret = `dlwhsec_${randomBytes(24).toString("base64url")}`;
  const create = async (t: Transaction) => {
    const webhook = await Webhook.create(
      { organisationId: actor.organisationId, url, description: input.description ?? "", events: [...new Set(input.events)], secret, createdBy: actor.id },
      { transaction: t },
    );
    await audit(actor, "webhook.created", "webhook", webhook.id, { name: url, events: webhook.events }, t);
    return { webhook, secret };
  };
  return transaction ? create(transaction) : db().transaction(create);
}

export async function listWebhooks(organisationId: number): Promise<Webhook[]> {
  db();
  return Webhook.findAll({ where: { organisationId }, order: [["id", "ASC"]] });
}

export async function getWebhook(organisationId: number, id: number): Promise<Webhook> {
  db();
  const webhook = await Webhook.findOne({ where: { id, organisationId } });
  if (!webhook) throw new NotFoundError(`Webhook ${id}`);
  return webhook;
}

export async function setWebhookActive(actor: Actor, id: number, active: boolean): Promise<void> {
  const webhook = await getWebhook(actor.organisationId, id);
  if (webhook.active === active) return;
  await db().transaction(async (transaction) => {
    await webhook.update({ active }, { transaction });
    await audit(actor, active ? "webhook.activated" : "webhook.deactivated", "webhook", id, { name: webhook.url }, transaction);
  });
}

/** Removes an endpoint and its delivery log. */
export async function deleteWebhook(actor: Actor, id: number): Promise<void> {
  const webhook = await getWebhook(actor.organisationId, id);
  await db().transaction(async (transaction) => {
    await webhook.destroy({ transaction });
    await audit(actor, "webhook.deleted", "webhook", id, { name: webhook.url }, transaction);
  });
}

/** The latest deliveries of the organisation (or of one endpoint), newest first. */
export async function listDeliveries(organisationId: number, options: { webhookId?: number; limit?: number } = {}): Promise<WebhookDelivery[]> {
  db();
  return WebhookDelivery.findAll({
    where: { organisationId, ...(options.webhookId ? { webhookId: options.webhookId } : {}) },
    attributes: { exclude: ["payload"] },
    order: [["id", "DESC"]],
    limit: options.limit ?? 50,
  });
}

/** Sends a failed (or waiting) delivery again now, with a fresh allowance of attempts. */
export async function retryDelivery(actor: Actor, id: number): Promise<void> {
  db();
  const [changed] = await WebhookDelivery.update(
    { state: "pending", attempts: 0, nextAttemptAt: new Date() },
    { where: { id, organisationId: actor.organisationId, state: { [Op.ne]: "delivered" } } },
  );
  if (!changed) throw new NotFoundError(`Undelivered webhook delivery ${id}`);
  void kickWebhooks();
}

/**
 * Records an event for every active endpoint of the organisation that subscribed to it. Call it
 * inside the transaction of the change (when there is one): the deliveries exist only if the
 * change commits, and are sent after the commit.
 */
export async function emitWebhookEvent(organisationId: number, event: WebhookEvent, data: Record<string, unknown>, transaction?: Transaction): Promise<number> {
  db();
  const endpoints = (await Webhook.findAll({ where: { organisationId, active: true }, attributes: ["id", "events"], transaction })).filter((w) => w.events.includes(event));
  if (endpoints.length === 0) return 0;
  const payload = JSON.stringify({ event, occurredAt: new Date().toISOString(), data });
  await WebhookDelivery.bulkCreate(
    endpoints.map((w) => ({ organisationId, webhookId: w.id, event, payload, nextAttemptAt: new Date() })),
    { transaction },
  );
  if (transaction) transaction.afterCommit(() => void kickWebhooks());
  else void kickWebhooks();
  return endpoints.length;
}

/** The same, never failing the caller: an event that cannot be recorded is logged. */
export function emitWebhookEventQuietly(organisationId: number, event: WebhookEvent, data: Record<string, unknown>): void {
  emitWebhookEvent(organisationId, event, data).catch((error) => console.error(`[webhooks] could not record ${event}:`, (error as Error).message));
}

/** Claims up to BATCH due deliveries for this process: each gets a lease and counts an attempt. */
async function claimDue(): Promise<number[]> {
  const sequelize = db();
  return sequelize.transaction(async (transaction) => {
    const now = new Date();
    // Sequelize's MariaDB dialect drops `skipLocked`, so the claiming SELECT is written out.
    const rows = await sequelize.query<{ id: number }>(
      `SELECT id FROM webhook_deliveries
        WHERE state = 'pending' AND next_attempt_at <= :now
        ORDER BY next_attempt_at, id LIMIT :batch
        FOR UPDATE SKIP LOCKED`,
      { replacements: { now, batch: BATCH }, type: QueryTypes.SELECT, transaction },
    );
    const ids = rows.map((r) => r.id);
    if (ids.length) {
      await sequelize.query(
        `UPDATE webhook_deliveries SET attempts = attempts + 1, last_attempt_at = :now, next_attempt_at = :lease, updated_at = :now WHERE id IN (:ids)`,
        { replacements: { now, lease: new Date(now.getTime() + LEASE_MS), ids }, transaction },
      );
    }
    return ids;
  });
}

/** Posts one claimed delivery and records the outcome. */
async function attempt(id: number): Promise<void> {
  const delivery = await WebhookDelivery.findByPk(id);
  if (!delivery || delivery.state !== "pending") return;
  const webhook = await Webhook.findByPk(delivery.webhookId);
  if (!webhook || !webhook.active) {
    await delivery.update({ state: "failed", lastError: "The endpoint was deactivated before this delivery was sent.", nextAttemptAt: null });
    return;
  }
  const timestamp = Math.floor(Date.now() / 1000);
  let status: number | null = null;
  let response: string | null = null;
  let error: string | null = null;
  try {
    const res = await fetch(webhook.url, {
      method: "POST",
      redirect: "manual",
      signal: AbortSignal.timeout(POST_TIMEOUT_MS),
      headers: {
        "Content-Type": "application/json",
        "User-Agent": "Duskline-Webhooks/1",
        [EVENT_HEADER]: delivery.event,
        [DELIVERY_HEADER]: String(delivery.id),
        [TIMESTAMP_HEADER]: String(timestamp),
        [SIGNATURE_HEADER]: signWebhook(webhook.secret, timestamp, delivery.payload),
      },
      body: delivery.payload,
    });
    status = res.status;
    response = (await res.text().catch(() => "")).slice(0, RESPONSE_KEPT_CHARS);
  } catch (e) {
    error = String((e as Error).cause ? `${(e as Error).message}: ${((e as Error).cause as Error).message}` : (e as Error).message).slice(0, 500);
  }
  const ok = status !== null && status >= 200 && status < 300;
  const givenUp = !ok && delivery.attempts >= MAX_DELIVERY_ATTEMPTS;
  await delivery.update({
    state: ok ? "delivered" : givenUp ? "failed" : "pending",
    lastStatus: status,
    lastResponse: response,
    lastError: ok ? null : (error ?? `The endpoint answered ${status}.`),
    deliveredAt: ok ? new Date() : null,
    nextAttemptAt: ok || givenUp ? null : new Date(Date.now() + retryDelayMs(delivery.attempts, { baseMs: getEnv().WEBHOOK_RETRY_BASE_MS, capMs: 3600_000 })),
  });
}

/** Sends what is due, batch after batch, until nothing is. */
export async function dispatchWebhooks(): Promise<void> {
  for (;;) {
    const ids = await claimDue();
    await Promise.all(ids.map((id) => attempt(id).catch((error) => console.error(`[webhooks] delivery ${id}:`, (error as Error).message))));
    if (ids.length < BATCH) return;
  }
}

const drainer = createDrainer("webhooks", dispatchWebhooks, () => getEnv().WEBHOOK_POLL_MS);

/** Starts a dispatch now (or one more after the dispatch in progress). */
export const kickWebhooks = drainer.kick;

/** The retry timer of this process: idempotent, and it never keeps the process alive. */
export const startWebhookTimer = drainer.start;

/** Stops the timer and waits for a dispatch in progress (graceful shutdown). */
export const stopWebhooks = drainer.stop;
