// Control of the private test MariaDB for the fault tests (they stop and start it for real).
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import * as mariadb from "mariadb";

const run = promisify(execFile);
const socket = () => `${process.cwd()}/.data/mariadb-test/mariadb.sock`;

export async function stopDatabase(): Promise<void> {
  await run("bash", ["db/instance.sh", "stop", "test"], { env: process.env });
}

export async function startDatabase(): Promise<void> {
  await run("bash", ["db/instance.sh", "start", "test"], { env: process.env });
}

export async function databaseRunning(): Promise<boolean> {
  return run("bash", ["db/instance.sh", "status", "test"], { env: process.env }).then(
    () => true,
    () => false,
  );
}

/** Runs SQL as the instance's root user over its private socket; rows as tab-separated lines. */
export async function rootSql(sql: string, database?: string): Promise<string[]> {
  const args = ["--no-defaults", `--socket=${socket()}`, "--user=root", "-N", "-B", "-e", sql];
  if (database) args.push(database);
  const { stdout } = await run("mariadb", args, { maxBuffer: 64 * 1024 * 1024 });
  return stdout.split("\n").filter((line) => line !== "");
}

/** A connection of the app's own user to the test database (for LOCK TABLES and the like). */
export async function appUserConnection(): Promise<mariadb.Connection> {
  const connection = await mariadb.createConnection({
    host: "127.0.0.1",
    port: Number(process.env.DB_PORT),
    user: process.env.DB_USER,
    password: process.env.DB_PASSWORD,
    database: process.env.DB_NAME,
  });
  // The database is stopped under it in some tests: a lost connection is expected there.
  connection.on("error", () => {});
  return connection;
}

/** Waits until a statement starting with `prefix` is blocked in the server (e.g. on a table lock). */
export async function waitForBlockedStatement(prefix: string, timeoutMs = 15_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  const like = prefix.replace(/'/g, "''").replace(/%/g, "\\%") + "%";
  for (;;) {
    const [count] = await rootSql(`SELECT COUNT(*) FROM information_schema.processlist WHERE info LIKE '${like}' AND state LIKE '%lock%'`);
    if (Number(count) > 0) return;
    if (Date.now() > until) {
      const threads = await rootSql("SELECT command, state, LEFT(info, 80) FROM information_schema.processlist");
      throw new Error(`No statement "${prefix}…" waited on a lock within ${timeoutMs} ms. Threads:\n${threads.join("\n")}`);
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}
