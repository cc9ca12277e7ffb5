// The optimiser (issue 13; docs/optimiser.md): the cheapest device and storage that reaches go,
// stateless over samples or CSV (POST /api/v1/optimise), for one crossing on a stored profile, and
// for every crossing of a circuit or of the whole portfolio as a job. The engine runs on the worker
// pool; this module checks the limits, gathers the inputs and shapes the results.
import { Circuit, Crossing, LoadProfile } from "../../db/models";
import { mergePolicy } from "../../lib/engine/verdict";
import type { OptimiseInput } from "../../lib/optimise/optimise";
import type { OptimiseOutput } from "../../lib/engine/worker";
import { OPTIMISE_LIMITS, optimiseSettingsFields, storageSizes, type OptimiseRequest, type StorageChoiceInput } from "../../shared/optimise-schemas";
import { monthlyTemperatureC, switchedOutSchema, type PolicyOverrides } from "../../shared/study-schemas";
import { monthlyMeansC } from "../../lib/ingest/temperatures";
import { z } from "zod";
import { db } from "../utils/db.server";
import { runOptimiseOnPool } from "../utils/worker-pool.server";
import type { Actor } from "./audit.server";
import { getCrossing } from "./circuits.server";
import { InputError, NotFoundError } from "./errors.server";
import { engineProblem } from "./feasibility.server";
import { enqueueJob, getJob, registerJobHandler } from "./jobs.server";
import { getPolicy } from "./policy.server";
import { loadProfileBlobs } from "./profiles.server";

const settingsSchema = z.object(optimiseSettingsFields);
export type OptimiseSettings = z.output<typeof settingsSchema>;

/** The storage sizes to try, refusing more candidates, sizes or pairs than OPTIMISE_LIMITS with a 422 naming the limit. */
export function checkedSizes(candidates: number, storage: StorageChoiceInput): number[] {
  if (candidates > OPTIMISE_LIMITS.candidates) {
    throw new InputError(`At most ${OPTIMISE_LIMITS.candidates} candidate devices in one run (${candidates} given).`, "candidates", 422);
  }
  const offered = storageSizes(storage, OPTIMISE_LIMITS.sizes);
  const field = storage.sizesWh ? "storage.sizesWh" : "storage.range";
  if ("tooMany" in offered) throw new InputError(`At most ${OPTIMISE_LIMITS.sizes} storage sizes in one run (${offered.tooMany} given).`, field, 422);
  const pairs = candidates * offered.sizes.length;
  if (pairs > OPTIMISE_LIMITS.pairs) {
    throw new InputError(`At most ${OPTIMISE_LIMITS.pairs} candidate × storage-size pairs in one run (${candidates} × ${offered.sizes.length} = ${pairs}).`, field, 422);
  }
  return offered.sizes;
}

function optimiseInput(settings: OptimiseSettings, study: Pick<OptimiseInput, "location" | "schedule" | "params" | "policy">): OptimiseInput {
  return {
    ...study,
    candidates: settings.candidates,
    storage: { sizesWh: checkedSizes(settings.candidates.length, settings.storage), costPerWh: settings.storage.costPerWh, lifeYears: settings.storage.lifeYears },
    horizonYears: settings.horizonYears,
    discountRatePercent: settings.discountRatePercent,
    loadGrowthPercentPerYear: settings.loadGrowthPercentPerYear,
    requireGoInLastYear: settings.requireGoInLastYear,
  };
}

/** POST /api/v1/optimise: samples or CSV in, every candidate and the recommendation out, nothing stored. */
export async function runStatelessOptimise(organisationId: number, body: OptimiseRequest): Promise<OptimiseOutput> {
  const input = optimiseInput(body, {
    location: body.location,
    schedule: body.schedule,
    params: {
      phase: body.phase,
      interpolation: body.interpolation,
      maxGapMinutes: body.maxGapMinutes,
      loadScale: body.loadScale,
      periodStart: body.periodStart,
      periodEnd: body.periodEnd,
      ratingA: body.ratingA,
      monthlyTemperatureC: body.monthlyTemperatureC,
      switchedOut: body.switchedOut,
    },
    policy: mergePolicy(await getPolicy(organisationId), body.policy),
  });
  try {
    return await runOptimiseOnPool({ data: body.samples ? { samples: body.samples } : { csv: body.csv!, csvOptions: body.csvOptions! }, phase: body.phase, input });
  } catch (error) {
    throw engineProblem(error, body.samples ? "samples" : "csv", []);
  }
}

// ---------------------------------------------------------------- stored crossings (page and jobs)

/** What the crossing page and the fleet page send: the settings, and which profile (crossing page only). */
export const crossingOptimiseSchema = settingsSchema.extend({
  profileId: z.number().int().positive().optional(),
  /** Absent: the crossing's stored monthly normals, when it has them. */
  monthlyTemperatureC: monthlyTemperatureC.optional(),
  switchedOut: switchedOutSchema.optional(),
});
export type CrossingOptimiseRequest = z.output<typeof crossingOptimiseSchema>;

const PROFILE_ATTRIBUTES = ["id", "name", "circuitId", "startAt", "endAt", "temperature"];

/** The profile a crossing's run uses: the one asked for (of the crossing's circuit), else the circuit's newest; null when it has none. */
async function profileFor(organisationId: number, crossing: Crossing, request: CrossingOptimiseRequest) {
  const profile = request.profileId
    ? await LoadProfile.findOne({ where: { id: request.profileId, organisationId }, attributes: PROFILE_ATTRIBUTES })
    : await LoadProfile.findOne({ where: { organisationId, circuitId: crossing.circuitId }, order: [["createdAt", "DESC"], ["id", "DESC"]], attributes: PROFILE_ATTRIBUTES });
  if (request.profileId && (!profile || profile.circuitId !== crossing.circuitId)) throw new InputError("Choose a load profile of this crossing's circuit.", "profileId", 422);
  return profile;
}

/** Each switched-out period must overlap the profile's data, else it changes nothing: refused, naming its line. */
function checkSwitchedOut(request: CrossingOptimiseRequest, profile: LoadProfile): void {
  const day = (d: Date) => d.toISOString().slice(0, 16).replace("T", " ");
  (request.switchedOut ?? []).forEach((period, i) => {
    if (Date.parse(period.end) <= profile.startAt.getTime() || Date.parse(period.start) >= profile.endAt.getTime()) {
      throw new InputError(
        `Switched-out line ${i + 1} ("${period.name}") lies outside the data of load profile "${profile.name}" (${day(profile.startAt)} – ${day(profile.endAt)} UTC).`,
        `switchedOut.${i}.start`,
        422,
      );
    }
  });
}

async function optimiseCrossing(organisationId: number, crossing: Crossing, request: CrossingOptimiseRequest, policy: PolicyOverrides | undefined, onProgress?: (share: number) => void) {
  const profile = await profileFor(organisationId, crossing, request);
  if (!profile) return { profile: null, result: null };
  const input = optimiseInput(request, {
    location: { lat: crossing.lat, lon: crossing.lon },
    schedule: { kind: "night" },
    // Temperatures: the profile's recorded monthly means, else the normals given, else the crossing's.
    params: {
      monthlyTemperatureC: request.monthlyTemperatureC ?? crossing.temperatureNormals?.monthlyC,
      recordedTemperatureC: monthlyMeansC(profile.temperature),
      switchedOut: request.switchedOut,
    },
    policy: mergePolicy(await getPolicy(organisationId), policy ?? {}),
  });
  try {
    const result = await runOptimiseOnPool({ data: { profile: await loadProfileBlobs(organisationId, profile.id) }, phase: "A", input }, onProgress);
    return { profile: { id: profile.id, name: profile.name }, result };
  } catch (error) {
    throw engineProblem(error, "profileId", []);
  }
}

/** Queues the optimiser for one crossing (checked first, so a bad request is refused at once). */
export async function startCrossingOptimise(actor: Actor, crossingId: number, request: CrossingOptimiseRequest) {
  const crossing = await getCrossing(actor.organisationId, crossingId);
  checkedSizes(request.candidates.length, request.storage);
  const profile = await profileFor(actor.organisationId, crossing, request);
  if (profile) checkSwitchedOut(request, profile);
  return enqueueJob(actor, "optimise.crossing", { crossingId, ...request });
}

registerJobHandler("optimise.crossing", async (input, { jobId, actor, progress }) => {
  const { crossingId, ...rest } = input as { crossingId: number };
  const crossing = await getCrossing(actor.organisationId, crossingId);
  const { profile, result } = await optimiseCrossing(actor.organisationId, crossing, crossingOptimiseSchema.parse(rest), undefined, progress);
  if (!result) throw new InputError(`${crossing.name}: its circuit has no load profile yet.`, "profileId", 422);
  const { quality: _quality, ...shown } = result;
  return { resultUrl: `/crossings/${crossingId}/optimise?job=${jobId}`, result: { crossingId, profile, ...shown } };
});

export interface FleetRow {
  crossingId: number;
  crossing: string;
  circuit: string;
  profile: string | null;
  recommended: string | null;
  storageWh: number | null;
  equivalentAnnualCost: number | null;
  presentValue: number | null;
  /** Why there is no recommendation, or what the closest would take. */
  note: string;
}

/** Queues the optimiser for every crossing of a circuit (or of the whole portfolio when circuitId is absent). */
export async function startFleetOptimise(actor: Actor, circuitId: number | null, request: CrossingOptimiseRequest) {
  if (circuitId !== null) {
    db();
    const circuit = await Circuit.findOne({ where: { id: circuitId, organisationId: actor.organisationId } });
    if (!circuit) throw new NotFoundError(`Circuit ${circuitId}`);
  }
  checkedSizes(request.candidates.length, request.storage);
  return enqueueJob(actor, "optimise.fleet", { circuitId, ...request });
}

registerJobHandler("optimise.fleet", async (input, { jobId, actor, progress }) => {
  const { circuitId, ...rest } = input as { circuitId: number | null };
  const request = crossingOptimiseSchema.parse(rest);
  db();
  const crossings = await Crossing.findAll({ where: { organisationId: actor.organisationId, ...(circuitId ? { circuitId } : {}) }, order: [["circuitId", "ASC"], ["name", "ASC"]] });
  const circuits = new Map((await Circuit.findAll({ where: { organisationId: actor.organisationId }, attributes: ["id", "name"] })).map((c) => [c.id, c.name]));
  const rows: FleetRow[] = [];
  for (const [k, crossing] of crossings.entries()) {
    const circuit = circuits.get(crossing.circuitId) ?? "";
    let outcome: Awaited<ReturnType<typeof optimiseCrossing>>;
    try {
      outcome = await optimiseCrossing(actor.organisationId, crossing, { ...request, profileId: undefined }, undefined, (share) => progress((k + share) / crossings.length));
    } catch (error) {
      // One crossing's data the engine refuses (an IngestError or a problem) is a row, not the end of the run.
      if (!(error instanceof Response)) throw error;
      const note = ((await error.json()) as { detail?: string }).detail ?? "The engine refused this crossing's data.";
      rows.push({ crossingId: crossing.id, crossing: crossing.name, circuit, profile: null, recommended: null, storageWh: null, equivalentAnnualCost: null, presentValue: null, note });
      continue;
    }
    const { profile, result } = outcome;
    const best = result?.recommended ? result.candidates.find((c) => c.name === result.recommended!.name && c.storageWh === result.recommended!.storageWh) : undefined;
    rows.push({
      crossingId: crossing.id,
      crossing: crossing.name,
      circuit,
      profile: profile?.name ?? null,
      recommended: best?.name ?? null,
      storageWh: best?.storageWh ?? null,
      equivalentAnnualCost: best?.equivalentAnnualCost ?? null,
      presentValue: best?.presentValue ?? null,
      note: !result ? "No load profile on the circuit." : best ? "" : result.closest ? `Nothing reaches go; closest ${result.closest.name} at ${result.closest.storageWh} Wh. ${result.closest.wouldTake}` : "Nothing reaches go (not enough data for a verdict).",
    });
    progress((k + 1) / crossings.length);
  }
  const recommended = rows.filter((r) => r.equivalentAnnualCost !== null);
  const totals = {
    crossings: rows.length,
    withRecommendation: recommended.length,
    equivalentAnnualCost: recommended.reduce((s, r) => s + r.equivalentAnnualCost!, 0),
    presentValue: recommended.reduce((s, r) => s + r.presentValue!, 0),
  };
  return { resultUrl: `/optimise?job=${jobId}`, result: { circuitId, rows: rows as unknown as Record<string, unknown>[], totals } };
});

// ---------------------------------------------------------------- reading a finished run

/** The result of a finished optimiser job of this organisation (and of this crossing, when given). */
export async function optimiseJobResult(organisationId: number, jobId: number, of: { crossingId: number }): Promise<CrossingJobResult>;
export async function optimiseJobResult(organisationId: number, jobId: number, of: "fleet"): Promise<FleetJobResult>;
export async function optimiseJobResult(organisationId: number, jobId: number, of: { crossingId: number } | "fleet"): Promise<CrossingJobResult | FleetJobResult> {
  const job = await getJob(organisationId, jobId);
  const kind = of === "fleet" ? "optimise.fleet" : "optimise.crossing";
  const result = job.result as (CrossingJobResult & FleetJobResult) | null;
  if (job.kind !== kind || job.state !== "done" || !result) throw new NotFoundError(`Optimiser run ${jobId}`);
  if (of !== "fleet" && result.crossingId !== of.crossingId) throw new NotFoundError(`Optimiser run ${jobId} of this crossing`);
  return result;
}

export type CrossingJobResult = Omit<OptimiseOutput, "quality"> & { crossingId: number; profile: { id: number; name: string } | null };
export interface FleetJobResult {
  circuitId: number | null;
  rows: FleetRow[];
  totals: { crossings: number; withRecommendation: number; equivalentAnnualCost: number; presentValue: number };
}

/** The fleet table as CSV records, one per crossing and a last one with the fleet's totals (written by toCsv). */
export function fleetCsvRecords(result: FleetJobResult): Record<string, unknown>[] {
  return [
    ...result.rows.map((r) => ({
      circuit: r.circuit,
      crossing: r.crossing,
      load_profile: r.profile ?? "",
      recommended_device: r.recommended ?? "",
      storage_wh: r.storageWh ?? "",
      equivalent_annual_cost: r.equivalentAnnualCost ?? "",
      present_value: r.presentValue ?? "",
      note: r.note,
    })),
    {
      circuit: "Fleet total",
      crossing: `${result.totals.withRecommendation} of ${result.totals.crossings} crossings with a recommendation`,
      load_profile: "",
      recommended_device: "",
      storage_wh: "",
      equivalent_annual_cost: result.totals.equivalentAnnualCost,
      present_value: result.totals.presentValue,
      note: "",
    },
  ];
}
