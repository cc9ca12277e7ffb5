import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import net from "node:net";
import { randomUUID } from "node:crypto";
import { Op } from "sequelize";
import { closeDb } from "../../db/index";
import { AuditEntry, CrossingReview, OutboxMessage } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";
import { waitForMail } from "../support/mail";

let engineer: Client;
let consultant: Client;
let manager: Client;
let admin: Client;
let circuitId: number;
let profileId: number;
let deviceProfileId: number;

const DEVICE = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0, chargeEfficiency: 0.9 };
const OPTION = { units: "", installationMethod: "helicopter", mobilisation: "12000", ratePerHour: "4500", minutesPerUnit: "20", serviceLifeYears: "20", horizonYears: "40", discountRatePercent: "8" };

async function newCrossing(name: string) {
  const res = await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name, lat: 40, lon: -100, spanLength: { value: 1000, unit: "ft" }, kind: "river" });
  expect(res.status).toBe(201);
  const id = (await res.json()).id as number;
  expect((await runStudy(id)).status).toBe(201);
  // A solar option rated go (so it is recommended) and a dearer one.
  for (const extra of [
    { name: "Solar markers", kind: "solar", unitPrice: "4200", annualMaintenance: "600", feasibilityStatus: "go", feasibilityJustification: "Open site (test)." },
    { name: "Supply on the towers", kind: "structure-supply", units: "3", unitPrice: "30000", annualMaintenance: "900", feasibilityStatus: "go", feasibilityJustification: "Supply nearby (test)." },
  ]) {
    expect((await consultant.post(`/crossings/${id}/options/new`, { ...OPTION, ...extra })).status).toBe(302);
  }
  return id;
}

const runStudy = (crossingId: number) =>
  engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } });
const move = (c: Client, crossingId: number, body: Record<string, unknown>) => c.json(`/api/v1/crossings/${crossingId}/review`, "POST", body);

beforeAll(async () => {
  testDb();
  [engineer, consultant, manager, admin] = await Promise.all(["engineer", "consultant", "manager", "admin"].map((r) => signIn(`${r}@example.com`)));
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Review test ${randomUUID().slice(0, 6)}`, voltageKv: 115, phases: 1 })).json();
  circuitId = circuit.id;
  const start = Date.UTC(2025, 5, 1);
  const rows = Array.from({ length: 576 }, (_, i) => `${new Date(start + i * 300_000).toISOString()},${i < 288 ? 100 : 10}`);
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?timestampColumn=Time&currentColumn=Amps`, {
    method: "POST",
    body: ["Time,Amps", ...rows].join("\n"),
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  profileId = (await up.json()).profile.id;
  const device = await engineer.post("/devices/new", { name: `Review device ${randomUUID().slice(0, 6)}`, ...Object.fromEntries(Object.entries(DEVICE).map(([k, v]) => [k, String(v)])) });
  deviceProfileId = Number(device.headers.get("location")!.split("/").pop());
});
afterAll(async () => {
  await closeDb();
});

describe("review and sign-off through the API", () => {
  it("carries a crossing from draft to approved, with history, audit and e-mails; refuses wrong roles and illegal moves", async () => {
    const name = `Approve river ${randomUUID().slice(0, 6)}`;
    const id = await newCrossing(name);
    const initial = await (await engineer.get(`/api/v1/crossings/${id}`)).json();
    expect(initial.review).toMatchObject({ state: "draft", stale: false, staleReasons: [], history: [], decision: null });

    // Wrong role → 403 naming who may; illegal from this state → 409 naming the state; content → 400.
    const byManager = await move(manager, id, { action: "submit", comment: "x" });
    expect(byManager.status).toBe(403);
    expect((await byManager.json()).detail).toContain("only an engineer or a consultant may submit");
    const byAdmin = await move(admin, id, { action: "submit", comment: "x" });
    expect(byAdmin.status).toBe(403);
    expect((await byAdmin.json()).detail).toMatch(/^Administrators/);
    const early = await move(manager, id, { action: "approve", comment: "ok", decision: "recommended" });
    expect(early.status).toBe(409);
    expect(early.headers.get("content-type")).toBe("application/problem+json");
    expect(await early.json()).toMatchObject({ status: 409, state: "draft", detail: expect.stringContaining("The review is draft") });
    const silent = await move(engineer, id, { action: "submit", comment: " " });
    expect(silent.status).toBe(400);
    expect((await silent.json()).errors).toEqual([expect.objectContaining({ path: "comment" })]);
    const unknown = await move(engineer, id, { action: "sign" });
    expect(unknown.status).toBe(400);

    const submitted = await move(engineer, id, { action: "submit", comment: "Ready for sign-off: solar is the cheapest go." });
    expect(submitted.status).toBe(200);
    expect((await submitted.json()).review).toMatchObject({ state: "submitted", submittedBy: "Ellis Engineer" });
    const toManager = await waitForMail("manager@example.com", `Sign-off requested: ${name}`);
    expect(toManager.text).toContain("Note: Ready for sign-off");
    expect(toManager.text).toContain("Verdict: no-go");
    expect(toManager.text).toContain(`/crossings/${id}`);
    expect(toManager.html).toContain(`href="${process.env.APP_URL}/crossings/${id}"`);

    const approved = await move(manager, id, { action: "approve", comment: "Fit solar.", decision: "recommended" });
    expect(approved.status).toBe(200);
    const review = (await approved.json()).review;
    const row = await CrossingReview.findByPk(id);
    expect(review).toMatchObject({ state: "approved", stale: false, decision: "recommended", approvedBy: "Morgan Manager", studyId: row!.studyId });
    expect(review.optionId).toBe(row!.snapshot!.option!.id);
    // What was approved: the option with its cost figures, the policy, rule set and span.
    expect(row!.snapshot).toMatchObject({ option: { name: "Solar markers", currency: "USD" }, ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } });
    expect(row!.snapshot!.option!.equivalentAnnualCost).toBeGreaterThan(0);
    expect(review.history.map((h: { from: string; to: string }) => `${h.from}→${h.to}`)).toEqual(["draft→submitted", "submitted→approved"]);
    expect(review.history[1]).toMatchObject({ by: "Morgan Manager", comment: "Fit solar.", decision: "recommended" });
    const toEngineer = await waitForMail("engineer@example.com", `Approved: ${name}`);
    expect(toEngineer.text).toContain("Decision: Fit the recommended option: Solar markers");

    const again = await move(manager, id, { action: "approve", comment: "again", decision: "recommended" });
    expect(again.status).toBe(409);
    expect((await again.json()).state).toBe("approved");
    const audit = await AuditEntry.findAll({ where: { entity: "crossing", entityId: String(id) } });
    expect(audit.map((a) => a.action)).toEqual(expect.arrayContaining(["review.submit", "review.approve"]));

    // The crossing page shows the panel and its history.
    const page = await (await manager.get(`/crossings/${id}`)).text();
    expect(page).toContain("Review and sign-off");
    expect(page).toContain("Fit solar.");

    // Reopening an approval: only a manager, with a reason.
    expect((await move(engineer, id, { action: "reopen", comment: "redo" })).status).toBe(403);
    expect((await move(manager, id, { action: "reopen", comment: "" })).status).toBe(400);
    const reopened = await move(manager, id, { action: "reopen", comment: "New survey coming." });
    expect((await reopened.json()).review).toMatchObject({ state: "draft", approvedBy: null, decision: null });
  });

  it("a return goes to the submitter, who takes it back to draft; another option must be of this crossing", async () => {
    const name = `Return canyon ${randomUUID().slice(0, 6)}`;
    const id = await newCrossing(name);
    expect((await move(consultant, id, { action: "submit", comment: "Please check." })).status).toBe(200);
    const wrongOption = await move(manager, id, { action: "approve", comment: "x", decision: "other", optionId: 999999 });
    expect(wrongOption.status).toBe(400);
    expect((await wrongOption.json()).errors[0].path).toBe("optionId");
    const returned = await move(manager, id, { action: "return", comment: "Span details are missing." });
    expect((await returned.json()).review.state).toBe("returned");
    const mail = await waitForMail("consultant@example.com", `Returned for rework: ${name}`);
    expect(mail.text).toContain("Comment: Span details are missing.");
    expect((await move(manager, id, { action: "reopen", comment: "x" })).status).toBe(403);
    const back = await move(consultant, id, { action: "reopen" });
    expect((await back.json()).review.state).toBe("draft");
  });

  it("an approval goes stale on a new study run or a span change, says what changed, and tells the approver once", async () => {
    const name = `Stale lake ${randomUUID().slice(0, 6)}`;
    const id = await newCrossing(name);
    await move(engineer, id, { action: "submit", comment: "Ready." });
    const other = (await (await engineer.get(`/api/v1/crossings/${id}`)).json()) as { review: unknown };
    expect(other.review).toMatchObject({ state: "submitted" });
    const approved = await move(manager, id, { action: "approve", comment: "Go ahead.", decision: "do-not-proceed" });
    expect((await approved.json()).review).toMatchObject({ state: "approved", stale: false, optionId: null });

    expect((await runStudy(id)).status).toBe(201);
    const after = (await (await manager.get(`/api/v1/crossings/${id}`)).json()).review;
    expect(after.stale).toBe(true);
    expect(after.staleReasons).toEqual([expect.stringMatching(/^a newer study \(#\d+\) has run since study #\d+ was approved$/)]);
    expect(after.history.at(-1)).toMatchObject({ action: "stale", by: "Duskline" });
    const notice = await waitForMail("manager@example.com", `Approval out of date: ${name}`);
    expect(notice.text).toContain("What changed: a newer study");

    const put = await engineer.json(`/api/v1/crossings/${id}`, "PUT", { name, lat: 40, lon: -100, spanLength: { value: 1200, unit: "ft" }, kind: "river" });
    expect(put.status).toBe(200);
    const later = (await (await manager.get(`/api/v1/crossings/${id}/review`)).json()).review;
    expect(later.staleReasons).toEqual(expect.arrayContaining(["the span length has changed from 1000 ft to 1200 ft"]));
    // One notice per approval.
    expect(later.history.filter((h: { action: string }) => h.action === "stale")).toHaveLength(1);
    const home = await (await manager.get("/")).text();
    expect(home).toContain("Stale approvals");
    expect(home).toContain(`href="/crossings/${id}"`);
  });
});

// Stops the fake SMTP that npm test started, and starts it again the same way (the pid file lets test.sh stop it at the end).
const SMTP_PID = ".data/smtp-test.pid";
function smtpPortOpen(): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect(Number(process.env.SMTP_PORT), "127.0.0.1");
    socket.once("connect", () => (socket.destroy(), resolve(true)));
    socket.once("error", () => resolve(false));
  });
}
async function until(check: () => Promise<boolean>, what: string, ms = 15_000) {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`Timed out waiting for ${what}`);
}

describe("notifications survive SMTP being down", () => {
  it("saves the move, keeps the message in the outbox, and sends it when SMTP is back", async () => {
    const name = `Outage road ${randomUUID().slice(0, 6)}`;
    const id = await newCrossing(name);
    process.kill(Number(readFileSync(SMTP_PID, "utf8")), "SIGTERM");
    await until(async () => !(await smtpPortOpen()), "the fake SMTP to stop");
    try {
      const res = await move(engineer, id, { action: "submit", comment: "Sent while the mail relay is down." });
      expect(res.status).toBe(200);
      expect((await CrossingReview.findByPk(id))!.state).toBe("submitted");
      await until(async () => {
        const row = await OutboxMessage.findOne({ where: { subject: { [Op.like]: `Sign-off requested: ${name} (%` } } });
        return !!row && row.attempts >= 1 && row.status === "pending" && !!row.lastError;
      }, "a failed attempt recorded in the outbox");
    } finally {
      const child = spawn(process.execPath, ["--import", "tsx", "scripts/fake-smtp.ts"], { detached: true, stdio: "ignore", env: process.env });
      child.unref();
      writeFileSync(SMTP_PID, String(child.pid));
      await until(smtpPortOpen, "the fake SMTP to start again");
    }
    const mail = await waitForMail("manager@example.com", `Sign-off requested: ${name}`, 30_000);
    expect(mail.text).toContain("Sent while the mail relay is down.");
    // The relay has the message; the drain records it as sent when its transaction commits.
    const find = () => OutboxMessage.findOne({ where: { subject: { [Op.like]: `Sign-off requested: ${name} (%` } } });
    await until(async () => (await find())?.status === "sent", "the outbox to record the message as sent");
    const row = await find();
    expect(row!.attempts).toBeGreaterThanOrEqual(2);
  }, 60_000);
});
