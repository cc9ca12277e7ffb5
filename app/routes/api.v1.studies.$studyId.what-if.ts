import type { Route } from "./+types/api.v1.studies.$studyId.what-if";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { whatIf } from "~/services/studies.server";
import { whatIfSchema } from "../../shared/study-forms";

export const loader = () => methodNotAllowed(["POST"]);

/** Recomputes a saved study with changed minimum current, storage or load scale; nothing is saved. */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    const change = await readJson(request, whatIfSchema);
    return Response.json(await whatIf(user.organisationId, idParam(params.studyId, "Study"), change));
  });
