// The stateless study of POST /api/v1/feasibility: samples or CSV in, the same engine as
// the saved studies, nothing stored. Ingest and study run on a worker thread.
import { DeviceError, StudyInputError } from "../../lib/engine";
import { IngestError } from "../../lib/ingest/ingest";
import { PhaseError, TooFewSamplesError } from "../../lib/engine/worker";
import { mergePolicy } from "../../lib/engine/verdict";
import type { FeasibilityRequest } from "../../shared/study-schemas";
import { problem } from "../utils/http.server";
import { runFeasibilityOnPool } from "../utils/worker-pool.server";
import { getPolicy } from "./policy.server";

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
        },
        policy,
      },
    });
    return { ...result, quality };
  } catch (error) {
    // The problem names the field the rows came in (the ingest may already name a sample).
    if (error instanceof IngestError) error.path ??= body.samples ? "samples" : "csv";
    if (error instanceof PhaseError) throw problem(422, "Phase not in the data", error.message, { errors: [{ path: "phase", message: error.message }] });
    if (error instanceof TooFewSamplesError) {
      throw problem(422, "Too few valid samples", "At least two valid samples are needed to compute anything.", {
        errors: [{ path: body.samples ? "samples" : "csv", message: "Fewer than two valid samples." }],
        quality: error.quality,
      });
    }
    if (error instanceof DeviceError) throw problem(422, "Invalid device", error.message, { errors: [{ path: ["device", ...error.path].join("."), message: error.message }] });
    if (error instanceof StudyInputError) throw problem(422, "Invalid study input", error.message, { errors: error.issues.map((i) => ({ path: i.path.join("."), message: i.message })) });
    throw error;
  }
}
