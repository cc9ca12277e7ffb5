// The OpenAPI 3.1 document of /api/v1. Request bodies come from the same zod schemas that
// validate the requests (zod 4's z.toJSONSchema), so the contract cannot drift from the code;
// responses are described by the record shapes below. Every operation names its scope, its
// errors and the rate-limit headers. Adding an endpoint: one entry in `paths` built with `op()`.
import { z } from "zod";
import { circuitSchema, crossingSchema } from "../../shared/circuit-schemas";
import { ingestOptionsSchema, TIMESTAMP_RANGE_DESCRIPTION } from "../../shared/ingest-options";
import { feasibilityRequestSchema, feasibilityResponseSchema, studyResultSchema } from "../../shared/study-schemas";
import { OPTIMISE_LIMITS, optimiseRequestSchema, optimiseResponseSchema } from "../../shared/optimise-schemas";
import { circuitStudiesRequestSchema, studyRequestSchema, whatIfSchema } from "../../shared/study-forms";
import { webhookInputSchema } from "../../shared/webhook-schemas";
import { markerLayoutRequestSchema, markerLayoutResponseSchema } from "../../shared/marker-schemas";
import { noticeCheckRequestSchema, noticeCheckResponseSchema } from "../../shared/notice-schemas";
import { REVIEW_DECISIONS, REVIEW_STATES, reviewMoveSchema } from "../../shared/review-schemas";
import { CROSSING_KINDS } from "../../shared/circuit-schemas";
import { VERDICT_STATUSES } from "../../shared/study-schemas";
import { deviceProfileSchema } from "../../shared/device-forms";
import { crossingDetailsSchema } from "../../shared/crossing-details-schemas";
import { lightingOptionFormSchema } from "../../shared/lighting-option-schemas";
import { API_SCOPES, API_SCOPE_LABELS, ROLE_SCOPES, type ApiScope } from "../../shared/api-scopes";
import { LIST_LIMIT_DEFAULT, LIST_LIMIT_MAX } from "../../shared/api-schemas";
import { ROLES } from "../../shared/roles";

type Json = Record<string, unknown>;

const schema = (s: z.ZodType, io: "input" | "output" = "input") => {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(s, { io, unrepresentable: "any" }) as Json;
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
    scope: { type: "string", description: "On a 403 for a key: the scope the endpoint needs" },
    reason: { type: "string", enum: ["malformed", "unknown", "expired", "revoked", "stopped"], description: "On a 401 for a key: why it was refused" },
    state: { type: "string", description: "On a refused review move: the review's current state" },
  },
  required: ["status", "title"],
};

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const json = (name: string) => ({ "application/json": { schema: ref(name) } });
const isoTime = { type: "string", format: "date-time" };
const id = { type: "integer", minimum: 1 };
const nullable = (s: Json) => ({ anyOf: [s, { type: "null" }] });
/** A record: the fields named are typed, further fields are allowed (additions are not breaking). */
const record = (properties: Json, required: string[] = Object.keys(properties)) => ({ type: "object", properties, required });
const list = (key: string, item: string) => record({ [key]: { type: "array", items: ref(item) }, next: { ...nullable({ type: "string" }), description: "Cursor of the next page (pass as `cursor`), null on the last page" } });

/** A profile's recorded temperatures (the upload's temperature column), in profile records and upload answers. */
const PROFILE_TEMPERATURE = { ...nullable({ type: "object", properties: { column: { type: "string" }, unit: { type: "string", enum: ["C", "F"] }, months: { type: "object", description: "YYYY-MM (a month of the circuit's calendar; UTC for profiles uploaded before circuit zones counted) → {meanC, readings}" } }, required: ["column", "unit", "months"] }), description: "Monthly means of the upload's temperature column (csvOptions/mapping temperatureColumn), used for cold-weather storage; null when none was mapped" };

const RATE_HEADERS = {
  "RateLimit-Limit": { description: "Requests allowed per minute for this caller", schema: { type: "integer" } },
  "RateLimit-Remaining": { description: "Requests left in the current minute", schema: { type: "integer" } },
  "RateLimit-Reset": { description: "Seconds until the current minute's window ends", schema: { type: "integer" } },
};
const ERROR_TEXT: Record<number, string> = {
  400: "Invalid request: the problem's `errors` name each field",
  401: "No credential, or a malformed, unknown, expired or revoked key (`reason`)",
  403: "The key lacks the scope (`scope`), or the signed-in role may not do this",
  404: "No such record in the caller's organisation (another organisation's records are not found either)",
  405: "Method not allowed",
  409: "Conflict with the current state (a unique name, a review move, an Idempotency-Key in use)",
  413: "Body over the size limit",
  415: "Wrong content type",
  422: "Unknown fields (named in `errors`), a value the record cannot hold, or an Idempotency-Key reused with another request",
  429: "Over the rate limit: wait `Retry-After` seconds",
  503: "The database is unreachable, or the engine process computing the request stopped: nothing was saved, retry after `Retry-After`",
};
const problems = (codes: number[]) =>
  Object.fromEntries(
    codes.map((c) => [
      String(c),
      {
        description: ERROR_TEXT[c] ?? "Problem",
        headers: c === 429 || c === 503 ? { "Retry-After": { description: "Seconds to wait", schema: { type: "integer" } }, ...RATE_HEADERS } : RATE_HEADERS,
        content: { "application/problem+json": { schema: ref("Problem") } },
      },
    ]),
  );
const ok = (description: string, schemaName?: string, extra: Json = {}) => ({ description, headers: RATE_HEADERS, ...(schemaName ? { content: json(schemaName) } : {}), ...extra });
const createdResponse = (description: string, schemaName: string) => ({
  description,
  headers: { ...RATE_HEADERS, Location: { description: "Address of the new record", schema: { type: "string" } } },
  content: json(schemaName),
});
const noContent = { description: "Done; no body", headers: RATE_HEADERS };

const idParam = (name: string) => ({ name, in: "path", required: true, schema: { type: "integer", minimum: 1 } });
const listParams = [
  { name: "limit", in: "query", required: false, schema: { type: "integer", minimum: 1, maximum: LIST_LIMIT_MAX, default: LIST_LIMIT_DEFAULT } },
  { name: "cursor", in: "query", required: false, schema: { type: "string" }, description: "The `next` value of the previous page" },
];
const idempotencyHeader = {
  name: "Idempotency-Key",
  in: "header",
  required: false,
  schema: { type: "string", pattern: "^[\\x21-\\x7e]{1,255}$" },
  description: "A retry with the same key and request returns the first response (Idempotent-Replayed: true) and creates nothing; the same key with another request is a 422. Kept 24 hours.",
};

interface Operation {
  summary: string;
  description?: string;
  /** The scope a key needs; signed-in people have their role's scopes. */
  scope: ApiScope;
  /** Roles a session (or a key made before scopes) must have, as on the pages. */
  roles?: string[];
  parameters?: Json[];
  body?: Json;
  responses: Json;
  /** Error statuses beyond the ones every authenticated operation may answer (401, 403, 429, 503). */
  errors?: number[];
}

/** One operation: security with its scope, the Idempotency-Key on POST, the common errors. */
function op(method: "get" | "post" | "put" | "delete", o: Operation) {
  const roleNote = o.roles ? ` Signed in, the role must be ${o.roles.join(" or ")}.` : "";
  // A list refuses a bad limit or cursor (400) and an unknown query parameter (422).
  const listing = o.parameters?.some((p) => p.name === "limit") ? [400, 422] : [];
  const codes = [...new Set([401, 403, 429, 503, ...listing, ...(o.errors ?? [])])].sort();
  return {
    summary: o.summary,
    description: `${o.description ? `${o.description} ` : ""}Scope: \`${o.scope}\`.${roleNote}`,
    security: [{ apiKey: [o.scope] }, { session: [] }],
    "x-scope": o.scope,
    ...(o.parameters || method === "post" ? { parameters: [...(o.parameters ?? []), ...(method === "post" ? [idempotencyHeader] : [])] } : {}),
    ...(o.body ? { requestBody: { required: true, content: o.body } } : {}),
    responses: { ...o.responses, ...problems(codes) },
  };
}

const uploadParameters = (omit: string[] = []) =>
  Object.keys((schema(ingestOptionsSchema) as { properties?: object }).properties ?? {})
    .filter((name) => !omit.includes(name))
    .map((name) => ({ name, in: "query", required: name === "timestampColumn", schema: { type: "string" }, ...(name in UPLOAD_QUERY_EXAMPLE ? { example: UPLOAD_QUERY_EXAMPLE[name] } : {}) }));
/** The mapping of the example CSV below. */
const UPLOAD_QUERY_EXAMPLE: Record<string, string> = { timestampColumn: "time", currentColumn: "amps", name: "Example export" };

const EXAMPLES = {
  circuit: { name: "Example Ridge Tie", voltageKv: 115, phases: 3, normalRatingA: 600 },
  crossing: { name: "Example Creek", lat: 38.6, lon: -92.2, spanLength: { value: 900, unit: "ft" }, kind: "river" },
  device: { name: "Example lit sphere", minCurrentA: 30, maxCurrentA: 2000, harvestW: "min(0.005*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 20, chargeEfficiency: 0.9, selfDischargePctPerDay: 0.5, initialCharge: 1 },
  option: { name: "Solar beacons", kind: "solar", unitPrice: 2400, installationMethod: "helicopter", mobilisation: 8000, ratePerHour: 3000, minutesPerUnit: 20, annualMaintenance: 150, serviceLifeYears: 10, horizonYears: 30, discountRatePercent: 7, feasibilityStatus: "go", feasibilityJustification: "Clear southern sky at both supports." },
  feasibility: {
    samples: [["2025-01-01T00:00:00Z", 112.5], ["2025-01-01T00:05:00Z", 108.0]],
    location: { lat: 35.2, lon: -97.4 },
    device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4 },
  },
  markers: { spanLength: { value: 1200, unit: "ft" }, ruleSet: "faa" },
  notice: { heightAgl: { value: 180, unit: "ft" }, siteElevation: { value: 900, unit: "ft" } },
};
const withExample = (name: string, example: unknown) => ({ "application/json": { schema: ref(name), example } });

export function openApiDocument(serverUrl: string) {
  const scopeTable = API_SCOPES.map((s) => `- \`${s}\`: ${API_SCOPE_LABELS[s]}`).join("\n");
  const roleTable = ROLES.map((r) => `- ${r}: ${ROLE_SCOPES[r].join(", ")}`).join("\n");
  return {
    openapi: "3.1.0",
    info: {
      title: "Duskline API",
      version: "1.1.0",
      description: [
        "Feasibility of line-powered obstruction lights per crossing. A planning aid: the governing rule set, local codes, the aviation authority and licensed engineering judgement take precedence.",
        "## Authentication\nSend `Authorization: Bearer <key>` with a key from Admin → API keys (shown once, stored as a hash, recognisable by its prefix), or the session cookie from signing in. Missing, malformed, unknown, expired or revoked keys get 401; a key without the operation's scope 403; another organisation's records 404.",
        `## Scopes\n${scopeTable}\n\nSigned-in people, and keys made before scopes, have the scopes of their role:\n${roleTable}`,
        `## Lists\nLists take \`limit\` (default ${LIST_LIMIT_DEFAULT}, at most ${LIST_LIMIT_MAX}) and \`cursor\` (opaque) and return \`next\`: the cursor of the next page, or null. Items come in creation order.`,
        "## Idempotency\nEvery POST accepts `Idempotency-Key`: a retry with the same key and the same request returns the first response (`Idempotent-Replayed: true`) and creates nothing; the same key with another request is a 422. Keys are kept 24 hours, per organisation.",
        "## Rate limits\nEach key, and each signed-in person, may make 600 requests a minute by default (API_RATE_LIMIT_PER_MINUTE; a key may carry its own limit); calls without a valid credential 60 a minute per client address. Every answer carries `RateLimit-Limit`, `RateLimit-Remaining` and `RateLimit-Reset`; over the limit, 429 with `Retry-After`. The counts live in the database, so every app instance shares them.",
        "## Errors\nRFC 9457 `application/problem+json` with `status`, `title`, `detail` and, for fields, `errors: [{path, message}]`. Unknown fields in a body are a 422 naming them.",
      ].join("\n\n"),
    },
    servers: [{ url: serverUrl }],
    security: [{ apiKey: [] }, { session: [] }],
    components: {
      securitySchemes: {
        apiKey: { type: "http", scheme: "bearer", description: "An API key created by an administrator (Admin → API keys), sent as Authorization: Bearer <key>. It may do what its scopes allow." },
        session: { type: "apiKey", in: "cookie", name: "__duskline", description: "Session cookie from signing in at /login; the role's scopes apply." },
      },
      schemas: {
        Problem: problemSchema,
        Circuit: schema(circuitSchema),
        CircuitRecord: record({ id, name: { type: "string" }, voltageKv: { type: "number" }, phases: { type: "integer" }, createdAt: isoTime, updatedAt: isoTime }),
        CircuitWithCrossings: { allOf: [ref("CircuitRecord"), record({ crossings: { type: "array", items: ref("CrossingRecord") } })] },
        CircuitList: list("circuits", "CircuitRecord"),
        Crossing: schema(crossingSchema),
        CrossingRecord: record({ id, circuitId: id, name: { type: "string" }, lat: { type: "number" }, lon: { type: "number" }, spanLength: record({ value: { type: "number" }, unit: { type: "string" } }), kind: { type: "string" }, details: { type: "object" } }),
        CrossingWithReview: { allOf: [ref("CrossingRecord"), record({ review: { type: "object" } })] },
        CrossingList: list("crossings", "CrossingRecord"),
        CrossingDetails: schema(crossingDetailsSchema),
        CrossingDetailsAnswer: record({ crossingId: id, details: { type: "object" }, plan: { type: "object" }, litSuitability: nullable({ type: "object" }) }),
        ReviewMove: schema(reviewMoveSchema),
        ReviewAnswer: record({ review: record({ state: { type: "string" } }, ["state"]) }),
        IngestOptions: schema(ingestOptionsSchema),
        ProfileRecord: record({ id, circuitId: id, name: { type: "string" }, phases: { type: "array", items: { type: "string" } }, start: isoTime, end: isoTime, samples: { type: "integer" }, quality: { type: "object" }, temperature: PROFILE_TEMPERATURE }),
        ProfileList: list("profiles", "ProfileRecord"),
        ProfileUploaded: record({ profile: record({ id, name: { type: "string" }, samples: { type: "integer" }, temperature: PROFILE_TEMPERATURE }), quality: { type: "object" }, warnings: { type: "array" } }),
        ProfileAppended: record({ profile: { type: "object" }, added: { type: "integer" }, replaced: { type: "integer" }, quality: { type: "object" } }),
        ProfileQuality: record({ profileId: id, quality: { type: "object" } }),
        DeviceProfile: schema(deviceProfileSchema),
        DeviceRecord: record({ id, name: { type: "string" }, note: nullable({ type: "string" }), spec: { type: "object" }, retired: { type: "boolean" }, updatedAt: isoTime }),
        DeviceList: list("devices", "DeviceRecord"),
        LightingOption: schema(lightingOptionFormSchema),
        LightingOptionRecord: record({ id, name: { type: "string" }, kind: { type: "string" }, units: nullable({ type: "integer" }), unitPrice: { type: "number" }, discountRatePercent: { type: "number" } }),
        LightingOptionList: list("options", "LightingOptionRecord"),
        Comparison: record({
          crossingId: id,
          currency: { type: "string" },
          options: {
            type: "array",
            items: record({ id, name: { type: "string" }, kind: { type: "string" }, units: nullable({ type: "integer" }), effectiveUnits: { type: "integer" }, unitsSource: { type: "string", enum: ["stated", "marker layout", "support lights"] }, unitsBasis: { type: "string" } }),
          },
          comparison: { type: "object" },
          latestStudy: nullable({ type: "object" }),
        }),
        FeasibilityRequest: schema(feasibilityRequestSchema),
        FeasibilityResponse: schema(feasibilityResponseSchema, "output"),
        OptimiseRequest: schema(optimiseRequestSchema),
        OptimiseResponse: schema(optimiseResponseSchema, "output"),
        StudyRequest: schema(studyRequestSchema),
        StudyResult: schema(studyResultSchema, "output"),
        StudySummary: record({ id, circuitId: id, crossingId: id, profileId: nullable(id), deviceProfileId: nullable(id), verdict: { type: "string", enum: ["go", "marginal", "no-go", "insufficient-data"] }, availability: nullable({ type: "number" }), createdAt: isoTime }),
        Study: { allOf: [ref("StudySummary"), record({ inputs: { type: "object" }, results: { type: "object" } })] },
        StudyList: list("studies", "StudySummary"),
        WhatIf: schema(whatIfSchema),
        WhatIfAnswer: record({ change: { type: "object" }, device: { type: "object", description: "The device figures and load scale the what-if ran with" }, summary: { type: "object" }, saved: { type: "object" }, charts: { type: "object", description: "What the study's charts draw, recomputed: loadDuration, monthly, hourMonthBelowMin, storage, period, current" } }),
        Job: record({ id, kind: { type: "string" }, state: { type: "string", enum: ["queued", "running", "done", "failed"] }, progress: { type: "number", minimum: 0, maximum: 1 }, resultUrl: nullable({ type: "string" }) }),
        PortfolioRow: record({
          crossingId: id, crossing: { type: "string" }, circuitId: id, circuit: { type: "string" }, voltageKv: nullable({ type: "number" }),
          kind: { type: "string", enum: [...CROSSING_KINDS] }, lat: { type: "number" }, lon: { type: "number" },
          studyId: nullable(id), verdict: nullable({ type: "string", enum: [...VERDICT_STATUSES] }),
          availability: { ...nullable({ type: "number", minimum: 0, maximum: 1 }), description: "Share 0–1 of required darkness lit, latest study" },
          darkHoursPerYear: nullable({ type: "number" }), longestDarkHours: nullable({ type: "number" }), reportablePerYear: nullable({ type: "number" }),
          coverage: { ...nullable({ type: "number", minimum: 0, maximum: 1 }), description: "Share 0–1 of the analysed period with known current" },
          recommendedOption: nullable({ type: "string" }), equivalentAnnualCost: nullable({ type: "number" }), currency: nullable({ type: "string" }),
          reviewState: { type: "string", enum: [...REVIEW_STATES] }, reviewStale: { type: "boolean" }, staleReasons: { type: "array", items: { type: "string" } },
          decision: nullable({ type: "string", enum: [...REVIEW_DECISIONS] }), studiedAt: nullable(isoTime),
        }),
        Portfolio: record({
          counts: record(Object.fromEntries([...VERDICT_STATUSES, "not-studied"].map((k) => [k, { type: "integer", minimum: 0 }]))),
          stale: { type: "integer", minimum: 0, description: "Approvals made stale by a later change" },
          rows: { type: "array", items: ref("PortfolioRow") },
          attention: { type: "array", items: ref("PortfolioRow"), description: "Rows not go, never studied or stale, worst first" },
        }),
        MarkerLayoutRequest: schema(markerLayoutRequestSchema),
        MarkerLayout: schema(markerLayoutResponseSchema, "output"),
        NoticeCheckRequest: schema(noticeCheckRequestSchema),
        NoticeCheck: schema(noticeCheckResponseSchema, "output"),
        CircuitStudiesRequest: schema(circuitStudiesRequestSchema),
        WebhookInput: schema(webhookInputSchema),
      },
    },
    paths: {
      "/circuits": {
        get: op("get", { summary: "List circuits", scope: "circuits:read", parameters: listParams, responses: { "200": ok("A page of circuits", "CircuitList") }, errors: [400] }),
        post: op("post", { summary: "Create a circuit", scope: "circuits:write", roles: ["engineer"], body: withExample("Circuit", EXAMPLES.circuit), responses: { "201": createdResponse("Created", "CircuitRecord") }, errors: [400, 409, 413, 415, 422] }),
      },
      "/circuits/{circuitId}": {
        parameters: [idParam("circuitId")],
        get: op("get", { summary: "A circuit with its crossings", scope: "circuits:read", responses: { "200": ok("Circuit", "CircuitWithCrossings") }, errors: [404] }),
        put: op("put", { summary: "Update a circuit", scope: "circuits:write", roles: ["engineer"], body: withExample("Circuit", EXAMPLES.circuit), responses: { "200": ok("Updated", "CircuitRecord") }, errors: [400, 404, 409, 413, 415, 422] }),
        delete: op("delete", { summary: "Delete a circuit", scope: "circuits:write", roles: ["engineer"], responses: { "204": noContent }, errors: [404, 409] }),
      },
      "/circuits/{circuitId}/crossings": {
        parameters: [idParam("circuitId")],
        get: op("get", { summary: "Crossings of a circuit", scope: "circuits:read", parameters: listParams, responses: { "200": ok("A page of crossings", "CrossingList") }, errors: [400, 404] }),
        post: op("post", { summary: "Create a crossing", scope: "circuits:write", roles: ["engineer"], body: withExample("Crossing", EXAMPLES.crossing), responses: { "201": createdResponse("Created", "CrossingRecord") }, errors: [400, 404, 409, 413, 415, 422] }),
      },
      "/circuits/{circuitId}/profiles": {
        parameters: [idParam("circuitId")],
        get: op("get", { summary: "Load profiles of a circuit with their quality reports", scope: "circuits:read", parameters: listParams, responses: { "200": ok("A page of load profiles", "ProfileList") }, errors: [400, 404] }),
        post: op("post", {
          summary: "Upload a current history (raw CSV body, streamed)",
          description: `The mapping travels as query parameters with the names of IngestOptions. Nothing is saved when the upload fails. ${TIMESTAMP_RANGE_DESCRIPTION} Size limit 500 MB by default (UPLOAD_MAX_BYTES), counted while the body streams: past it, 413 at once.`,
          scope: "profiles:write",
          roles: ["engineer"],
          parameters: uploadParameters(),
          body: { "text/csv": { schema: { type: "string" }, example: "time,amps\n2025-01-01T00:00:00Z,112.5\n2025-01-01T00:05:00Z,108.0\n" } },
          responses: { "201": createdResponse("Stored, with the quality report", "ProfileUploaded") },
          errors: [400, 404, 413, 415, 422],
        }),
      },
      "/crossings/{crossingId}": {
        parameters: [idParam("crossingId")],
        get: op("get", { summary: "A crossing with its review", scope: "circuits:read", responses: { "200": ok("Crossing", "CrossingWithReview") }, errors: [404] }),
        put: op("put", { summary: "Update a crossing", scope: "circuits:write", roles: ["engineer"], body: withExample("Crossing", EXAMPLES.crossing), responses: { "200": ok("Updated", "CrossingRecord") }, errors: [400, 404, 409, 413, 415, 422] }),
        delete: op("delete", { summary: "Delete a crossing", scope: "circuits:write", roles: ["engineer"], responses: { "204": noContent }, errors: [404, 409] }),
      },
      "/crossings/{crossingId}/details": {
        parameters: [idParam("crossingId")],
        get: op("get", { summary: "Span and marking details, with the marker layout and the wires' suitability for lit markers", scope: "circuits:read", responses: { "200": ok("Details and plan", "CrossingDetailsAnswer") }, errors: [404] }),
        put: op("put", { summary: "Replace the span and marking details (checked against the rules and the span geometry)", scope: "circuits:write", roles: ["engineer", "consultant"], body: withExample("CrossingDetails", { ruleSet: "faa", highestWire: "shield" }), responses: { "200": ok("Saved, with the plan", "CrossingDetailsAnswer") }, errors: [400, 404, 413, 415, 422] }),
      },
      "/crossings/{crossingId}/options": {
        parameters: [idParam("crossingId")],
        get: op("get", { summary: "Lighting options of a crossing as stored", scope: "circuits:read", parameters: listParams, responses: { "200": ok("A page of options", "LightingOptionList") }, errors: [400, 404] }),
        post: op("post", { summary: "Add a lighting option", scope: "circuits:write", roles: ["engineer", "consultant"], body: withExample("LightingOption", EXAMPLES.option), responses: { "201": createdResponse("Created", "LightingOptionRecord") }, errors: [400, 404, 413, 415, 422] }),
      },
      "/crossings/{crossingId}/options/{optionId}": {
        parameters: [idParam("crossingId"), idParam("optionId")],
        get: op("get", { summary: "A lighting option", scope: "circuits:read", responses: { "200": ok("Option", "LightingOptionRecord") }, errors: [404] }),
        put: op("put", { summary: "Replace a lighting option", scope: "circuits:write", roles: ["engineer", "consultant"], body: withExample("LightingOption", EXAMPLES.option), responses: { "200": ok("Updated", "LightingOptionRecord") }, errors: [400, 404, 413, 415, 422] }),
        delete: op("delete", { summary: "Delete a lighting option", scope: "circuits:write", roles: ["engineer", "consultant"], responses: { "204": noContent }, errors: [404] }),
      },
      "/crossings/{crossingId}/comparison": {
        parameters: [idParam("crossingId")],
        get: op("get", {
          summary: "The lighting options compared on present value and equivalent annual cost, with the recommendation (the cheapest option whose feasibility is go)",
          description:
            "Line-powered options are rated by the crossing's latest study. An option stored without units follows its layout: marker options the marker count, lights on the supports the support-light count (structures × levels × lights per level, per the rule book); each option says `effectiveUnits`, `unitsSource` and `unitsBasis` in words.",
          scope: "circuits:read",
          responses: { "200": ok("Comparison", "Comparison") },
          errors: [404],
        }),
      },
      "/crossings/{crossingId}/review": {
        parameters: [idParam("crossingId")],
        get: op("get", { summary: "The crossing's review: state, staleness with what changed, decision, signer, history", scope: "circuits:read", responses: { "200": ok("Review", "ReviewAnswer") }, errors: [404] }),
        post: op("post", {
          summary: "Move the review: submit (engineer or consultant, with a note), approve or return (manager, with decision and comment), reopen",
          description: "A key moves as the role it acts with. 409 when the move is not possible from the current state (the problem names it in `state`); 403 when the role may not make it (administrators take no part in review).",
          scope: "reviews:write",
          body: withExample("ReviewMove", { action: "submit", comment: "Ready for a decision." }),
          responses: { "200": ok("Review after the move", "ReviewAnswer") },
          errors: [400, 404, 409, 413, 415, 422],
        }),
      },
      "/profiles/{profileId}": {
        parameters: [idParam("profileId")],
        get: op("get", { summary: "A load profile with its quality report, data version and fingerprint (SHA-256 of the stored samples)", scope: "circuits:read", responses: { "200": ok("Profile", "ProfileRecord") }, errors: [404] }),
        put: op("put", {
          summary: "Replace a load profile's data with a new export (raw CSV body, streamed)",
          description: "Mapping as for an upload. Samples, phases and quality report become the new file's and the data version goes up by one. Studies run before keep the data they were computed from (`keptForStudies`): their pages still show it and say the data changed since.",
          scope: "profiles:write",
          roles: ["engineer"],
          parameters: uploadParameters(["name"]),
          body: { "text/csv": { schema: { type: "string" } } },
          responses: { "200": { description: "Replaced: the profile, the new quality report, keptForStudies" } },
          errors: [400, 404, 413, 415, 422],
        }),
        delete: op("delete", { summary: "Delete a load profile", scope: "profiles:write", roles: ["engineer"], responses: { "204": noContent }, errors: [404, 409] }),
      },
      "/profiles/{profileId}/quality": {
        parameters: [idParam("profileId")],
        get: op("get", { summary: "The data-quality report of a load profile: coverage by month, gaps, flatlines, zero-current stretches", scope: "circuits:read", responses: { "200": ok("Quality report", "ProfileQuality") }, errors: [404] }),
      },
      "/profiles/{profileId}/append": {
        parameters: [idParam("profileId")],
        post: op("post", {
          summary: "Append a newer export to a load profile (raw CSV body, streamed)",
          description: "Mapping as for an upload. The new file wins over its whole time span: stored samples from its first to its last timestamp are replaced. The quality report is rebuilt.",
          scope: "profiles:write",
          roles: ["engineer"],
          parameters: uploadParameters(["name"]),
          body: { "text/csv": { schema: { type: "string" } } },
          responses: { "200": ok("Appended: samples added and replaced, the rebuilt quality report", "ProfileAppended") },
          errors: [400, 404, 413, 415, 422],
        }),
      },
      "/devices": {
        get: op("get", { summary: "Device profiles (retired ones too, marked `retired`)", scope: "devices:read", parameters: listParams, responses: { "200": ok("A page of device profiles", "DeviceList") }, errors: [400] }),
        post: op("post", { summary: "Create a device profile: the harvest as an expression in I (`harvestW`, checked by the engine) or as datasheet rows (`harvestPoints`: [{currentA, watts}], currents rising, watts ≥ 0; linear between rows, from 0 A and 0 W below the first, held above the last); a bad row is a 400 whose path names it (`harvestPoints.2.currentA`)", scope: "devices:write", roles: ["engineer"], body: withExample("DeviceProfile", EXAMPLES.device), responses: { "201": createdResponse("Created", "DeviceRecord") }, errors: [400, 413, 415, 422] }),
      },
      "/devices/{deviceId}": {
        parameters: [idParam("deviceId")],
        get: op("get", { summary: "A device profile", scope: "devices:read", responses: { "200": ok("Device profile", "DeviceRecord") }, errors: [404] }),
        put: op("put", { summary: "Replace a device profile (earlier studies keep the values they ran with)", scope: "devices:write", roles: ["engineer"], body: withExample("DeviceProfile", EXAMPLES.device), responses: { "200": ok("Updated", "DeviceRecord") }, errors: [400, 404, 413, 415, 422] }),
        delete: op("delete", { summary: "Retire a device profile: kept for earlier studies, no longer offered for new ones", scope: "devices:write", roles: ["engineer"], responses: { "200": ok("Retired", "DeviceRecord") }, errors: [404] }),
      },
      "/feasibility": {
        post: op("post", {
          summary: "Stateless feasibility study (nothing saved)",
          description: `Samples or CSV in, the same engine as saved studies. Body limit 64 MB by default (API_MAX_BODY_BYTES), counted while the body streams (chunked too): past it, 413 at once. ${TIMESTAMP_RANGE_DESCRIPTION} With \`async\`: true, or (unless \`async\` is false) from 200,000 samples or 8,000,000 characters of CSV, it runs as a job: 202 with Location: /api/v1/jobs/{jobId}; the results are then at the job's resultUrl (/api/v1/jobs/{jobId}/result).`,
          scope: "feasibility:run",
          body: withExample("FeasibilityRequest", EXAMPLES.feasibility),
          responses: { "200": ok("Results", "FeasibilityResponse"), "202": { description: "Queued as a job; follow Location", content: json("Job") } },
          errors: [400, 413, 415, 422],
        }),
      },
      "/optimise": {
        post: op("post", {
          summary: "Stateless optimiser: the cheapest device and storage that reaches go (nothing saved)",
          description: `The load history as for /feasibility; candidates (device, unit and installation cost, life) and storage sizes (sizesWh, or range {fromWh, toWh, stepWh}) with cost per Wh and life; horizon and discount rate. Every candidate × size is returned with its verdict, or its verdict inferred from a neighbour (more storage never darkens a lit moment). At most ${OPTIMISE_LIMITS.candidates} candidates, ${OPTIMISE_LIMITS.sizes} sizes and ${OPTIMISE_LIMITS.pairs} pairs: past any of them, 422 naming the limit. loadGrowthPercentPerYear with requireGoInLastYear judges each candidate on the last year of its life.`,
          scope: "feasibility:run",
          body: { "application/json": { schema: ref("OptimiseRequest") } },
          responses: { "200": ok("Every candidate, the recommended and the closest", "OptimiseResponse") },
          errors: [400, 413, 415, 422],
        }),
      },
      "/studies": {
        get: op("get", {
          summary: "Saved studies in creation order, without inputs and results",
          scope: "studies:read",
          parameters: [...listParams, { name: "crossingId", in: "query", required: false, schema: { type: "integer", minimum: 1 }, description: "Only the studies of this crossing" }],
          responses: { "200": ok("A page of studies", "StudyList") },
          errors: [400, 404],
        }),
        post: op("post", {
          summary: "Run and save a study of a crossing",
          description: "Runs at once (201) unless `async` is true or the load profile has 500,000 samples or more (about a year at 1-minute resolution): then it is queued as a job (202, Location: /api/v1/jobs/{jobId}).",
          scope: "studies:write",
          roles: ["engineer"],
          body: { "application/json": { schema: ref("StudyRequest") } },
          responses: {
            "201": createdResponse("Saved study with results", "Study"),
            "202": { description: "Queued as a job; follow Location", headers: { ...RATE_HEADERS, Location: { description: "The job", schema: { type: "string" } } }, content: json("Job") },
          },
          errors: [400, 404, 409, 413, 415, 422],
        }),
      },
      "/jobs/{jobId}": {
        parameters: [idParam("jobId")],
        get: op("get", {
          summary: "A job: state (queued, running, done, failed), progress 0–1, and when done the result link (resultUrl); when failed the error as problem fields",
          scope: "studies:read",
          responses: { "200": ok("Job", "Job") },
          errors: [404],
        }),
      },
      "/jobs/{jobId}/result": {
        parameters: [idParam("jobId")],
        get: op("get", {
          summary: "The full result of a finished job that keeps one (a feasibility study run as a job)",
          description: "409 (with `state`) until the job is done.",
          scope: "studies:read",
          responses: { "200": ok("Results", "FeasibilityResponse") },
          errors: [404, 409],
        }),
      },
      "/circuits/{circuitId}/studies": {
        parameters: [idParam("circuitId")],
        post: op("post", {
          summary: "Study every crossing of a circuit with one load profile and device profile, as one job",
          description: "Checked at once against the first crossing (422 naming the field), then queued: 202 with Location: /api/v1/jobs/{jobId}. When done, the job's result lists each crossing's study id and verdict, and the crossings the study could not run for.",
          scope: "studies:write",
          roles: ["engineer"],
          body: { "application/json": { schema: ref("CircuitStudiesRequest") } },
          responses: { "202": { description: "Queued as a job; follow Location", content: json("Job") } },
          errors: [400, 404, 413, 415, 422],
        }),
      },
      "/webhooks": {
        get: op("get", { summary: "Webhook endpoints of the organisation (administrators), a page at a time", scope: "webhooks:manage", roles: ["admin"], parameters: listParams, responses: { "200": { description: "{webhooks, next}" } }, errors: [400] }),
        post: op("post", {
          summary: "Register an endpoint for events: study.completed, job.failed, review.changed, approval.stale, profile.uploaded (administrators)",
          description:
            "201 with the signing secret, shown this once. Each delivery is a POST of JSON {event, occurredAt, data} with the headers Duskline-Event, Duskline-Delivery (its id: deliveries are at least once, so de-duplicate by it), Duskline-Timestamp (Unix seconds) and Duskline-Signature: v1=<hex HMAC-SHA256 with the secret of `timestamp.body`>. Refuse timestamps more than 5 minutes from your clock. An answer other than 2xx within 10 s is retried with back-off (30 s, doubling, at most 1 h apart; 8 attempts).",
          scope: "webhooks:manage",
          roles: ["admin"],
          body: { "application/json": { schema: ref("WebhookInput") } },
          responses: { "201": { description: "Created, with `secret`" } },
          errors: [400, 413, 415, 422],
        }),
      },
      "/webhooks/{webhookId}": {
        parameters: [idParam("webhookId")],
        get: op("get", { summary: "A webhook endpoint (its secret's first characters only)", scope: "webhooks:manage", roles: ["admin"], responses: { "200": { description: "Webhook" } }, errors: [404] }),
        delete: op("delete", { summary: "Remove an endpoint and its delivery log", scope: "webhooks:manage", roles: ["admin"], responses: { "204": noContent }, errors: [404] }),
      },
      "/webhooks/{webhookId}/deliveries": {
        parameters: [idParam("webhookId")],
        get: op("get", { summary: "The endpoint's latest 50 deliveries: state (pending, delivered, failed), attempts, next attempt, last status, response and error", scope: "webhooks:manage", roles: ["admin"], responses: { "200": { description: "{deliveries}" } }, errors: [404] }),
      },
      "/studies/{studyId}": {
        parameters: [idParam("studyId")],
        get: op("get", { summary: "A saved study: inputs, results and solver answers", scope: "studies:read", responses: { "200": ok("Study", "Study") }, errors: [404] }),
      },
      "/studies/{studyId}/what-if": {
        parameters: [idParam("studyId")],
        post: op("post", {
          summary: "Recompute a saved study with another minimum current, storage or load scale (nothing saved)",
          scope: "studies:read",
          body: withExample("WhatIf", { storageWh: 40 }),
          responses: { "200": ok("Summary against the saved run, and the charts' data recomputed", "WhatIfAnswer") },
          errors: [400, 404, 409, 413, 415, 422],
        }),
      },
      "/studies/{studyId}/report.pdf": {
        parameters: [idParam("studyId")],
        get: op("get", {
          summary: "The study report as a PDF: crossing, marker plan, verdict and reasons, figures, monthly table, load-duration curve, night-by-night calendar, solver answers, options and costs, review decision and signer, policy, rule references, data quality and the safety caution",
          scope: "studies:read",
          responses: { "200": { description: "PDF file (attachment)", content: { "application/pdf": { schema: { type: "string", format: "binary" } } } } },
          errors: [404],
        }),
      },
      "/portfolio": {
        get: op("get", { summary: "Every crossing, studied or not: latest study's figures, recommended option, review state (stale shown)", scope: "portfolio:read", responses: { "200": ok("Counts by verdict, the number of stale approvals, rows, and the crossings needing attention (not go, never studied, or stale), worst first", "Portfolio") } }),
      },
      "/markers/layout": {
        post: op("post", { summary: "Marker layout of a span under the FAA or ICAO rule set", scope: "feasibility:run", body: withExample("MarkerLayoutRequest", EXAMPLES.markers), responses: { "200": ok("Layout", "MarkerLayout") }, errors: [400, 413, 415, 422] }),
      },
      "/notice-check": {
        post: op("post", {
          summary: "Whether the structure needs notice to the FAA under 14 CFR 77.9 (a) and (b), with the reason for each rule",
          scope: "feasibility:run",
          body: withExample("NoticeCheckRequest", EXAMPLES.notice),
          responses: { "200": ok("Notice required or not, rule by rule", "NoticeCheck") },
          errors: [413, 415, 422],
        }),
      },
    } as Record<string, Json>,
  };
}
