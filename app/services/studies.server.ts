import { Op } from "sequelize";
import { Circuit, Crossing, Study } from "../../db/models";
import { DeviceError, ENGINE_VERSION, prepareStudy, solveMaxMinCurrent, solveMinStorage, StudyInputError, studyResult, type StudyContext } from "../../lib/engine";
import { mergePolicy } from "../../lib/engine/verdict";
import { decimateForChart } from "../../lib/engine/timeline";
import { zoomRange } from "../../shared/zoom";
import { selectPhase } from "../../lib/series";
import type { StudyRequest, WhatIf } from "../../shared/study-forms";
import type { Device, StudyResult } from "../../shared/study-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { getCrossing } from "./circuits.server";
import { getDeviceProfile } from "./devices.server";
import { InputError, NotFoundError } from "./errors.server";
import { getPolicy } from "./policy.server";
import { getProfile, loadProfileSeries } from "./profiles.server";

/** What a study stores as its inputs: enough to re-run it even if the profile or device changes later. */
export interface StoredStudyInputs {
  /** `appends`: how many exports had been appended to the profile when the study ran. */
  profile: { id: number; name: string; appends?: number };
  deviceProfile: { id: number; name: string };
  device: Device;
  location: { lat: number; lon: number };
  schedule: StudyRequest["schedule"];
  params: StudyRequest["params"];
  policy: ReturnType<typeof mergePolicy>;
  policyOverrides: StudyRequest["policy"];
}

export interface StoredResults extends StudyResult {
  solvers: { minStorage: ReturnType<typeof solveMinStorage>; maxMinCurrent: ReturnType<typeof solveMaxMinCurrent> };
}

/** Exports appended to a profile since its upload (kept in its mapping record). */
function appendCount(mapping: unknown): number {
  const appended = (mapping as { appended?: unknown } | null)?.appended;
  return Array.isArray(appended) ? appended.length : 0;
}

/** Engine errors about the input become field errors. */
function engineInputError(error: unknown): never {
  if (error instanceof DeviceError) throw new InputError(`Device profile: ${error.message}`, "deviceProfileId", 422);
  if (error instanceof StudyInputError) throw new InputError(error.message, error.issues[0]?.path.join(".") || "params", 422);
  throw error;
}

async function contextFor(organisationId: number, inputs: StoredStudyInputs, profileId: number): Promise<StudyContext> {
  const profile = await loadProfileSeries(organisationId, profileId);
  let channel;
  try {
    channel = selectPhase(profile, inputs.params.phase);
  } catch (error) {
    throw new InputError((error as Error).message, "params.phase", 422);
  }
  try {
    return prepareStudy(channel, { device: inputs.device, schedule: inputs.schedule, location: inputs.location, params: inputs.params, policy: inputs.policy });
  } catch (error) {
    engineInputError(error);
  }
}

/** Runs a study of a crossing on the server and saves inputs and results (a new row per run). */
export async function runCrossingStudy(actor: Actor, request: StudyRequest): Promise<Study> {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, request.crossingId);
  const profile = await getProfile(actor.organisationId, request.profileId);
  if (profile.circuitId !== crossing.circuitId) throw new InputError("Choose a load profile of this crossing's circuit.", "profileId", 422);
  const device = await getDeviceProfile(actor.organisationId, request.deviceProfileId);
  if (device.retired) throw new InputError(`Device profile "${device.name}" is retired; choose one in use.`, "deviceProfileId", 422);
  const circuit = await Circuit.findOne({ where: { id: crossing.circuitId, organisationId: actor.organisationId } });
  const inputs: StoredStudyInputs = {
    profile: { id: profile.id, name: profile.name, appends: appendCount(profile.mapping) },
    deviceProfile: { id: device.id, name: device.name },
    device: device.spec,
    location: { lat: crossing.lat, lon: crossing.lon },
    schedule: request.schedule,
    // Hours above the rating are judged against the circuit's normal rating as it is at run time.
    params: { ...request.params, ratingA: circuit?.normalRatingA ?? undefined },
    policy: mergePolicy(await getPolicy(actor.organisationId), request.policy),
    policyOverrides: request.policy,
  };
  const started = performance.now();
  const context = await contextFor(actor.organisationId, inputs, profile.id);
  const result = studyResult(context);
  const results: StoredResults = { ...result, solvers: { minStorage: solveMinStorage(context), maxMinCurrent: solveMaxMinCurrent(context) } };
  const runMs = Math.round(performance.now() - started);
  return sequelize.transaction(async (transaction) => {
    const study = await Study.create(
      {
        organisationId: actor.organisationId,
        circuitId: crossing.circuitId,
        crossingId: crossing.id,
        profileId: profile.id,
        deviceProfileId: device.id,
        inputs: inputs as unknown as Record<string, unknown>,
        verdict: result.verdict.status,
        availability: result.lighting.availability,
        knownHours: result.period.knownHours,
        requiredKnownHours: result.lighting.requiredKnownHours,
        darkHours: result.lighting.darkHours,
        longestDarkHours: result.lighting.longestDarkStretchHours,
        results: results as StoredResults & Record<string, unknown>,
        engineVersion: ENGINE_VERSION,
        runMs,
        createdBy: actor.id,
      },
      { transaction },
    );
    await audit(actor, "study.run", "study", study.id, { crossingId: crossing.id, verdict: result.verdict.status }, transaction);
    return study;
  });
}

export async function getStudy(organisationId: number, id: number) {
  db();
  const study = await Study.findOne({ where: { id, organisationId } });
  if (!study) throw new NotFoundError(`Study ${id}`);
  return study;
}

export function studyJson(s: Study) {
  return {
    id: s.id,
    circuitId: s.circuitId,
    crossingId: s.crossingId,
    profileId: s.profileId,
    deviceProfileId: s.deviceProfileId,
    verdict: s.verdict,
    availability: s.availability,
    createdAt: s.createdAt.toISOString(),
    runMs: s.runMs,
    inputs: s.inputs as unknown as StoredStudyInputs,
    results: s.results as unknown as StoredResults,
  };
}

export async function listCrossingStudies(organisationId: number, crossingId: number) {
  db();
  return Study.findAll({
    where: { organisationId, crossingId },
    attributes: { exclude: ["results"] },
    order: [["createdAt", "DESC"], ["id", "DESC"]],
  });
}

export async function latestStudyOfCrossing(organisationId: number, crossingId: number) {
  db();
  return Study.findOne({ where: { organisationId, crossingId }, order: [["createdAt", "DESC"], ["id", "DESC"]] });
}

/** Recomputes a saved study with changed device figures or load scale; nothing is saved. */
export async function whatIf(organisationId: number, studyId: number, change: WhatIf) {
  const study = await getStudy(organisationId, studyId);
  if (!study.profileId) throw new InputError("The load profile of this study was deleted, so it cannot be recomputed.", "profileId", 409);
  const inputs = study.inputs as unknown as StoredStudyInputs;
  const changed: StoredStudyInputs = {
    ...inputs,
    device: {
      ...inputs.device,
      ...(change.minCurrentA !== undefined ? { minCurrentA: change.minCurrentA } : {}),
      ...(change.storageWh !== undefined ? { storageWh: change.storageWh } : {}),
    },
    params: { ...inputs.params, ...(change.loadScale !== undefined ? { loadScale: change.loadScale } : {}) },
  };
  if (changed.device.minCurrentA >= changed.device.maxCurrentA) {
    throw new InputError(`Minimum current must stay below the device's maximum of ${changed.device.maxCurrentA} A.`, "minCurrentA", 400);
  }
  const result = studyResult(await contextFor(organisationId, changed, study.profileId));
  return { change, summary: summaryOf(result), saved: summaryOf(study.results as unknown as StudyResult) };
}

export function summaryOf(r: StudyResult) {
  return {
    verdict: r.verdict.status,
    reasons: r.verdict.reasons,
    availability: r.lighting.availability,
    litHours: r.lighting.litHours,
    darkHours: r.lighting.darkHours,
    requiredKnownHours: r.lighting.requiredKnownHours,
    longestDarkStretchHours: r.lighting.longestDarkStretchHours,
    darkEvents: r.lighting.darkEvents,
    reportableOutages: r.lighting.reportableOutages,
    hoursBelowMin: r.current.hoursBelowMin,
  };
}

/** Counts by verdict of each crossing's latest study, and the worst crossings, for the portfolio. */
export async function portfolio(organisationId: number) {
  db();
  const crossings = await Crossing.findAll({ where: { organisationId }, include: [{ model: Circuit, attributes: ["name", "voltageKv"] }], order: [["name", "ASC"]] });
  const latest = await Study.findAll({
    where: { organisationId, id: { [Op.in]: db().literal("(SELECT MAX(id) FROM studies GROUP BY crossing_id)") } },
    attributes: { exclude: ["results", "inputs"] },
  });
  const byCrossing = new Map(latest.map((s) => [s.crossingId, s]));
  const rows = crossings.map((x) => {
    const s = byCrossing.get(x.id);
    const circuit = (x as unknown as { Circuit?: Circuit }).Circuit;
    return {
      crossingId: x.id,
      crossing: x.name,
      circuitId: x.circuitId,
      circuit: circuit?.name ?? "",
      voltageKv: circuit?.voltageKv ?? null,
      kind: x.kind,
      studyId: s?.id ?? null,
      verdict: s?.verdict ?? null,
      availability: s?.availability ?? null,
      darkHours: s?.darkHours ?? null,
      longestDarkHours: s?.longestDarkHours ?? null,
      studiedAt: s?.createdAt.toISOString() ?? null,
    };
  });
  const counts = { go: 0, marginal: 0, "no-go": 0, "insufficient-data": 0, "not-studied": 0 };
  for (const r of rows) counts[r.verdict ?? "not-studied"]++;
  const rank = { "no-go": 0, marginal: 1, "insufficient-data": 2, go: 3 } as const;
  const worst = rows
    .filter((r) => r.verdict && r.verdict !== "go")
    .sort((a, b) => rank[a.verdict!] - rank[b.verdict!] || (a.availability ?? 1) - (b.availability ?? 1))
    .slice(0, 10);
  return { counts, rows, worst };
}

/** Rows for the crossing page's list of runs. */
export async function crossingStudyRows(organisationId: number, crossingId: number) {
  const studies = await listCrossingStudies(organisationId, crossingId);
  return studies.map((s) => {
    const inputs = s.inputs as unknown as StoredStudyInputs;
    return {
      id: s.id,
      verdict: s.verdict,
      availability: s.availability,
      darkHours: s.darkHours,
      createdAt: s.createdAt.toISOString(),
      deviceName: inputs.deviceProfile?.name ?? "—",
      profileName: inputs.profile?.name ?? "—",
    };
  });
}

/** The results page: the saved study plus chart data of the current over time (zoomable). */
export async function studyPage(organisationId: number, id: number, view: { from?: string; to?: string }) {
  const study = await getStudy(organisationId, id);
  const json = studyJson(study);
  const crossing = await Crossing.findOne({ where: { id: study.crossingId, organisationId } });
  const circuit = await Circuit.findOne({ where: { id: study.circuitId, organisationId } });
  const { inputs, results } = json;
  const whole = { start: Date.parse(results.period.start) / 1000, end: Date.parse(results.period.end) / 1000 };
  const range = zoomRange(whole, view);
  let timeline = null;
  if (study.profileId) {
    const profile = await loadProfileSeries(organisationId, study.profileId).catch(() => null);
    if (profile) {
      const channel = selectPhase(profile, inputs.params.phase);
      timeline = decimateForChart(channel, {
        ...range,
        buckets: 600,
        maxGapSeconds: results.settings.maxGapSeconds,
        schedule: inputs.schedule,
        location: inputs.location,
      });
    }
  }
  return {
    study: json,
    stale: await staleReasons(organisationId, study),
    crossing: crossing ? { id: crossing.id, name: crossing.name } : null,
    circuit: circuit ? { id: circuit.id, name: circuit.name, voltageKv: circuit.voltageKv } : null,
    timeline,
  };
}

/** What changed since a study ran (device profile edited, policy changed, profile deleted), in words. */
export async function staleReasons(organisationId: number, study: Study): Promise<string[]> {
  const inputs = study.inputs as unknown as StoredStudyInputs;
  const reasons: string[] = [];
  if (!study.profileId) reasons.push("its load profile has been deleted");
  else {
    const profile = await getProfile(organisationId, study.profileId).catch(() => null);
    if (profile && appendCount(profile.mapping) > (inputs.profile?.appends ?? 0)) {
      reasons.push(`load profile "${profile.name}" has had data appended since`);
    }
  }
  if (!study.deviceProfileId) reasons.push("its device profile has been deleted");
  else {
    const device = await getDeviceProfile(organisationId, study.deviceProfileId).catch(() => null);
    if (device && JSON.stringify(device.spec) !== JSON.stringify(inputs.device)) reasons.push(`device profile "${device.name}" has been edited since`);
  }
  const policy = mergePolicy(await getPolicy(organisationId), inputs.policyOverrides ?? {});
  if (JSON.stringify(policy) !== JSON.stringify(inputs.policy)) reasons.push("the organisation's verdict policy has changed since");
  return reasons;
}

/** Runs the same study again with today's device profile and policy (a new row; the old one stays). */
export async function rerunStudy(actor: Actor, studyId: number): Promise<Study> {
  const study = await getStudy(actor.organisationId, studyId);
  const inputs = study.inputs as unknown as StoredStudyInputs;
  if (!study.profileId || !study.deviceProfileId) {
    throw new InputError("This study cannot run again as it was: its load profile or device profile has been deleted. Run a new study.", "form", 409);
  }
  return runCrossingStudy(actor, {
    crossingId: study.crossingId,
    profileId: study.profileId,
    deviceProfileId: study.deviceProfileId,
    schedule: inputs.schedule,
    params: inputs.params,
    policy: inputs.policyOverrides ?? {},
  });
}
