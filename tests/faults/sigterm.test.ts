// SIGTERM to the app: a request in flight finishes, new ones are refused, the process exits in 10 s.
import http from "node:http";
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { LoadProfile } from "../../db/models";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { secondPort, startApp, type AppProcess } from "../support/app-process";
import { createScene, dayCsv, type Scene } from "./fixtures";

let engineer: Client;
let scene: Scene;
let app: AppProcess | undefined;

beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
  scene = await createScene(engineer);
});
afterAll(async () => {
  await app?.stop("SIGKILL");
  await closeDb();
});

describe("SIGTERM", () => {
  it("lets an upload in flight finish, refuses new requests and exits within 10 s", async () => {
    app = await startApp(secondPort());
    const name = `in flight ${randomUUID().slice(0, 8)}`;
    const csv = Buffer.from(dayCsv(10));
    const half = Math.floor(csv.length / 2);

    const req = http.request(`${app.url}/api/v1/circuits/${scene.circuitId}/profiles?timestampColumn=Time&currentColumn=Amps&name=${encodeURIComponent(name)}`, {
      method: "POST",
      headers: { cookie: engineer.cookie, "x-forwarded-for": engineer.address, "content-type": "text/csv", "content-length": String(csv.length) },
    });
    const answer = new Promise<{ status: number; body: string }>((resolve, reject) => {
      req.on("response", (res) => {
        let body = "";
        res.on("data", (d) => (body += d));
        res.on("end", () => resolve({ status: res.statusCode!, body }));
      });
      req.on("error", reject);
    });
    req.write(csv.subarray(0, half));
    await new Promise((r) => setTimeout(r, 500));

    const signalled = Date.now();
    app.child.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 500));
    // A new request while shutting down: refused (the listener is closed, or a 503).
    const late = await fetch(`${app.url}/login`).then(
      (res) => res.status,
      () => "refused",
    );
    expect([503, "refused"]).toContain(late);

    req.end(csv.subarray(half));
    const { status, body } = await answer;
    expect(status).toBe(201);
    expect(JSON.parse(body).profile.name).toBe(name);
    expect(await LoadProfile.count({ where: { name } })).toBe(1);

    expect(await app.exited).toBe(0);
    expect(Date.now() - signalled).toBeLessThan(10_000);
    app = undefined;
  });
});
