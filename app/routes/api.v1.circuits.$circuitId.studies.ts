import type { Route } from "./+types/api.v1.circuits.$circuitId.studies";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { startCircuitStudies } from "~/services/studies.server";
import { withIdempotency } from "~/services/idempotency.server";
import { jobJson } from "~/services/jobs.server";
import { circuitStudiesRequestSchema } from "../../shared/study-forms";

export const loader = () => methodNotAllowed(["POST"]);

/** Studies every crossing of the circuit with one load profile and device profile, as one job (202, Location of the job). */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "studies:write", "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, circuitStudiesRequestSchema);
      return save(async () => {
        const job = await startCircuitStudies(user, circuitId, input);
        return Response.json(jobJson(job), { status: 202, headers: { Location: `/api/v1/jobs/${job.id}` } });
      });
    });
  });
