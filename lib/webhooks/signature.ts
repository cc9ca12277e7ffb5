// Signed webhook deliveries (docs/webhooks.md). The receiver recomputes
// HMAC-SHA256(secret, `${timestamp}.${body}`) over the raw body and compares it in constant time,
// and refuses timestamps far from its clock, so a captured delivery cannot be replayed later.
import { createHmac, timingSafeEqual } from "node:crypto";

export const SIGNATURE_HEADER = "Duskline-Signature";
export const TIMESTAMP_HEADER = "Duskline-Timestamp";
export const EVENT_HEADER = "Duskline-Event";
export const DELIVERY_HEADER = "Duskline-Delivery";

/** The signature header's value for a body sent at `timestamp` (Unix seconds): `v1=<hex>`. */
export function signWebhook(secret: string, timestamp: number, body: string): string {
  return `v1=${createHmac("sha256", secret).update(`${timestamp}.${body}`).digest("hex")}`;
}

/**
 * Whether a delivery is genuine: the signature matches the secret, timestamp and raw body, and
 * the timestamp is within `toleranceSeconds` of `nowSeconds` (5 minutes by default).
 */
export function verifyWebhook(
  secret: string,
  delivery: { signature: string | null; timestamp: string | null; body: string },
  nowSeconds = Date.now() / 1000,
  toleranceSeconds = 300,
): boolean {
  const timestamp = Number(delivery.timestamp);
  if (!delivery.signature || !Number.isInteger(timestamp) || Math.abs(nowSeconds - timestamp) > toleranceSeconds) return false;
  const expected = Buffer.from(signWebhook(secret, timestamp, delivery.body));
  const given = Buffer.from(delivery.signature);
  return expected.length === given.length && timingSafeEqual(expected, given);
}
