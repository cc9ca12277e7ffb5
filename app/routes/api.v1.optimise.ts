import type { Route } from "./+types/api.v1.optimise";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { getEnv } from "~/utils/env.server";
import { runStatelessOptimise } from "~/services/optimise.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { optimiseRequestSchema } from "../../shared/optimise-schemas";

export const loader = () => methodNotAllowed(["POST"]);

/** Stateless optimiser: samples or CSV and candidates in, every candidate and the cheapest go out, nothing saved. */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "feasibility:run");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, optimiseRequestSchema, getEnv().API_MAX_BODY_BYTES),
      async (body) => Response.json(await runStatelessOptimise(user.organisationId, body)),
    );
  });
