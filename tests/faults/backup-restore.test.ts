// npm run db:backup / db:restore: the demo data goes through a dump and back, and every table
// of the restored database matches the original (row count and CHECKSUM TABLE).
import { execFile } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { rootSql } from "../support/db-instance";

const run = promisify(execFile);
const source = process.env.DB_NAME!;
const target = `${source}_restore`;
const backupDir = mkdtempSync(path.join(tmpdir(), "duskline-backup-"));

function npmScript(script: string, args: string[], env: Record<string, string> = {}) {
  return run("npm", ["run", "--silent", script, "--", ...args], { env: { ...process.env, BACKUP_DIR: backupDir, ...env } });
}

async function tableFacts(database: string): Promise<Record<string, { rows: number; checksum: string }>> {
  const tables = await rootSql(`SELECT table_name FROM information_schema.tables WHERE table_schema = '${database}' ORDER BY table_name`);
  const facts: Record<string, { rows: number; checksum: string }> = {};
  for (const table of tables) {
    const [rows] = await rootSql(`SELECT COUNT(*) FROM \`${table}\``, database);
    const [checksum] = await rootSql(`CHECKSUM TABLE \`${table}\` EXTENDED`, database);
    facts[table] = { rows: Number(rows), checksum: checksum.split("\t")[1] };
  }
  return facts;
}

beforeAll(async () => {
  await rootSql(`DROP DATABASE IF EXISTS \`${target}\`; CREATE DATABASE \`${target}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
    GRANT ALL PRIVILEGES ON \`${target}\`.* TO '${process.env.DB_USER}'@'127.0.0.1';`);
});
afterAll(async () => {
  await rootSql(`DROP DATABASE IF EXISTS \`${target}\``);
  rmSync(backupDir, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("round-trips the demo data table by table", async () => {
    const backup = await npmScript("db:backup", []);
    const files = readdirSync(backupDir);
    expect(files).toHaveLength(1);
    expect(files[0]).toMatch(new RegExp(`^${source}-\\d{8}-\\d{6}Z\\.sql\\.gz$`));
    expect(backup.stdout).toContain(files[0]);
    const file = path.join(backupDir, files[0]);

    await npmScript("db:restore", [file], { DB_NAME: target });
    const original = await tableFacts(source);
    const restored = await tableFacts(target);
    // The demo has people, circuits, profiles with their sample BLOBs, and the migration log.
    for (const table of ["users", "circuits", "load_profiles", "load_profile_series", "device_profiles", "schema_migrations"]) {
      expect(original[table]?.rows, table).toBeGreaterThan(0);
    }
    expect(Object.keys(restored)).toEqual(Object.keys(original));
    expect(restored).toEqual(original);
  });

  it("refuses a database that is not empty unless --force", async () => {
    await npmScript("db:backup", []);
    const file = path.join(backupDir, readdirSync(backupDir).sort().at(-1)!);
    const refused = await npmScript("db:restore", [file], { DB_NAME: target }).then(
      () => "restored",
      (error: { code: number; stderr: string }) => `${error.code} ${error.stderr}`,
    );
    expect(refused).toMatch(/^1 .*not empty/);
    await rootSql("DELETE FROM audit_log LIMIT 1", target);
    await npmScript("db:restore", [file, "--force"], { DB_NAME: target });
    expect(await tableFacts(target)).toEqual(await tableFacts(source));
  });
});
