import { methodNotAllowed, statelessComputeAction } from "~/utils/api.server";
import { feasibilityRunsAsJob, runFeasibility, startFeasibilityJob } from "~/services/feasibility.server";
import { jobJson } from "~/services/jobs.server";
import { feasibilityRequestSchema } from "../../shared/study-schemas";

export const loader = () => methodNotAllowed(["POST"]);

/**
 * Stateless study: samples or CSV in, results out, nothing saved. Body limit: API_MAX_BODY_BYTES
 * (64 MB default). With "async": true, or from a stated size, it runs as a job: 202 and the
 * job's Location; the results are then at the job's resultUrl.
 */
export const action = statelessComputeAction(feasibilityRequestSchema, async (user, body) => {
  if (feasibilityRunsAsJob(body)) {
    const job = await startFeasibilityJob(user, body);
    return Response.json(jobJson(job), { status: 202, headers: { Location: `/api/v1/jobs/${job.id}` } });
  }
  return Response.json(await runFeasibility(user.organisationId, body));
});
