// Starts the built app once for the integration and browser tests, against the test
// database that scripts/test.sh prepared. Unit tests do not need it but share the run.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, rmSync, writeFileSync } from "node:fs";
import { APP_COMMAND, portOpen, waitForPort } from "./support/app-process";
import { ANSWERS_DIR } from "./support/api-recorder-dir";

let server: ChildProcess | undefined;
// `npm stop` stops a test server left behind (say, by a killed run) through this file.
const PID_FILE = ".data/app-test.pid";

export async function setup() {
  const port = Number(process.env.PORT ?? 3390);
  process.env.TEST_BASE_URL = `http://127.0.0.1:${port}`;
  // Both test projects (app, faults) name this set-up; one server serves both.
  if (process.env.DUSKLINE_TEST_SERVER === "started") return;
  process.env.DUSKLINE_TEST_SERVER = "started";
  // The API answers of this run only (tests/support/api-recorder.ts, checked by tests/contract/).
  rmSync(ANSWERS_DIR, { recursive: true, force: true });
  if (!process.env.DB_NAME?.endsWith("_test")) {
    throw new Error("Run the tests through `npm test` (it prepares the private test database and mail fake).");
  }
  if (!existsSync("build/server/index.js")) throw new Error("No build found: `npm test` builds before testing.");
  if (await portOpen(port)) throw new Error(`Port ${port} is already in use; stop whatever runs there (npm stop) and retry.`);
  // APP_COMMAND names the built server by absolute path: the command line is unique to this checkout.
  server = spawn(process.execPath, APP_COMMAND, {
    env: { ...process.env },
    stdio: ["ignore", "inherit", "inherit"],
  });
  if (server.pid) writeFileSync(PID_FILE, String(server.pid));
  // Up to 3 minutes: on a busy shared machine loading the build alone has taken 20 s and more.
  await waitForPort(port, true, 180_000).catch(() => {
    throw new Error("The app did not start for the tests.");
  });
}

export async function teardown() {
  if (!server) return;
  const exited = new Promise((r) => server!.once("exit", r));
  server.kill("SIGTERM");
  await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  if (server.exitCode === null) server.kill("SIGKILL");
  rmSync(PID_FILE, { force: true });
}
