// The stateless study of POST /api/v1/feasibility: samples or CSV in, the same engine as
// the saved studies, nothing stored. Ingest and study run on a worker thread.
import { DeviceError, StudyInputError } from "../../lib/engine";
import { IngestError } from "../../lib/ingest/ingest";
import { PhaseError, TooFewSamplesError } from "../../lib/engine/worker";
import { mergePolicy } from "../../lib/engine/verdict";
import { feasibilityRequestSchema, type FeasibilityRequest } from "../../shared/study-schemas";
import type { Job } from "../../db/models";
import type { Actor } from "./audit.server";
import { enqueueJob, registerJobHandler } from "./jobs.server";
import { problem } from "../utils/http.server";
import { runFeasibilityOnPool } from "../utils/worker-pool.server";
import { getPolicy } from "./policy.server";

/**
 * Sizes from which a feasibility study runs as a job (issue 12), about a third of a year of
 * 1-minute data: the ingest and study then take more than about a second of CPU here
 * (docs/performance.md), too long to hold a request open on a busy server.
 */
export const FEASIBILITY_JOB_MIN_SAMPLES = 200_000;
export const FEASIBILITY_JOB_MIN_CSV_CHARS = 8_000_000;

/** `async` decides when given (false: the caller waits, whatever the size); otherwise the size does. */
export function feasibilityRunsAsJob(body: FeasibilityRequest): boolean {
  return body.async ?? ((body.samples?.length ?? 0) >= FEASIBILITY_JOB_MIN_SAMPLES || (body.csv?.length ?? 0) >= FEASIBILITY_JOB_MIN_CSV_CHARS);
}

/** Queues the study as a job; its results are kept with the job and served at its result link. */
export async function startFeasibilityJob(actor: Actor, body: FeasibilityRequest): Promise<Job> {
  const { async: _async, ...input } = body;
  return enqueueJob(actor, "feasibility.run", input as Record<string, unknown>);
}

registerJobHandler("feasibility.run", async (input, { jobId, actor }) => {
  const output = await runFeasibility(actor.organisationId, feasibilityRequestSchema.parse(input));
  return {
    resultUrl: `/api/v1/jobs/${jobId}/result`,
    result: { verdict: output.verdict.status, availability: output.lighting.availability },
    output: output as unknown as Record<string, unknown>,
  };
});

export async function runFeasibility(organisationId: number, body: FeasibilityRequest) {
  const policy = mergePolicy(await getPolicy(organisationId), body.policy);
  try {
    const { result, quality } = await runFeasibilityOnPool({
      data: body.samples ? { samples: body.samples } : { csv: body.csv!, csvOptions: body.csvOptions! },
      phase: body.phase,
      input: {
        device: body.device,
        schedule: body.schedule,
        location: body.location,
        params: {
          phase: body.phase,
          interpolation: body.interpolation,
          maxGapMinutes: body.maxGapMinutes,
          loadScale: body.loadScale,
          periodStart: body.periodStart,
          periodEnd: body.periodEnd,
          ratingA: body.ratingA,
          timeZone: body.timeZone,
          monthlyTemperatureC: body.monthlyTemperatureC,
          switchedOut: body.switchedOut,
        },
        policy,
      },
    });
    return { ...result, quality };
  } catch (error) {
    throw engineProblem(error, body.samples ? "samples" : "csv", ["device"]);
  }
}

/**
 * An engine error of a stateless request as its problem+json Response (anything else is returned
 * as it is): `loadPath` names the field the rows came in, `devicePath` where device fields sit.
 */
export function engineProblem(error: unknown, loadPath: string, devicePath: string[]): unknown {
  // The problem names the field the rows came in (the ingest may already name a sample).
  if (error instanceof IngestError) {
    error.path ??= error.option ? `csvOptions.${error.option}` : loadPath;
    return error;
  }
  if (error instanceof PhaseError) return problem(422, "Phase not in the data", error.message, { errors: [{ path: "phase", message: error.message }] });
  if (error instanceof TooFewSamplesError) {
    return problem(422, "Too few valid samples", "At least two valid samples are needed to compute anything.", {
      errors: [{ path: loadPath, message: "Fewer than two valid samples." }],
      quality: error.quality,
    });
  }
  if (error instanceof DeviceError) return problem(422, "Invalid device", error.message, { errors: [{ path: [...devicePath, ...error.path].join("."), message: error.message }] });
  if (error instanceof StudyInputError) return problem(422, "Invalid study input", error.message, { errors: error.issues.map((i) => ({ path: i.path.join("."), message: i.message })) });
  return error;
}
