import type { Route } from "./+types/api.v1.studies";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { listStudies, startCrossingStudy, studyJson, studySummaryJson } from "~/services/studies.server";
import { withIdempotency } from "~/services/idempotency.server";
import { jobJson } from "~/services/jobs.server";
import { studyRequestSchema } from "../../shared/study-forms";

/** Saved studies (newest last), optionally of one crossing (`crossingId`); each without inputs and results. */
export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "studies:read");
    const page = pageRequest(request, ["crossingId"]);
    const crossing = new URL(request.url).searchParams.get("crossingId");
    const rows = await listStudies(user.organisationId, { ...page, crossingId: crossing === null ? undefined : idParam(crossing, "Crossing") });
    const { items, next } = pageOf(rows, page);
    return Response.json({ studies: items.map(studySummaryJson), next });
  });

/** Runs and saves a study of a crossing (201 with the full result), or queues it as a job (202, Location of the job). */
export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "studies:write", "engineer");
    // A retry with the same Idempotency-Key gets the first answer (the study, or the queued job).
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, studyRequestSchema);
      return save(async (transaction) => {
        const started = await startCrossingStudy(user, input, transaction);
        if (started.job) return Response.json(jobJson(started.job), { status: 202, headers: { Location: `/api/v1/jobs/${started.job.id}` } });
        return created(studyJson(started.study), `/api/v1/studies/${started.study.id}`);
      });
    });
  });
