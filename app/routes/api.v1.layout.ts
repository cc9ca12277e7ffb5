// Pathless layout of the /api/v1 resource routes: identifies the caller once per request and
// counts the request against the caller's limit (per key, per person, or per address).
import { identifyApiCallerMiddleware, rateLimitSubjectOf } from "~/utils/auth.server";
import { errorToProblem } from "~/utils/api.server";
import { problem } from "~/utils/http.server";
import { countApiRequest, type ApiRateDecision } from "~/services/rate-limits.server";
import type { Route } from "./+types/api.v1.layout";

export const middleware: Route.MiddlewareFunction[] = [
  async (args, next) => {
    let decision: ApiRateDecision | null = null;
    try {
      await identifyApiCallerMiddleware(args, next);
      const { subject, limit } = rateLimitSubjectOf(args.context, args.request);
      if (subject !== null) decision = await countApiRequest(subject, limit);
    } catch (error) {
      // A failure here (e.g. the database is down) still answers problem+json.
      throw errorToProblem(error);
    }
    if (decision && !decision.allowed) {
      const detail = `At most ${decision.limit} requests a minute for this caller; retry in ${decision.resetSeconds} s.`;
      throw withRateHeaders(problem(429, "Too many requests", detail, { limit: decision.limit }, { "Retry-After": String(decision.resetSeconds) }), decision);
    }
    const response = (await next()) as Response;
    return decision ? withRateHeaders(response, decision) : response;
  },
];

/** RateLimit-* fields (IETF draft "RateLimit header fields for HTTP"): limit, what is left, seconds to the reset. */
function withRateHeaders(response: Response, d: ApiRateDecision): Response {
  try {
    response.headers.set("RateLimit-Limit", String(d.limit));
    response.headers.set("RateLimit-Remaining", String(d.remaining));
    response.headers.set("RateLimit-Reset", String(d.resetSeconds));
    response.headers.set("RateLimit-Policy", `${d.limit};w=60`);
    return response;
  } catch {
    // Immutable headers (a Response from elsewhere): answer without the fields.
    return response;
  }
}
