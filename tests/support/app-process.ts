// Starting and stopping app processes for tests: the shared test server (global-setup) and the
// extra instances of the fault and two-instance tests.
import { spawn, type ChildProcess } from "node:child_process";
import { readdirSync, readFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

/**
 * How the built app is served (node arguments; `npm start` supervises the same): server.ts as
 * compiled by `npm run build`, run without tsx (its loader thread cost ~190 MB per process). The absolute
 * path keeps these processes apart from other checkouts' servers on the same machine.
 */
export const APP_COMMAND = [path.resolve("build/http-server.js")];

/** A process's children (Linux: each of its threads lists those it started); none once it has gone. */
export function childProcesses(pid: number): number[] {
  try {
    return readdirSync(`/proc/${pid}/task`).flatMap((task) => readFileSync(`/proc/${pid}/task/${task}/children`, "utf8").trim().split(/\s+/).filter(Boolean).map(Number));
  } catch {
    return [];
  }
}

/** The port of the second app instance used by the fault tests (`npm test` sets PORT2). */
export const secondPort = () => Number(process.env.PORT2 ?? Number(process.env.PORT ?? 3390) + 10);

export function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect(port, "127.0.0.1");
    socket.once("connect", () => (socket.destroy(), resolve(true)));
    socket.once("error", () => resolve(false));
  });
}

export async function waitForPort(port: number, open = true, timeoutMs = 15_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while ((await portOpen(port)) !== open) {
    if (Date.now() > until) throw new Error(`Port ${port} did not ${open ? "open" : "close"} within ${timeoutMs} ms.`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

export interface AppProcess {
  port: number;
  url: string;
  child: ChildProcess;
  /** Everything the process printed. */
  output(): string;
  /** Resolves with the exit code (or signal name) when the process ends. */
  exited: Promise<number | string>;
  stop(signal?: NodeJS.Signals): Promise<number | string>;
}

/** Starts the built app on `port` with the test environment and waits until it listens. */
export async function startApp(port: number, command: string[] = APP_COMMAND, env: Record<string, string> = {}): Promise<AppProcess> {
  if (await portOpen(port)) throw new Error(`Port ${port} is already in use; stop whatever runs there and retry.`);
  const child = spawn(command[0] === "bash" ? "bash" : process.execPath, command[0] === "bash" ? command.slice(1) : command, {
    env: { ...process.env, PORT: String(port), APP_URL: `http://127.0.0.1:${port}`, ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let output = "";
  child.stdout!.on("data", (d) => (output += d));
  child.stderr!.on("data", (d) => (output += d));
  const exited = new Promise<number | string>((resolve) => child.once("exit", (code, signal) => resolve(code ?? signal ?? "?")));
  const app: AppProcess = {
    port,
    url: `http://127.0.0.1:${port}`,
    child,
    output: () => output,
    exited,
    async stop(signal = "SIGTERM") {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      const timer = setTimeout(() => child.kill("SIGKILL"), 20_000);
      const result = await exited;
      clearTimeout(timer);
      return result;
    },
  };
  try {
    // Starting takes a few seconds, and over 20 s on a loaded machine.
    await waitForPort(port, true, 90_000);
  } catch (error) {
    await app.stop("SIGKILL");
    throw new Error(`${(error as Error).message}\n${output}`);
  }
  return app;
}
