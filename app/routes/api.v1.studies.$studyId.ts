import type { Route } from "./+types/api.v1.studies.$studyId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { getStudy, studyJson } from "~/services/studies.server";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "studies:read");
    return Response.json(studyJson(await getStudy(user.organisationId, idParam(params.studyId, "Study"))));
  });
