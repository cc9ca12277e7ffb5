// The API keeps its contract: the served document is valid OpenAPI 3.1; every documented GET
// (ids from the demo data) and every documented POST example answers as the document says;
// and every /api/v1 answer the integration tests received (recorded by
// tests/support/api-recorder.ts) validates against the document. Runs after the integration
// tests (vitest groupOrder). Paths are read from the document, so new endpoints are covered.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { Validator } from "@seriousme/openapi-schema-validator";
import { closeDb } from "../../db/index";
import { Circuit, Crossing, DeviceProfile, Job, LightingOption, LoadProfile, Study, User } from "../../db/models";
import { ContractChecker, type RecordedAnswer } from "../support/api-contract";
import { ANSWERS_DIR } from "../support/api-recorder-dir";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

type Json = Record<string, unknown>;
let doc: { paths: Record<string, Json>; servers: { url: string }[] };
let checker: ContractChecker;
let engineer: Client;
const ids: Record<string, string> = {};
const NO_SUCH_ID = "999999999";

beforeAll(async () => {
  testDb();
  doc = await (await fetch(baseUrl() + "/api/v1/openapi.json")).json();
  checker = new ContractChecker(doc);
  engineer = await signIn("engineer@example.com");
  const admin = (await User.findOne({ where: { email: "admin@example.com" } }))!;
  const org = admin.organisationId;
  const first = async (model: typeof Circuit | typeof Crossing | typeof LoadProfile | typeof DeviceProfile | typeof Study) =>
    String((await (model as typeof Circuit).findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!.id);
  const option = (await LightingOption.findOne({ where: { organisationId: org }, order: [["id", "ASC"]] }))!;
  Object.assign(ids, {
    circuitId: await first(Circuit),
    crossingId: String(option.crossingId),
    optionId: String(option.id),
    profileId: await first(LoadProfile),
    deviceId: await first(DeviceProfile),
    studyId: await first(Study),
    jobId: String((await Job.create({ organisationId: org, kind: "contract.idle", input: {}, createdBy: admin.id })).id),
  });
});
afterAll(async () => {
  await closeDb();
});

const concrete = (template: string) => "/api/v1" + template.replace(/\{(\w+)\}/g, (_, name: string) => ids[name] ?? NO_SUCH_ID);

async function answerOf(method: string, path: string, body?: { type: string; example: unknown }): Promise<RecordedAnswer> {
  const res = await fetch(baseUrl() + path, {
    method,
    headers: { cookie: engineer.cookie, "x-forwarded-for": engineer.address, ...(body ? { "content-type": body.type } : {}) },
    body: body ? (typeof body.example === "string" ? body.example : JSON.stringify(body.example)) : undefined,
  });
  return { method, path: new URL(path, baseUrl()).pathname, status: res.status, contentType: res.headers.get("content-type") ?? "", body: await res.text() };
}

describe("API contract", () => {
  it("the served document is valid OpenAPI 3.1", async () => {
    const result = await new Validator().validate(doc as never);
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
  });

  it("every operation names its scope, and every POST takes an Idempotency-Key", () => {
    const missing: string[] = [];
    for (const [template, item] of Object.entries(doc.paths)) {
      for (const method of ["get", "post", "put", "delete", "patch"]) {
        const op = item[method] as Json | undefined;
        if (!op) continue;
        const security = (op.security as Json[] | undefined) ?? [];
        const scoped = security.some((s) => Array.isArray(s.apiKey) && (s.apiKey as string[]).length === 1);
        if (!scoped) missing.push(`${method} ${template}: no scope`);
        const responses = op.responses as Json;
        for (const code of ["401", "403", "429"]) if (!(code in responses)) missing.push(`${method} ${template}: no ${code}`);
        if (method === "post" && !((op.parameters as Json[] | undefined) ?? []).some((p) => p.name === "Idempotency-Key")) missing.push(`post ${template}: no Idempotency-Key`);
      }
    }
    expect(missing).toEqual([]);
  });

  it("every documented GET answers as documented", async () => {
    const failures: string[] = [];
    for (const template of Object.keys(doc.paths)) {
      if (!doc.paths[template].get) continue;
      const answer = await answerOf("GET", concrete(template));
      const problem = checker.check(answer);
      if (problem) failures.push(problem);
      if (answer.status >= 500) failures.push(`GET ${template}: ${answer.status}`);
    }
    expect(failures).toEqual([]);
  });

  it("every documented POST example is accepted (2xx) and answers as documented", async () => {
    const failures: string[] = [];
    for (const [template, item] of Object.entries(doc.paths)) {
      const post = item.post as { requestBody?: { content: Record<string, { example?: unknown }> }; parameters?: { name: string; in: string; example?: string }[] } | undefined;
      const [type, media] = Object.entries(post?.requestBody?.content ?? {})[0] ?? [];
      if (!type || media?.example === undefined) continue;
      // Query parameters with examples (an upload's column mapping) go along.
      const query = new URLSearchParams((post?.parameters ?? []).filter((p) => p.in === "query" && p.example !== undefined).map((p) => [p.name, String(p.example)]));
      const answer = await answerOf("POST", concrete(template) + (query.size ? `?${query}` : ""), { type, example: media.example });
      const problem = checker.check(answer);
      if (problem) failures.push(problem);
      // A review move depends on the review's state (409/422 are the documented refusals).
      const acceptable = answer.status < 300 || (template.endsWith("/review") && [409, 422].includes(answer.status));
      if (!acceptable) failures.push(`POST ${template} example: ${answer.status} ${answer.body.slice(0, 300)}`);
    }
    expect(failures).toEqual([]);
  });

  it("every /api/v1 answer the integration tests received validates against the document", () => {
    const answers: RecordedAnswer[] = existsSync(ANSWERS_DIR)
      ? readdirSync(ANSWERS_DIR).flatMap((f) => readFileSync(`${ANSWERS_DIR}/${f}`, "utf8").split("\n").filter(Boolean).map((l) => JSON.parse(l) as RecordedAnswer))
      : [];
    const failures = [...new Set(answers.map((a) => checker.check(a)).filter((p): p is string => p !== null))];
    console.log(`[contract] ${answers.length} recorded answers checked`);
    expect(failures).toEqual([]);
  });
});
