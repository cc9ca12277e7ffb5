// The app process killed (SIGKILL) in the middle of an upload: nothing of it stays, and a
// retry with the same Idempotency-Key creates exactly one profile.
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { IdempotencyKey, LoadProfile, LoadProfileSeries } from "../../db/models";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { secondPort, startApp, waitForPort, type AppProcess } from "../support/app-process";
import { appUserConnection, waitForBlockedStatement } from "../support/db-instance";
import { createScene, dayCsv, uploadCsv, type Scene } from "./fixtures";

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

describe("app killed during an upload", () => {
  it("leaves no rows, and the retry with the same Idempotency-Key makes one profile", async () => {
    const key = randomUUID();
    const name = `killed upload ${key.slice(0, 8)}`;
    const csv = dayCsv(3);
    const seriesBefore = await LoadProfileSeries.count();
    app = await startApp(secondPort());

    // The upload reaches its last insert (the audit log is held), then the process is killed.
    const lock = await appUserConnection();
    await lock.query("LOCK TABLES audit_log WRITE");
    const pending = uploadCsv(engineer, scene.circuitId, csv, name, app.url, { "Idempotency-Key": key }).then(
      (res) => res.status,
      () => "connection lost",
    );
    await waitForBlockedStatement("INSERT INTO `audit_log`");
    await app.stop("SIGKILL");
    expect(await pending).toBe("connection lost");
    await lock.query("UNLOCK TABLES");
    await lock.end();

    expect(await LoadProfile.count({ where: { name } })).toBe(0);
    expect(await LoadProfileSeries.count()).toBe(seriesBefore);
    expect(await IdempotencyKey.count({ where: { key } })).toBe(0);

    // Restarted, the client retries with the same key: one profile; a second retry replays it.
    app = await startApp(secondPort());
    const first = await uploadCsv(engineer, scene.circuitId, csv, name, app.url, { "Idempotency-Key": key });
    expect(first.status).toBe(201);
    const created = await first.json();
    const again = await uploadCsv(engineer, scene.circuitId, csv, name, app.url, { "Idempotency-Key": key });
    expect(again.status).toBe(201);
    expect(again.headers.get("idempotent-replayed")).toBe("true");
    expect(again.headers.get("location")).toBe(`/api/v1/profiles/${created.profile.id}`);
    expect((await again.json()).profile.id).toBe(created.profile.id);
    expect(await LoadProfile.count({ where: { name } })).toBe(1);

    // The same key with another file is refused, and saves nothing.
    const other = await uploadCsv(engineer, scene.circuitId, dayCsv(3, 90), name, app.url, { "Idempotency-Key": key });
    expect(other.status).toBe(422);
    expect((await other.json()).errors[0].path).toBe("Idempotency-Key");
    expect(await LoadProfile.count({ where: { name } })).toBe(1);

    await app.stop();
    await waitForPort(app.port, false);
    app = undefined;
  });
});
