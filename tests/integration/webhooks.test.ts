// Webhooks (issue 12): admins register endpoints; events are delivered signed (HMAC-SHA256 of
// timestamp and body), retried with back-off from the delivery table while the receiver is down
// or failing, and listed with their status. The receiver is a real HTTP server in this process.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { createServer, type IncomingHttpHeaders, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { setTimeout as sleep } from "node:timers/promises";
import { closeDb } from "../../db/index";
import { Op } from "sequelize";
import { Webhook, WebhookDelivery } from "../../db/models";
import { verifyWebhook } from "../../lib/webhooks/signature";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

interface Received {
  path: string;
  headers: IncomingHttpHeaders;
  body: string;
}

/** A local endpoint that records what it receives and answers with `status()`. */
class Receiver {
  received: Received[] = [];
  status: () => number = () => 200;
  private server: Server | null = null;
  port = 0;

  async listen(port = 0): Promise<void> {
    this.server = createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on("data", (c: Buffer) => chunks.push(c));
      req.on("end", () => {
        this.received.push({ path: req.url ?? "", headers: req.headers, body: Buffer.concat(chunks).toString("utf8") });
        res.writeHead(this.status(), { "content-type": "text/plain" }).end("received");
      });
    });
    await new Promise<void>((resolve) => this.server!.listen(port, "127.0.0.1", resolve));
    this.port = (this.server.address() as AddressInfo).port;
  }

  async close(): Promise<void> {
    const server = this.server;
    this.server = null;
    if (server) await new Promise((resolve) => server.close(resolve));
  }

  url(path: string) {
    return `http://127.0.0.1:${this.port}${path}`;
  }

  async waitFor(path: string, count = 1, timeoutMs = 30_000): Promise<Received[]> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const hits = this.received.filter((r) => r.path === path);
      if (hits.length >= count) return hits;
      if (Date.now() > deadline) throw new Error(`${path}: ${hits.length} of ${count} deliveries after ${timeoutMs} ms`);
      await sleep(100);
    }
  }
}

let admin: Client;
let engineer: Client;
let circuitId: number;
const receiver = new Receiver();

async function register(body: Record<string, unknown>): Promise<{ id: number; secret: string }> {
  const res = await admin.json("/api/v1/webhooks", "POST", body);
  expect(res.status).toBe(201);
  const json = await res.json();
  expect(res.headers.get("location")).toBe(`/api/v1/webhooks/${json.id}`);
  return json;
}

/** Uploads a small invented profile: one profile.uploaded event. */
async function upload(name: string): Promise<number> {
  const csv = "Timestamp,I [A]\n2025-01-01T00:00:00Z,80\n2025-01-01T00:10:00Z,82\n2025-01-01T00:20:00Z,81\n";
  const query = new URLSearchParams({ timestampColumn: "Timestamp", currentColumn: "I [A]", name });
  const res = await fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?${query}`, { method: "POST", body: csv, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });
  expect(res.status).toBe(201);
  return (await res.json()).profile.id;
}

async function deliveriesOf(webhookId: number) {
  const res = await admin.get(`/api/v1/webhooks/${webhookId}/deliveries`);
  expect(res.status).toBe(200);
  return (await res.json()).deliveries as { id: number; event: string; state: string; attempts: number; lastStatus: number | null; lastError: string | null }[];
}

async function waitForDelivery(webhookId: number, until: (d: Awaited<ReturnType<typeof deliveriesOf>>[number]) => boolean, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await deliveriesOf(webhookId)).find(until);
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`webhook ${webhookId}: no matching delivery after ${timeoutMs} ms: ${JSON.stringify(await deliveriesOf(webhookId))}`);
    await sleep(150);
  }
}

beforeAll(async () => {
  testDb();
  await receiver.listen();
  admin = await signIn("admin@example.com");
  engineer = await signIn("engineer@example.com");
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Webhook test ${randomUUID().slice(0, 6)}`, voltageKv: 69, phases: 1 })).json();
  circuitId = circuit.id;
});
afterAll(async () => {
  // The receivers close with this file: remove the endpoints pointing at them, or later tests'
  // events would keep retrying deliveries (and changing the database under the backup test).
  await Webhook.destroy({ where: { url: { [Op.like]: "http://127.0.0.1:%" } } });
  await receiver.close();
  await closeDb();
});

describe("registering endpoints", () => {
  it("only admins may manage webhooks (403 for others)", async () => {
    const res = await engineer.json("/api/v1/webhooks", "POST", { url: receiver.url("/nope"), events: ["study.completed"] });
    expect(res.status).toBe(403);
    expect((await engineer.get("/api/v1/webhooks")).status).toBe(403);
  });

  it.each([
    ["http://receiver.example/events", "plain http to another host"],
    ["ftp://127.0.0.1/events", "another scheme"],
    ["https://user:pw@receiver.example/events", "credentials in the URL"],
    ["not a url", "no URL at all"],
  ])("refuses %s (%s) with a 422 naming url, and saves nothing", async (url) => {
    const before = (await (await admin.get("/api/v1/webhooks")).json()).webhooks.length;
    const res = await admin.json("/api/v1/webhooks", "POST", { url, events: ["study.completed"] });
    expect(res.status).toBe(422);
    expect((await res.json()).errors[0].path).toBe("url");
    expect((await (await admin.get("/api/v1/webhooks")).json()).webhooks.length).toBe(before);
  });

  it("refuses an unknown event with a 400 naming events", async () => {
    const res = await admin.json("/api/v1/webhooks", "POST", { url: receiver.url("/x"), events: ["study.exploded"] });
    expect(res.status).toBe(400);
    expect((await res.json()).errors[0].path).toMatch(/^events/);
  });

  it("shows the secret once: the endpoint's own resource has only its first characters", async () => {
    const { id, secret } = await register({ url: receiver.url("/once"), events: ["job.failed"] });
    expect(secret).toMatch(/^dlwhsec_[A-Za-z0-9_-]{32}$/);
    const shown = await (await admin.get(`/api/v1/webhooks/${id}`)).json();
    expect(shown.secret).toBeUndefined();
    expect(shown.secretPrefix).toBe(`${secret.slice(0, 10)}…`);
    expect(JSON.stringify(await (await admin.get("/api/v1/webhooks")).json())).not.toContain(secret);
  });
});

describe("deliveries", () => {
  it("a profile upload is delivered signed: the signature verifies with the secret and fails with another", async () => {
    const { id, secret } = await register({ url: receiver.url("/signed"), events: ["profile.uploaded"] });
    const profileId = await upload(`Signed ${randomUUID().slice(0, 6)}`);
    const [hit] = await receiver.waitFor("/signed");
    expect(hit.headers["duskline-event"]).toBe("profile.uploaded");
    expect(hit.headers["content-type"]).toBe("application/json");
    const delivery = { signature: String(hit.headers["duskline-signature"]), timestamp: String(hit.headers["duskline-timestamp"]), body: hit.body };
    expect(verifyWebhook(secret, delivery)).toBe(true);
    expect(verifyWebhook(`${secret}x`, delivery)).toBe(false);
    expect(verifyWebhook(secret, { ...delivery, body: hit.body.replace(String(profileId), String(profileId + 1)) })).toBe(false);
    const body = JSON.parse(hit.body);
    expect(body.event).toBe("profile.uploaded");
    expect(body.data.profileId).toBe(profileId);
    expect(body.data.url).toBe(`/api/v1/profiles/${profileId}`);
    const logged = await waitForDelivery(id, (d) => d.state === "delivered");
    expect(String(logged.id)).toBe(hit.headers["duskline-delivery"]);
    expect(logged).toMatchObject({ event: "profile.uploaded", attempts: 1, lastStatus: 200, lastError: null });
  });

  it("an endpoint gets only the events it subscribed to", async () => {
    await register({ url: receiver.url("/only-jobs"), events: ["job.failed"] });
    const { id } = await register({ url: receiver.url("/uploads"), events: ["profile.uploaded"] });
    await upload(`Filter ${randomUUID().slice(0, 6)}`);
    await waitForDelivery(id, (d) => d.state === "delivered");
    expect(receiver.received.filter((r) => r.path === "/only-jobs")).toEqual([]);
  });

  it("a failing receiver (503) is retried with back-off until it answers 2xx", async () => {
    let calls = 0;
    const failing = new Receiver();
    failing.status = () => (++calls <= 2 ? 503 : 204);
    await failing.listen();
    try {
      const { id } = await register({ url: failing.url("/flaky"), events: ["profile.uploaded"] });
      await upload(`Flaky ${randomUUID().slice(0, 6)}`);
      const hits = await failing.waitFor("/flaky", 3);
      // The same delivery each time (same id and body), signed afresh.
      expect(new Set(hits.map((h) => h.headers["duskline-delivery"])).size).toBe(1);
      expect(new Set(hits.map((h) => h.body)).size).toBe(1);
      const logged = await waitForDelivery(id, (d) => d.state === "delivered");
      expect(logged).toMatchObject({ attempts: 3, lastStatus: 204 });
    } finally {
      await failing.close();
    }
  });

  it("a receiver that is down is retried from the table and gets the event once it is back", async () => {
    const down = new Receiver();
    await down.listen();
    const port = down.port;
    await down.close();
    const { id } = await register({ url: `http://127.0.0.1:${port}/back`, events: ["profile.uploaded"] });
    await upload(`Down ${randomUUID().slice(0, 6)}`);
    const waiting = await waitForDelivery(id, (d) => d.state === "pending" && d.attempts >= 2);
    expect(waiting.lastError).toBeTruthy();
    expect(waiting.lastStatus).toBeNull();
    await down.listen(port);
    try {
      await down.waitFor("/back");
      const logged = await waitForDelivery(id, (d) => d.state === "delivered");
      expect(logged.attempts).toBeGreaterThanOrEqual(3);
    } finally {
      await down.close();
    }
  });

  it("a study, a review move and a failed job each reach the endpoints subscribed to them", async () => {
    const { secret } = await register({ url: receiver.url("/work"), events: ["study.completed", "review.changed", "job.failed"] });
    // Invented: two days at 5 minutes, 100 A.
    const start = Date.UTC(2025, 0, 1);
    const csv = ["Timestamp,I [A]", ...Array.from({ length: 576 }, (_, i) => `${new Date(start + i * 300_000).toISOString()},100`)].join("\n");
    const query = new URLSearchParams({ timestampColumn: "Timestamp", currentColumn: "I [A]", name: `Work ${randomUUID().slice(0, 6)}` });
    const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?${query}`, { method: "POST", body: csv, headers: { cookie: engineer.cookie, "content-type": "text/csv" } });
    const profileId = (await up.json()).profile.id;
    const crossing = await (await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: `Hook crossing ${randomUUID().slice(0, 6)}`, lat: 45, lon: -95, spanLength: { value: 600, unit: "ft" }, kind: "river" })).json();
    const device = await engineer.post("/devices/new", { name: `Hook device ${randomUUID().slice(0, 6)}`, minCurrentA: "40", maxCurrentA: "2000", harvestW: "0.1*I", loadW: "4" });
    const deviceProfileId = Number(device.headers.get("location")!.split("/").pop());
    const study = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId, policy: { minKnownHours: 24 } });
    expect(study.status).toBe(201);
    const studyId = (await study.json()).id;
    const [completed] = await receiver.waitFor("/work");
    expect(JSON.parse(completed.body)).toMatchObject({ event: "study.completed", data: { studyId, crossingId: crossing.id, url: `/api/v1/studies/${studyId}` } });

    const move = await engineer.json(`/api/v1/crossings/${crossing.id}/review`, "POST", { action: "submit", comment: "Ready for sign-off." });
    expect(move.status).toBe(200);
    const reviewed = (await receiver.waitFor("/work", 2))[1];
    expect(JSON.parse(reviewed.body)).toMatchObject({ event: "review.changed", data: { crossingId: crossing.id, action: "submit", from: "draft", to: "submitted" } });

    const job = await engineer.json("/api/v1/feasibility", "POST", { location: { lat: 45, lon: -95 }, device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "0.1*I", loadW: 4 }, samples: [["2025-01-01T00:00:00Z", 50], ["2025-01-01T00:05:00Z", -1]], async: true });
    expect(job.status).toBe(202);
    const jobId = Number(job.headers.get("location")!.split("/").pop());
    const failed = (await receiver.waitFor("/work", 3))[2];
    expect(JSON.parse(failed.body)).toMatchObject({ event: "job.failed", data: { jobId, kind: "feasibility.run", error: { status: 422 }, url: `/api/v1/jobs/${jobId}` } });
    for (const hit of [completed, reviewed, failed]) {
      expect(verifyWebhook(secret, { signature: String(hit.headers["duskline-signature"]), timestamp: String(hit.headers["duskline-timestamp"]), body: hit.body })).toBe(true);
    }
  });

  it("a paused endpoint gets nothing; a removed one is gone with its log", async () => {
    const { id } = await register({ url: receiver.url("/paused"), events: ["profile.uploaded"] });
    const page = await admin.post("/admin/webhooks", { intent: "deactivate", id: String(id) });
    expect(page.status).toBe(200);
    expect((await (await admin.get(`/api/v1/webhooks/${id}`)).json()).active).toBe(false);
    const before = await WebhookDelivery.count({ where: { webhookId: id } });
    await upload(`Paused ${randomUUID().slice(0, 6)}`);
    expect(await WebhookDelivery.count({ where: { webhookId: id } })).toBe(before);
    expect((await admin.json(`/api/v1/webhooks/${id}`, "DELETE")).status).toBe(204);
    expect((await admin.get(`/api/v1/webhooks/${id}`)).status).toBe(404);
    expect(await WebhookDelivery.count({ where: { webhookId: id } })).toBe(0);
  });
});

describe("admin page", () => {
  it("adds an endpoint from the form, shows the secret once, and lists it", async () => {
    const url = receiver.url(`/form-${randomUUID().slice(0, 6)}`);
    const res = await admin.post("/admin/webhooks", { intent: "create", url, description: "Asset system", "event:job.failed": "on", "event:review.changed": "on" });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toMatch(/data-testid="new-webhook-secret">dlwhsec_/);
    const list = await (await admin.get("/admin/webhooks")).text();
    expect(list).toContain(url);
    expect(list).toContain("job.failed, review.changed");
  });

  it("a form without events, or with a bad URL, shows the field's error and saves nothing", async () => {
    const before = (await (await admin.get("/api/v1/webhooks")).json()).webhooks.length;
    const noEvents = await admin.post("/admin/webhooks", { intent: "create", url: receiver.url("/none") });
    expect(noEvents.status).toBe(400);
    expect(await noEvents.text()).toContain("Choose at least one event.");
    const badUrl = await admin.post("/admin/webhooks", { intent: "create", url: "http://receiver.example/x", "event:job.failed": "on" });
    expect(badUrl.status).toBe(400);
    expect(await badUrl.text()).toContain("Use an https:// URL");
    expect((await (await admin.get("/api/v1/webhooks")).json()).webhooks.length).toBe(before);
  });

  it("is for admins only", async () => {
    expect((await engineer.get("/admin/webhooks")).status).toBe(403);
  });
});
