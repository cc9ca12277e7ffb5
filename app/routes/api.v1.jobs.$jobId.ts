import type { Route } from "./+types/api.v1.jobs.$jobId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam } from "~/utils/api.server";
import { ensureJobRunner, getJob, jobJson } from "~/services/jobs.server";

/** A job: state, progress and, when done, the link to its result. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "studies:read");
    ensureJobRunner();
    return Response.json(jobJson(await getJob(user.organisationId, idParam(params.jobId, "Job"))));
  });
