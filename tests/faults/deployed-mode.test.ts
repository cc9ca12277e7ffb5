// An instance started without DUSKLINE_LOCAL (as a deployment is) refuses the local demo API key,
// whose secret is public in the README, while the same database's ordinary keys keep working.
// The shared test server runs in local mode, so this needs an instance of its own.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "../../db/index";
import { ApiKey, User } from "../../db/models";
import { apiKeyHash, DEMO_KEY_PREFIX, newApiKey } from "../../app/utils/api-keys.server";
import { baseUrl, signIn } from "../support/http";
import { testDb } from "../support/db";
import { secondPort, startApp, type AppProcess } from "../support/app-process";

const DEMO_KEY = process.env.DEMO_API_KEY ?? "dl_demo_local_only_key";
let deployed: AppProcess;

beforeAll(async () => {
  testDb();
  deployed = await startApp(secondPort(), undefined, { DUSKLINE_LOCAL: "false" });
});
afterAll(async () => {
  await deployed?.stop();
  await closeDb();
});

const devices = (url: string, key: string) => fetch(`${url}/api/v1/devices?limit=1`, { headers: { authorization: `Bearer ${key}` } });

describe("an instance outside local mode", () => {
  it("refuses the demo key with 401 'unknown' while the local instance takes it", async () => {
    expect(await ApiKey.count({ where: { prefix: DEMO_KEY_PREFIX, revokedAt: null } })).toBeGreaterThan(0);
    expect((await devices(baseUrl(), DEMO_KEY)).status).toBe(200);
    const refused = await devices(deployed.url, DEMO_KEY);
    expect(refused.status).toBe(401);
    expect(refused.headers.get("content-type")).toContain("application/problem+json");
    expect(JSON.stringify(await refused.json()).toLowerCase()).toContain("unknown");
  });

  it("accepts an ordinary key of the same organisation", async () => {
    const admin = (await User.findOne({ where: { email: "admin@example.com" } }))!;
    const { key, prefix } = newApiKey();
    await ApiKey.create({ organisationId: admin.organisationId, name: `Deployed mode ${prefix}`, prefix, keyHash: apiKeyHash(key), role: "engineer", createdBy: admin.id, scopes: JSON.stringify(["devices:read"]) });
    expect((await devices(deployed.url, key)).status).toBe(200);
  });

  it("does not serve the local mail catcher, not even to a signed-in admin", async () => {
    const admin = await signIn("admin@example.com"); // on the local instance; the session is shared
    const at = (url: string) => fetch(`${url}/dev/mail`, { redirect: "manual", headers: { cookie: admin.cookie, "x-forwarded-for": admin.address } });
    expect((await at(baseUrl())).status).toBe(200);
    expect((await at(deployed.url)).status).toBe(404);
  });
});
