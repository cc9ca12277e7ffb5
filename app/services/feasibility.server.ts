// The stateless study of POST /api/v1/feasibility: samples or CSV in, the same engine as
// the saved studies, nothing stored.
import { DeviceError, runStudy, StudyInputError } from "../../lib/engine";
import { mergePolicy } from "../../lib/engine/verdict";
import { IngestError, ingestCsvText } from "../../lib/ingest/ingest";
import { ingestSamples } from "../../lib/ingest/samples";
import { selectPhase } from "../../lib/series";
import type { FeasibilityRequest } from "../../shared/study-schemas";
import { problem } from "../utils/http.server";
import { getPolicy } from "./policy.server";

export async function runFeasibility(organisationId: number, body: FeasibilityRequest) {
  const { series, quality } = body.samples
    ? ingestSamples(body.samples)
    : (() => {
        try {
          const r = ingestCsvText(body.csv!, body.csvOptions!);
          return { series: r.series, quality: { ...r.quality, warnings: r.warnings } };
        } catch (error) {
          if (error instanceof IngestError) error.path ??= "csv"; // the problem names the field the rows came in
          throw error;
        }
      })();
  let channel;
  try {
    channel = selectPhase(series, body.phase);
  } catch (error) {
    throw problem(422, "Phase not in the data", (error as Error).message, { errors: [{ path: "phase", message: (error as Error).message }] });
  }
  if (channel.t.length < 2) {
    throw problem(422, "Too few valid samples", "At least two valid samples are needed to compute anything.", { errors: [{ path: body.samples ? "samples" : "csv", message: "Fewer than two valid samples." }], quality });
  }
  const policy = mergePolicy(await getPolicy(organisationId), body.policy);
  try {
    const result = runStudy(channel, {
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
      },
      policy,
    });
    return { ...result, quality };
  } catch (error) {
    if (error instanceof DeviceError) throw problem(422, "Invalid device", error.message, { errors: [{ path: ["device", ...error.path].join("."), message: error.message }] });
    if (error instanceof StudyInputError) throw problem(422, "Invalid study input", error.message, { errors: error.issues.map((i) => ({ path: i.path.join("."), message: i.message })) });
    throw error;
  }
}
