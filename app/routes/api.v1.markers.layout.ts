import type { Route } from "./+types/api.v1.markers.layout";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { layoutMarkers, markerLayoutRulesSchema } from "../../lib/markers";
import { ruleTables } from "~/services/rule-book.server";

// Marker layout for a span under FAA or ICAO rules, as the caller's organisation's rule book
// has them; any signed-in role. Lengths come back in the request's unit. Bad input: 400
// problem+json with errors [{path, message}].
export const loader = ({ context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    await requireApiScope(context, "feasibility:run");
    return methodNotAllowed(["POST"]);
  });

export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "feasibility:run");
    const rules = await ruleTables(user.organisationId);
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, markerLayoutRulesSchema(rules)),
      async (body) => Response.json(layoutMarkers(body, rules)),
    );
  });
