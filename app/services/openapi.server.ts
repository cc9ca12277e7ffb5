// The OpenAPI 3.1 document of /api/v1, generated from the same zod schemas that validate
// the requests (zod 4's z.toJSONSchema), so the contract cannot drift from the code.
import { z } from "zod";
import { circuitSchema, crossingSchema } from "../../shared/circuit-schemas";
import { ingestOptionsSchema, TIMESTAMP_RANGE_DESCRIPTION } from "../../shared/ingest-options";
import { feasibilityRequestSchema, feasibilityResponseSchema, studyResultSchema } from "../../shared/study-schemas";
import { studyRequestSchema, whatIfSchema } from "../../shared/study-forms";
import { markerLayoutRequestSchema, markerLayoutResponseSchema } from "../../shared/marker-schemas";
import { noticeCheckRequestSchema, noticeCheckResponseSchema } from "../../shared/notice-schemas";
import { reviewMoveSchema } from "../../shared/review-schemas";

const schema = (s: z.ZodType, io: "input" | "output" = "input") => {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, { io, unrepresentable: "any" }) as Record<string, unknown>;
  return rest;
};

const problemSchema = {
  type: "object",
  description: "RFC 9457 problem details",
  properties: {
    type: { type: "string" },
    status: { type: "integer" },
    title: { type: "string" },
    detail: { type: "string" },
    errors: { type: "array", items: { type: "object", properties: { path: { type: "string" }, message: { type: "string" } }, required: ["path", "message"] } },
    examples: { type: "array", description: "CSV rows that failed, with their 1-based line numbers", items: { type: "object" } },
  },
  required: ["status", "title"],
};

const json = (ref: string) => ({ "application/json": { schema: { $ref: `#/components/schemas/${ref}` } } });
const problems = (...codes: number[]) =>
  Object.fromEntries(codes.map((c) => [String(c), { description: "Problem", content: { "application/problem+json": { schema: { $ref: "#/components/schemas/Problem" } } } }]));
const idParam = (name: string) => ({ name, in: "path", required: true, schema: { type: "integer", minimum: 1 } });

export function openApiDocument(serverUrl: string) {
  return {
    openapi: "3.1.0",
    info: {
      title: "Duskline API",
      version: "1.0.0",
      description:
        "Feasibility of line-powered obstruction lights per crossing. A planning aid: the governing rule set, local codes, the aviation authority and licensed engineering judgement take precedence.",
    },
    servers: [{ url: serverUrl }],
    security: [{ apiKey: [] }, { session: [] }],
    components: {
      securitySchemes: {
        apiKey: { type: "http", scheme: "bearer", description: "An API key created by an administrator (Admin → API keys), sent as Authorization: Bearer <key>. It acts with the role chosen for it." },
        session: { type: "apiKey", in: "cookie", name: "__duskline", description: "Session cookie from signing in at /login." },
      },
      schemas: {
        Problem: problemSchema,
        Circuit: schema(circuitSchema),
        Crossing: schema(crossingSchema),
        ReviewMove: schema(reviewMoveSchema),
        IngestOptions: schema(ingestOptionsSchema),
        FeasibilityRequest: schema(feasibilityRequestSchema),
        FeasibilityResponse: schema(feasibilityResponseSchema, "output"),
        StudyRequest: schema(studyRequestSchema),
        StudyResult: schema(studyResultSchema, "output"),
        WhatIf: schema(whatIfSchema),
        MarkerLayoutRequest: schema(markerLayoutRequestSchema),
        MarkerLayout: schema(markerLayoutResponseSchema, "output"),
        NoticeCheckRequest: schema(noticeCheckRequestSchema),
        NoticeCheck: schema(noticeCheckResponseSchema, "output"),
      },
    },
    paths: {
      "/circuits": {
        get: { summary: "List circuits", responses: { "200": { description: "Circuits" }, ...problems(401) } },
        post: { summary: "Create a circuit", requestBody: { content: json("Circuit") }, responses: { "201": { description: "Created" }, ...problems(400, 401, 403, 409, 413, 415, 422) } },
      },
      "/circuits/{circuitId}": {
        parameters: [idParam("circuitId")],
        get: { summary: "A circuit with its crossings", responses: { "200": { description: "Circuit" }, ...problems(401, 404) } },
        put: { summary: "Update a circuit", requestBody: { content: json("Circuit") }, responses: { "200": { description: "Updated" }, ...problems(400, 401, 403, 404, 409, 413, 415, 422) } },
        delete: { summary: "Delete a circuit", responses: { "204": { description: "Deleted" }, ...problems(401, 403, 404) } },
      },
      "/circuits/{circuitId}/crossings": {
        parameters: [idParam("circuitId")],
        get: { summary: "Crossings of a circuit", responses: { "200": { description: "Crossings" }, ...problems(401, 404) } },
        post: { summary: "Create a crossing", requestBody: { content: json("Crossing") }, responses: { "201": { description: "Created" }, ...problems(400, 401, 403, 404, 409, 413, 415, 422) } },
      },
      "/circuits/{circuitId}/profiles": {
        parameters: [idParam("circuitId")],
        get: { summary: "Load profiles of a circuit with their quality reports", responses: { "200": { description: "Profiles" }, ...problems(401, 404) } },
        post: {
          summary: "Upload a current history (raw CSV body, streamed)",
          description: `The mapping travels as query parameters with the names of IngestOptions. Nothing is saved when the upload fails. ${TIMESTAMP_RANGE_DESCRIPTION} Size limit 500 MB by default (UPLOAD_MAX_BYTES), counted while the body streams: past it, 413 at once.`,
          parameters: Object.keys((schema(ingestOptionsSchema) as { properties?: object }).properties ?? {}).map((name) => ({ name, in: "query", required: name === "timestampColumn", schema: { type: "string" } })),
          requestBody: { required: true, content: { "text/csv": { schema: { type: "string" } } } },
          responses: { "201": { description: "Stored, with the quality report" }, ...problems(400, 401, 403, 404, 413, 415, 422) },
        },
      },
      "/crossings/{crossingId}": {
        parameters: [idParam("crossingId")],
        get: { summary: "A crossing", responses: { "200": { description: "Crossing" }, ...problems(401, 404) } },
        put: { summary: "Update a crossing", requestBody: { content: json("Crossing") }, responses: { "200": { description: "Updated" }, ...problems(400, 401, 403, 404, 409, 413, 415, 422) } },
        delete: { summary: "Delete a crossing", responses: { "204": { description: "Deleted" }, ...problems(401, 403, 404) } },
      },
      "/crossings/{crossingId}/review": {
        parameters: [idParam("crossingId")],
        get: { summary: "The crossing's review: state, staleness with what changed, decision, signer, history", responses: { "200": { description: "{review}" }, ...problems(401, 404) } },
        post: {
          summary: "Move the review: submit (engineer or consultant, with a note), approve or return (manager, with decision and comment), reopen",
          description: "409 when the move is not possible from the current state (the problem names it in `state`); 403 when the role may not make it (administrators take no part in review).",
          requestBody: { required: true, content: json("ReviewMove") },
          responses: { "200": { description: "{review}" }, ...problems(400, 401, 403, 404, 409, 422) },
        },
      },
      "/profiles/{profileId}": {
        parameters: [idParam("profileId")],
        get: { summary: "A load profile with its quality report, data version and fingerprint (SHA-256 of the stored samples)", responses: { "200": { description: "Profile" }, ...problems(401, 404) } },
        put: {
          summary: "Replace a load profile's data with a new export (raw CSV body, streamed)",
          description: "Mapping as for an upload. Samples, phases and quality report become the new file's and the data version goes up by one. Studies run before keep the data they were computed from (`keptForStudies`): their pages still show it and say the data changed since.",
          parameters: Object.keys((schema(ingestOptionsSchema) as { properties?: object }).properties ?? {}).filter((name) => name !== "name").map((name) => ({ name, in: "query", required: name === "timestampColumn", schema: { type: "string" } })),
          requestBody: { required: true, content: { "text/csv": { schema: { type: "string" } } } },
          responses: { "200": { description: "Replaced: the profile, the new quality report, keptForStudies" }, ...problems(400, 401, 403, 404, 413, 415, 422) },
        },
        delete: { summary: "Delete a load profile", responses: { "204": { description: "Deleted" }, ...problems(401, 403, 404) } },
      },
      "/profiles/{profileId}/append": {
        parameters: [idParam("profileId")],
        post: {
          summary: "Append a newer export to a load profile (raw CSV body, streamed)",
          description: "Mapping as for an upload. The new file wins over its whole time span: stored samples from its first to its last timestamp are replaced. The quality report is rebuilt.",
          parameters: Object.keys((schema(ingestOptionsSchema) as { properties?: object }).properties ?? {}).filter((name) => name !== "name").map((name) => ({ name, in: "query", required: name === "timestampColumn", schema: { type: "string" } })),
          requestBody: { required: true, content: { "text/csv": { schema: { type: "string" } } } },
          responses: { "200": { description: "Appended: samples added and replaced, the rebuilt quality report" }, ...problems(400, 401, 403, 404, 413, 415, 422) },
        },
      },
      "/feasibility": {
        post: {
          summary: "Stateless feasibility study (nothing saved)",
          description: `Samples or CSV in, the same engine as saved studies. Body limit 64 MB by default (API_MAX_BODY_BYTES), counted while the body streams (chunked too): past it, 413 at once. ${TIMESTAMP_RANGE_DESCRIPTION}`,
          requestBody: { required: true, content: json("FeasibilityRequest") },
          responses: { "200": { description: "Results", content: json("FeasibilityResponse") }, ...problems(400, 401, 413, 415, 422) },
        },
      },
      "/studies": {
        post: {
          summary: "Run and save a study of a crossing",
          description: "Runs at once (201) unless `async` is true or the load profile has 500,000 samples or more (about a year at 1-minute resolution): then it is queued as a job (202, Location: /api/v1/jobs/{jobId}).",
          requestBody: { required: true, content: json("StudyRequest") },
          responses: { "201": { description: "Saved study with results" }, "202": { description: "Queued as a job; follow Location" }, ...problems(400, 401, 403, 404, 413, 415, 422) },
        },
      },
      "/jobs/{jobId}": {
        parameters: [idParam("jobId")],
        get: {
          summary: "A job: state (queued, running, done, failed), progress 0–1, and when done the result link (resultUrl); when failed the error as problem fields",
          responses: { "200": { description: "Job" }, ...problems(401, 404) },
        },
      },
      "/studies/{studyId}": {
        parameters: [idParam("studyId")],
        get: { summary: "A saved study: inputs, results and solver answers", responses: { "200": { description: "Study" }, ...problems(401, 404) } },
      },
      "/studies/{studyId}/what-if": {
        parameters: [idParam("studyId")],
        post: { summary: "Recompute a saved study with another minimum current, storage or load scale (nothing saved)", requestBody: { content: json("WhatIf") }, responses: { "200": { description: "Summary against the saved run" }, ...problems(400, 401, 404, 409) } },
      },
      "/portfolio": {
        get: { summary: "Go/no-go summary across crossings (latest study of each)", responses: { "200": { description: "Counts, rows and worst crossings" }, ...problems(401) } },
      },
      "/markers/layout": {
        post: { summary: "Marker layout of a span under the FAA or ICAO rule set", requestBody: { required: true, content: json("MarkerLayoutRequest") }, responses: { "200": { description: "Layout", content: json("MarkerLayout") }, ...problems(400, 401) } },
      },
      "/notice-check": {
        post: {
          summary: "Whether the structure needs notice to the FAA under 14 CFR 77.9 (a) and (b), with the reason for each rule",
          requestBody: { required: true, content: json("NoticeCheckRequest") },
          responses: { "200": { description: "Notice required or not, rule by rule", content: json("NoticeCheck") }, ...problems(401, 413, 415, 422) },
        },
      },
    },
  };
}
