import type { Route } from "./+types/api.v1.jobs.$jobId.result";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { jobOutput } from "~/services/jobs.server";

/** The full result of a finished job that keeps one (a feasibility study run as a job); 409 until it is done. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "studies:read");
    return Response.json(await jobOutput(user.organisationId, idParam(params.jobId, "Job")));
  });
