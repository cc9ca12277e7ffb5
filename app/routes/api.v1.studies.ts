import type { Route } from "./+types/api.v1.studies";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { runCrossingStudy, studyJson } from "~/services/studies.server";
import { studyRequestSchema } from "../../shared/study-forms";

export const loader = () => methodNotAllowed(["POST"]);

/** Runs and saves a study of a crossing (201 with the full result). */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiUser(context, "engineer");
    const study = await runCrossingStudy(user, await readJson(request, studyRequestSchema));
    return Response.json(studyJson(study), { status: 201, headers: { Location: `/api/v1/studies/${study.id}` } });
  });
