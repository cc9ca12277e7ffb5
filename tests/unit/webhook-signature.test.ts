// Webhook signatures (lib/webhooks/signature.ts). The check value was computed independently with
// OpenSSL: printf '1700000000.{"event":"ping"}' | openssl dgst -sha256 -hmac 'dlwhsec_test'
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { signWebhook, verifyWebhook } from "../../lib/webhooks/signature";

describe("webhook signatures", () => {
  it("is HMAC-SHA256 of timestamp, full stop and body, as hex after v1=", () => {
    expect(signWebhook("dlwhsec_test", 1700000000, '{"event":"ping"}')).toBe("v1=d993059c60f71ce532333bfe91fe5a2118b6719aea556b2964809d2c1fd4c62a");
  });

  it("verifies what it signed, within the tolerance, and nothing altered", () => {
    fc.assert(
      fc.property(fc.string({ minLength: 1 }), fc.string(), fc.integer({ min: 1_000_000_000, max: 4_000_000_000 }), (secret, body, t) => {
        const signature = signWebhook(secret, t, body);
        expect(verifyWebhook(secret, { signature, timestamp: String(t), body }, t + 10)).toBe(true);
        expect(verifyWebhook(secret, { signature, timestamp: String(t), body: `${body} ` }, t)).toBe(false);
        expect(verifyWebhook(`${secret}!`, { signature, timestamp: String(t), body }, t)).toBe(false);
        expect(verifyWebhook(secret, { signature, timestamp: String(t + 1), body }, t)).toBe(false);
      }),
    );
  });

  it("refuses a timestamp more than 5 minutes from now (a replayed delivery), and missing headers", () => {
    const signature = signWebhook("s", 1000, "{}");
    expect(verifyWebhook("s", { signature, timestamp: "1000", body: "{}" }, 1000 + 300)).toBe(true);
    expect(verifyWebhook("s", { signature, timestamp: "1000", body: "{}" }, 1000 + 301)).toBe(false);
    expect(verifyWebhook("s", { signature: null, timestamp: "1000", body: "{}" }, 1000)).toBe(false);
    expect(verifyWebhook("s", { signature, timestamp: null, body: "{}" }, 1000)).toBe(false);
  });
});
