import type { Route } from "./+types/api.v1.markers.layout";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { layoutMarkers, markerLayoutRequestRulesSchema } from "../../lib/markers";

// Marker layout for a span under FAA or ICAO rules; any signed-in role. Lengths come back in
// the request's unit. Bad input: 400 problem+json with errors [{path, message}].
export const loader = ({ context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    await requireApiScope(context, "feasibility:run");
    return methodNotAllowed(["POST"]);
  });

export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "feasibility:run");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, markerLayoutRequestRulesSchema),
      async (body) => Response.json(layoutMarkers(body)),
    );
  });
