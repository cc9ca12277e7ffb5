// Several app processes (server.ts with WEB_PROCESSES; one per core but one by default): the processes share the port, a
// process that dies is replaced and the log says so (and its engine processes go with it), and SIGTERM stops them all gracefully.
import { readFileSync } from "node:fs";
import { setTimeout as sleep } from "node:timers/promises";
import { afterAll, describe, expect, it } from "vitest";
import { APP_COMMAND, childProcesses, secondPort, startApp, type AppProcess } from "../support/app-process";
import { signIn } from "../support/http";

let app: AppProcess | undefined;

afterAll(async () => {
  await app?.stop("SIGKILL");
});

/** The app processes the primary started: its children that run the built server. */
function appProcesses(primary: number): number[] {
  return childProcesses(primary).filter((pid) => {
    try {
      return readFileSync(`/proc/${pid}/cmdline`, "utf8").includes(APP_COMMAND.at(-1)!);
    } catch {
      return false; // gone meanwhile
    }
  });
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

async function until(what: string, check: () => boolean | Promise<boolean>, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`${what}: not within ${timeoutMs} ms`);
    await sleep(100);
  }
}

describe("cluster of app processes", () => {
  it("serves from two processes, replaces one that is killed (its engine processes exit with it), and stops all on SIGTERM", async () => {
    app = await startApp(secondPort(), undefined, { WEB_PROCESSES: "2" });
    const primary = app.child.pid!;
    await until("two app processes", () => appProcesses(primary).length === 2);
    expect(app.output()).toMatch(/2 app processes, \d+ engine process(es)? each/);
    // Engine processes are divided among the app processes: never more of them than cores in all.
    const enginesEach = Number(app.output().match(/(\d+) engine process/)![1]);
    expect(enginesEach * 2).toBeLessThanOrEqual(Math.max(2, (await import("node:os")).availableParallelism()));
    expect((await fetch(`${app.url}/login`)).status).toBe(200);

    // A study starts the engine processes of the app process that serves it.
    const engineer = await signIn("engineer@example.com");
    const samples = Array.from({ length: 2 * 288 }, (_, i) => [new Date(Date.UTC(2025, 2, 1) + i * 300_000).toISOString(), 120]);
    const device = { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 30, chargeEfficiency: 0.9 };
    const study = await fetch(`${app.url}/api/v1/feasibility`, {
      method: "POST",
      headers: { cookie: engineer.cookie, "content-type": "application/json", accept: "application/json" },
      body: JSON.stringify({ location: { lat: 47.5, lon: 8.5 }, device, samples }),
    });
    expect(study.status).toBe(200);
    const [victim] = appProcesses(primary).filter((pid) => childProcesses(pid).length > 0);
    const engines = childProcesses(victim);
    expect(engines.length).toBeGreaterThan(0);
    expect(engines.every((pid) => readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("engine-worker"))).toBe(true);

    // Killed outright, it gives its engine processes no word, but they see its channel close and exit.
    process.kill(victim, "SIGKILL");
    await until("its engine processes to exit", () => !engines.some(alive));
    await until("a replacement process", () => {
      const now = appProcesses(primary);
      return now.length === 2 && !now.includes(victim);
    });
    expect(app.output()).toContain(`app process ${victim} stopped (SIGKILL); starting another`);
    expect((await fetch(`${app.url}/login`)).status).toBe(200);

    const workers = appProcesses(primary);
    const signalled = Date.now();
    app.child.kill("SIGTERM");
    expect(await app.exited).toBe(0);
    expect(Date.now() - signalled).toBeLessThan(12_000);
    expect(workers.filter(alive)).toEqual([]);
    app = undefined;
  });
});
