import type { Route } from "./+types/api.v1.studies.$studyId.what-if";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { whatIf } from "~/services/studies.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { whatIfSchema } from "../../shared/study-forms";

export const loader = () => methodNotAllowed(["POST"]);

/** Recomputes a saved study with changed minimum current, storage or load scale; nothing is saved. */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "studies:read");
    const id = idParam(params.studyId, "Study");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, whatIfSchema),
      async (change) => Response.json(await whatIf(user.organisationId, id, change)),
    );
  });
