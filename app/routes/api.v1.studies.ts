import type { Route } from "./+types/api.v1.studies";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { startCrossingStudy, studyJson } from "~/services/studies.server";
import { withIdempotency } from "~/services/idempotency.server";
import { jobJson } from "~/services/jobs.server";
import { studyRequestSchema } from "../../shared/study-forms";

export const loader = () => methodNotAllowed(["POST"]);

/** Runs and saves a study of a crossing (201 with the full result), or queues it as a job (202, Location of the job). */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiUser(context, "engineer");
    // A retry with the same Idempotency-Key gets the first answer (the study, or the queued job).
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, studyRequestSchema);
      return save(async (transaction) => {
        const started = await startCrossingStudy(user, input, transaction);
        if (started.job) return Response.json(jobJson(started.job), { status: 202, headers: { Location: `/api/v1/jobs/${started.job.id}` } });
        return Response.json(studyJson(started.study), { status: 201, headers: { Location: `/api/v1/studies/${started.study.id}` } });
      });
    });
  });
