// The supervisor `npm start` runs the app under: a killed app comes back, and SIGTERM stops both.
import { existsSync, readFileSync } from "node:fs";
import { afterAll, describe, expect, it } from "vitest";
import { APP_COMMAND, portOpen, secondPort, startApp, waitForPort, type AppProcess } from "../support/app-process";

const pidfile = ".data/app-supervisor-test.pid";
let supervisor: AppProcess | undefined;

afterAll(async () => {
  await supervisor?.stop("SIGTERM");
});

const pidOf = (file: string) => Number(readFileSync(file, "utf8").trim());
const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

async function until(check: () => boolean | Promise<boolean>, what: string, timeoutMs = 90_000) {
  const end = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe("npm start's supervisor", () => {
  it("restarts the app when it is killed, says so, and stops it on SIGTERM", async () => {
    supervisor = await startApp(secondPort(), ["bash", "scripts/supervise.sh", pidfile, process.execPath, ...APP_COMMAND]);
    const first = pidOf(pidfile);
    expect(pidOf(`${pidfile}.supervisor`)).toBe(supervisor.child.pid);

    process.kill(first, "SIGKILL");
    let second = 0;
    await until(() => {
      second = existsSync(pidfile) ? pidOf(pidfile) : 0;
      return second > 0 && second !== first;
    }, "a new app process is started");
    await waitForPort(supervisor.port, true, 90_000);
    expect((await fetch(`${supervisor.url}/login`)).status).toBe(200);
    expect(supervisor.output()).toMatch(/the app stopped unexpectedly \(exit status 137\); restarting it/);

    expect(await supervisor.stop("SIGTERM")).toBe(0);
    supervisor = undefined;
    expect(alive(second)).toBe(false);
    expect(await portOpen(secondPort())).toBe(false);
    expect(existsSync(pidfile)).toBe(false);
    expect(existsSync(`${pidfile}.supervisor`)).toBe(false);
  });
});
