// Set-up file of the integration tests: every answer from /api/v1 that a test receives through
// fetch is written to .data/api-answers/, and tests/contract/ checks them all against the
// OpenAPI document after the integration tests have run.
import { appendFileSync, mkdirSync } from "node:fs";
import { randomUUID } from "node:crypto";
import { expect } from "vitest";
import type { RecordedAnswer } from "./api-contract";
import { ANSWERS_DIR } from "./api-recorder-dir";
const file = `${ANSWERS_DIR}/${process.pid}-${randomUUID().slice(0, 8)}.jsonl`;
const original = globalThis.fetch;
const MAX_BODY = 2_000_000;

globalThis.fetch = async (input: RequestInfo | URL, init?: RequestInit) => {
  const response = await original(input, init);
  const url = new URL(input instanceof Request ? input.url : String(input));
  if (!url.pathname.startsWith("/api/v1/") || url.pathname === "/api/v1/openapi.json") return response;
  const method = (init?.method ?? (input instanceof Request ? input.method : "GET")).toUpperCase();
  const contentType = response.headers.get("content-type") ?? "";
  const json = /json/.test(contentType);
  let body = "";
  if (json) {
    body = await response.clone().text();
    if (body.length > MAX_BODY) return response; // a huge study answer: checked by its own test's asserts
  }
  const answer: RecordedAnswer = { method, path: url.pathname, status: response.status, contentType, body, test: expect.getState().currentTestName };
  mkdirSync(ANSWERS_DIR, { recursive: true });
  appendFileSync(file, JSON.stringify(answer) + "\n");
  return response;
};
