// The examples/ client runs against the test server as an integrator would: plain fetch, the
// local demo key, a CSV upload, a study as a job, and the verdict printed.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { closeDb } from "../../db/index";
import { LoadProfile, Study } from "../../db/models";
import { baseUrl } from "../support/http";
import { testDb } from "../support/db";

beforeAll(() => {
  testDb();
});
afterAll(async () => {
  await closeDb();
});

describe("examples/duskline-client.ts", () => {
  it("uploads, runs a study as a job, waits and prints the verdict the database holds", async () => {
    const { stdout } = await promisify(execFile)(process.execPath, ["--import", "tsx", "examples/duskline-client.ts"], {
      env: { ...process.env, DUSKLINE_URL: baseUrl(), DUSKLINE_KEY: process.env.DEMO_API_KEY ?? "dl_demo_local_only_key" },
      timeout: 150_000,
    });
    const uploaded = stdout.match(/uploaded profile (\d+): (\d+) samples/);
    expect(uploaded, stdout).not.toBeNull();
    // examples/sample-load.csv: three days of 15-minute readings.
    expect(Number(uploaded![2])).toBe(288);
    expect((await LoadProfile.findByPk(Number(uploaded![1])))!.samples).toBe(288);
    expect(stdout).toMatch(/study queued as job \d+/);
    const printed = stdout.match(/study (\d+) of crossing (\d+): verdict (\S+)/);
    expect(printed, stdout).not.toBeNull();
    const study = (await Study.findByPk(Number(printed![1])))!;
    expect(study.crossingId).toBe(Number(printed![2]));
    expect(printed![3]).toBe(study.verdict);
  }, 180_000);
});
