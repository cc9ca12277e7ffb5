// An engine process that dies while it computes a request (killed here; out of memory would be the
// same) must cost only that request: a 503 problem+json that says to retry, never a 500, and the
// next request is computed by the process that replaces it. The app process itself stays up.
import { setTimeout as sleep } from "node:timers/promises";
import { afterAll, describe, expect, it } from "vitest";
import { childProcesses, secondPort, startApp, type AppProcess } from "../support/app-process";
import { signIn } from "../support/http";

let app: AppProcess | undefined;

afterAll(async () => {
  await app?.stop("SIGKILL");
});

const device = { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 30, chargeEfficiency: 0.9 };

/** A feasibility request on a year of 1-minute samples (CSV, epoch seconds): seconds of engine work. */
function yearAtOneMinute(): string {
  const start = Date.UTC(2025, 0, 1) / 1000;
  const rows = Array.from({ length: 365 * 1440 }, (_, i) => `${start + i * 60},${100 + (i % 1440) / 20}`);
  return JSON.stringify({
    location: { lat: 47.5, lon: 8.5 },
    device,
    csv: `Time,Amps\n${rows.join("\n")}\n`,
    csvOptions: { timestampColumn: "Time", currentColumn: "Amps", timestampFormat: "epoch-s" },
    async: false,
  });
}

describe("engine process stopped during a request", () => {
  it("answers that request 503 with Retry-After, and computes the next one", async () => {
    // One app process (no cluster) with one engine process, so the engine is this child's child.
    app = await startApp(secondPort(), undefined, { WEB_PROCESSES: "1", ENGINE_PROCESSES: "1" });
    const engineer = await signIn("engineer@example.com");
    const post = (body: string) =>
      fetch(`${app!.url}/api/v1/feasibility`, { method: "POST", headers: { cookie: engineer.cookie, "content-type": "application/json", accept: "application/json" }, body });

    const long = post(yearAtOneMinute());
    let engines: number[] = [];
    for (let i = 0; i < 300 && engines.length === 0; i++) {
      await sleep(50);
      engines = childProcesses(app.child.pid!);
    }
    expect(engines).toHaveLength(1);
    await sleep(500);
    process.kill(engines[0], "SIGKILL");

    const stopped = await long;
    expect(stopped.status).toBe(503);
    expect(stopped.headers.get("content-type")).toContain("application/problem+json");
    expect(stopped.headers.get("retry-after")).toBe("5");
    const problem = (await stopped.json()) as { retryable?: boolean; detail?: string };
    expect(problem.retryable).toBe(true);
    expect(problem.detail).toMatch(/try again/);

    const samples = Array.from({ length: 2 * 288 }, (_, i) => [new Date(Date.UTC(2025, 2, 1) + i * 300_000).toISOString(), 120]);
    const next = await post(JSON.stringify({ location: { lat: 47.5, lon: 8.5 }, device, samples }));
    expect(next.status).toBe(200);
    expect(childProcesses(app.child.pid!)).not.toContain(engines[0]);
    expect(app.child.exitCode).toBeNull();
  });
});
