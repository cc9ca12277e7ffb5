// Starts the built app once for the integration and browser tests, against the test
// database that scripts/test.sh prepared. Unit tests do not need it but share the run.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

let server: ChildProcess | undefined;
// `npm stop` stops a test server left behind (say, by a killed run) through this file.
const PID_FILE = ".data/app-test.pid";

function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect(port, "127.0.0.1");
    socket.once("connect", () => (socket.destroy(), resolve(true)));
    socket.once("error", () => resolve(false));
  });
}

export async function setup() {
  const port = Number(process.env.PORT ?? 3390);
  process.env.TEST_BASE_URL = `http://127.0.0.1:${port}`;
  if (!process.env.DB_NAME?.endsWith("_test")) {
    throw new Error("Run the tests through `npm test` (it prepares the private test database and mail fake).");
  }
  if (!existsSync("build/server/index.js")) throw new Error("No build found: `npm test` builds before testing.");
  if (await portOpen(port)) throw new Error(`Port ${port} is already in use; stop whatever runs there (npm stop) and retry.`);
  // The absolute path keeps the command line unique to this checkout, out of reach of any
  // "pkill by name" in another checkout's scripts.
  server = spawn(process.execPath, ["--import", "tsx", path.resolve("server.ts")], {
    env: { ...process.env },
    stdio: ["ignore", "inherit", "inherit"],
  });
  if (server.pid) writeFileSync(PID_FILE, String(server.pid));
  // Up to 3 minutes: on a loaded machine the server can take a minute to start.
  for (let i = 0; i < 3600 && !(await portOpen(port)); i++) await new Promise((r) => setTimeout(r, 50));
  if (!(await portOpen(port))) throw new Error("The app did not start for the tests.");
}

export async function teardown() {
  if (!server) return;
  const exited = new Promise((r) => server!.once("exit", r));
  server.kill("SIGTERM");
  await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
  if (server.exitCode === null) server.kill("SIGKILL");
  rmSync(PID_FILE, { force: true });
}
