import { col, fn, Op, QueryTypes, type Transaction } from "sequelize";
import { Circuit, Crossing, DeviceProfile, LoadProfile, Study, type Job } from "../../db/models";
import { DeviceError, ENGINE_VERSION, StudyInputError, type SolverResult } from "../../lib/engine";
import { PhaseError, type StudyOutput } from "../../lib/engine/worker";
import { mergePolicy } from "../../lib/engine/verdict";
import { decimateForChart, type ChartData } from "../../lib/engine/timeline";
import { packTimeline } from "../../shared/packed-timeline";
import { LRUCache } from "lru-cache";
import { chartBuckets, MAX_SHADED_WINDOWS, zoomRange, type ZoomView } from "../../shared/zoom";
import { selectPhase } from "../../lib/series";
import { monthlyMeansC } from "../../lib/ingest/temperatures";
import { circuitStudiesRequestSchema, phaseChoiceProblem, studyRequestSchema, type CircuitStudiesRequest, type StudyRequest, type WhatIf } from "../../shared/study-forms";
import type { Device, StudyResult } from "../../shared/study-schemas";
import { db, inTransaction } from "../utils/db.server";
import { audit, organisationRevision, VERSIONED_CACHE_TTL_MS, type Actor } from "./audit.server";
import { circuitTimeZone, getCrossing, listCrossings } from "./circuits.server";
import { getDeviceProfile, listDeviceProfiles } from "./devices.server";
import { ruleSourceOf } from "./rule-book.server";
import { DEFAULT_RULES, referenceOf } from "../../lib/markers/rules";
import { InputError, NotFoundError } from "./errors.server";
import { getPolicy } from "./policy.server";
import { getProfile, loadProfileBlobs, loadProfileSeriesVersion } from "./profiles.server";
import { runStudyOnPool } from "../utils/worker-pool.server";
import { enqueueJob, registerJobHandler } from "./jobs.server";
import { noticeStaleApprovals } from "./reviews.server";
import { emitWebhookEvent } from "./webhooks.server";
import { toJsonText } from "../../shared/json-text";

/** What a study stores as its inputs: enough to re-run it even if the profile or device changes later. */
export interface StoredStudyInputs {
  /**
   * `appends`: how many exports had been appended to the profile when the study ran; `version` and
   * `fingerprint`: the profile's data version and the SHA-256 of its samples then (studies saved
   * before data versions lack both).
   */
  profile: { id: number; name: string; appends?: number; version?: number; fingerprint?: string | null };
  deviceProfile: { id: number; name: string };
  device: Device;
  location: { lat: number; lon: number };
  schedule: StudyRequest["schedule"];
  params: StudyRequest["params"];
  policy: ReturnType<typeof mergePolicy>;
  policyOverrides: StudyRequest["policy"];
  /** The monthly normals were the crossing's (not given with the request): a re-run takes the crossing's then. */
  normalsFromCrossing?: boolean;
}

export interface StoredResults extends StudyResult {
  solvers: { minStorage: SolverResult; maxMinCurrent: SolverResult };
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
  if (error instanceof PhaseError) throw new InputError(error.message, "params.phase", 422);
  throw error;
}

/** Runs the engine on a worker thread over a stored profile: the study and, if asked, both solvers. */
async function computeStudy(organisationId: number, inputs: StoredStudyInputs, profileId: number, solvers: boolean, onProgress?: (share: number) => void): Promise<StudyOutput> {
  // The data version the study names (kept when the profile changed since), else the current data.
  const profile = await loadProfileBlobs(organisationId, profileId, inputs.profile.version).catch((error) => {
    if (error instanceof NotFoundError) throw new InputError(`The data this study ran on (data version ${inputs.profile.version} of load profile "${inputs.profile.name}") was not kept, so it cannot be recomputed; run a new study.`, "profileId", 409);
    throw error;
  });
  try {
    return await runStudyOnPool(
      { profile, phase: inputs.params.phase, input: { device: inputs.device, schedule: inputs.schedule, location: inputs.location, params: inputs.params, policy: inputs.policy }, solvers },
      onProgress,
    );
  } catch (error) {
    engineInputError(error);
  }
}

/** Checks a study request against the organisation's records and gathers what the study stores. */
async function studyInputs(actor: Actor, request: StudyRequest) {
  const crossing = await getCrossing(actor.organisationId, request.crossingId);
  const profile = await getProfile(actor.organisationId, request.profileId);
  if (profile.circuitId !== crossing.circuitId) throw new InputError("Choose a load profile of this crossing's circuit.", "profileId", 422);
  // Refused before anything runs (a long study would otherwise fail only later, as a job).
  const phaseProblem = phaseChoiceProblem(request.params.phase, profile.phases);
  if (phaseProblem) throw new InputError(phaseProblem, "params.phase", 422);
  const device = await getDeviceProfile(actor.organisationId, request.deviceProfileId);
  if (device.retired) throw new InputError(`Device profile "${device.name}" is retired; choose one in use.`, "deviceProfileId", 422);
  const circuit = await Circuit.findOne({ where: { id: crossing.circuitId, organisationId: actor.organisationId } });
  const inputs: StoredStudyInputs = {
    profile: { id: profile.id, name: profile.name, appends: appendCount(profile.mapping), version: profile.dataVersion, fingerprint: profile.fingerprint },
    deviceProfile: { id: device.id, name: device.name },
    device: device.spec,
    location: { lat: crossing.lat, lon: crossing.lon },
    schedule: request.schedule,
    // Hours above the rating are judged against the circuit's normal rating as it is at run time,
    // and the hour × month grid counts the circuit's clock (unless the request names a zone).
    params: {
      ...request.params,
      ratingA: circuit?.normalRatingA ?? undefined,
      timeZone: request.params.timeZone ?? (circuit ? await circuitTimeZone(circuit) : undefined),
      // Cold-weather storage: the months the profile's temperature column recorded, else the
      // crossing's normals unless the request gives its own (docs/computation.md).
      monthlyTemperatureC: request.params.monthlyTemperatureC ?? crossing.temperatureNormals?.monthlyC,
      recordedTemperatureC: request.params.recordedTemperatureC ?? monthlyMeansC(profile.temperature),
    },
    policy: mergePolicy(await getPolicy(actor.organisationId), request.policy),
    policyOverrides: request.policy,
    normalsFromCrossing: !request.params.monthlyTemperatureC && !!crossing.temperatureNormals,
  };
  return { inputs, crossing, profile, device };
}

/**
 * Samples from which a saved study (the study and both solvers) is expected to take more than
 * about 2 s of CPU and so runs as a job: a year of 1-minute data measured 2.2 s
 * (docs/performance.md).
 */
export const STUDY_JOB_MIN_SAMPLES = 500_000;

/** Runs a study of a crossing on the server and saves inputs and results (a new row per run). */
export async function runCrossingStudy(actor: Actor, request: StudyRequest, options: { onProgress?: (share: number) => void; transaction?: Transaction } = {}): Promise<Study> {
  db();
  const { inputs, crossing, profile, device } = await studyInputs(actor, request);
  const started = performance.now();
  const { result, solvers } = await computeStudy(actor.organisationId, inputs, profile.id, true, options.onProgress);
  const results: StoredResults = { ...result, solvers: solvers! };
  const runMs = Math.round(performance.now() - started);
  // Inside the caller's transaction when there is one (an Idempotency-Key is saved with the study).
  const saved = await inTransaction(options.transaction, async (transaction) => {
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
    await emitWebhookEvent(
      actor.organisationId,
      "study.completed",
      { studyId: study.id, crossingId: crossing.id, circuitId: crossing.circuitId, verdict: study.verdict, availability: study.availability, url: `/api/v1/studies/${study.id}` },
      transaction,
    );
    return study;
  });
  // Approvals are compared with the new study once it is committed (the caller's transaction may still be open).
  const notice = () => noticeStaleApprovals(actor.organisationId, crossing.id);
  if (options.transaction) options.transaction.afterCommit(() => notice().catch((error) => console.error("stale-approval notice failed:", error)));
  else await notice();
  return saved;
}

registerJobHandler("study.run", async (input, { actor, progress }) => {
  const study = await runCrossingStudy(actor, studyRequestSchema.parse(input), { onProgress: progress });
  return { resultUrl: `/api/v1/studies/${study.id}`, result: { studyId: study.id, verdict: study.verdict } };
});

/**
 * Queues a study of every crossing of a circuit (one job). The request is checked against the
 * first crossing at once, so a wrong profile or device is refused before anything is queued.
 */
export async function startCircuitStudies(actor: Actor, circuitId: number, request: CircuitStudiesRequest): Promise<Job> {
  const crossings = await listCrossings(actor.organisationId, circuitId);
  if (crossings.length === 0) throw new InputError("This circuit has no crossings to study.", "circuitId", 422);
  await studyInputs(actor, { ...request, crossingId: crossings[0].id });
  return enqueueJob(actor, "circuit.studies", { circuitId, ...request });
}

registerJobHandler("circuit.studies", async (input, { actor, progress }) => {
  const { circuitId, ...rest } = input as { circuitId: number } & Record<string, unknown>;
  const request = circuitStudiesRequestSchema.parse(rest);
  const crossings = await listCrossings(actor.organisationId, circuitId);
  const studies: { crossingId: number; studyId: number; verdict: string }[] = [];
  const failed: { crossingId: number; path: string; message: string }[] = [];
  for (const [i, crossing] of crossings.entries()) {
    const share = (done: number) => progress((i + done) / crossings.length);
    try {
      const study = await runCrossingStudy(actor, { ...request, crossingId: crossing.id }, { onProgress: share });
      studies.push({ crossingId: crossing.id, studyId: study.id, verdict: study.verdict });
    } catch (error) {
      // One crossing the study cannot run for (e.g. its location) does not stop the others.
      if (!(error instanceof InputError)) throw error;
      failed.push({ crossingId: crossing.id, path: error.path, message: error.message });
    }
    share(1);
  }
  return { resultUrl: `/api/v1/circuits/${circuitId}`, result: { circuitId, studies, failed } };
});

/**
 * Runs a study now, or queues it as a job when it is expected to take long (or when asked):
 * the request is checked first either way, so a bad one is refused at once.
 */
export async function startCrossingStudy(actor: Actor, request: StudyRequest, transaction?: Transaction): Promise<{ study: Study; job?: never } | { job: Job; study?: never }> {
  const { profile } = await studyInputs(actor, request);
  const { async: asJob, ...rest } = request;
  if (asJob || profile.samples >= STUDY_JOB_MIN_SAMPLES) return { job: await enqueueJob(actor, "study.run", rest) };
  return { study: await runCrossingStudy(actor, rest, { transaction }) };
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

/** One study without its inputs and results: what a list shows. */
export function studySummaryJson(s: Study) {
  return {
    id: s.id,
    circuitId: s.circuitId,
    crossingId: s.crossingId,
    profileId: s.profileId,
    deviceProfileId: s.deviceProfileId,
    verdict: s.verdict,
    availability: s.availability,
    createdAt: s.createdAt.toISOString(),
  };
}

/**
 * Saved studies in creation order after `afterId`, at most `limit + 1` (the extra one tells
 * that there is a next page), without their bulky inputs and results.
 */
export async function listStudies(organisationId: number, page: { afterId: number; limit: number; crossingId?: number }) {
  db();
  if (page.crossingId !== undefined) await getCrossing(organisationId, page.crossingId);
  return Study.findAll({
    where: { organisationId, id: { [Op.gt]: page.afterId }, ...(page.crossingId !== undefined ? { crossingId: page.crossingId } : {}) },
    attributes: ["id", "circuitId", "crossingId", "profileId", "deviceProfileId", "verdict", "availability", "createdAt"],
    order: [["id", "ASC"]],
    limit: page.limit + 1,
  });
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
  // Another device profile on the same history and settings: devices compared on one study.
  const other = change.deviceProfileId === undefined ? null : await DeviceProfile.findOne({ where: { id: change.deviceProfileId, organisationId } });
  if (change.deviceProfileId !== undefined && !other) throw new InputError(`There is no device profile ${change.deviceProfileId} in this organisation.`, "deviceProfileId", 422);
  const baseDevice = other ? (other.spec as unknown as Device) : inputs.device;
  const changed: StoredStudyInputs = {
    ...inputs,
    device: {
      ...baseDevice,
      ...(change.minCurrentA !== undefined ? { minCurrentA: change.minCurrentA } : {}),
      ...(change.storageWh !== undefined ? { storageWh: change.storageWh } : {}),
    },
    params: {
      ...inputs.params,
      ...(change.loadScale !== undefined ? { loadScale: change.loadScale } : {}),
      ...(change.switchedOut?.length ? { switchedOut: [...(inputs.params.switchedOut ?? []), ...change.switchedOut] } : {}),
    },
  };
  if (changed.device.minCurrentA >= changed.device.maxCurrentA) {
    throw new InputError(`Minimum current must stay below the device's maximum of ${changed.device.maxCurrentA} A.`, "minCurrentA", 400);
  }
  const { result } = await computeStudy(organisationId, changed, study.profileId, false);
  return {
    change,
    device: {
      name: other?.name ?? inputs.deviceProfile.name,
      minCurrentA: changed.device.minCurrentA,
      maxCurrentA: changed.device.maxCurrentA,
      storageWh: changed.device.storageWh,
      loadScale: changed.params.loadScale ?? 1,
    },
    summary: summaryOf(result),
    saved: summaryOf(study.results as unknown as StudyResult),
    charts: chartInputsOf(result),
  };
}

/** What a study's charts draw (load-duration, monthly, hour × month, storage), so a what-if can redraw them. */
export function chartInputsOf(r: StudyResult) {
  return {
    loadDuration: r.loadDuration,
    monthly: r.monthly,
    hourMonthBelowMin: r.hourMonthBelowMin,
    storage: r.storage,
    period: r.period,
    current: { hoursAtOrAboveMin: r.current.hoursAtOrAboveMin, exceeded: r.current.exceeded, rating: r.current.rating },
  };
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

/**
 * Chart data of study pages, by profile, data version and view. The samples of one data version
 * never change (appending or replacing makes a new version; a deleted profile leaves its studies
 * without a profile id), so a cached chart stays right. Decimating a year and finding its night windows costs ~0.1 s of CPU; under
 * many readers that was most of a study page's time (docs/performance.md).
 */
const timelineCache = new LRUCache<string, ChartData>({ max: 200 });

async function studyTimeline(organisationId: number, study: Study, inputs: StoredStudyInputs, results: StoredResults, range: { start: number; end: number }): Promise<ChartData | null> {
  if (!study.profileId) return null;
  const options = { ...range, buckets: chartBuckets(range, results.settings.medianIntervalSeconds), maxGapSeconds: results.settings.maxGapSeconds, schedule: inputs.schedule, location: inputs.location };
  const key = JSON.stringify([study.profileId, inputs.profile.version ?? null, inputs.params.phase, options]);
  const cached = timelineCache.get(key);
  if (cached) return cached;
  const profile = await loadProfileSeriesVersion(organisationId, study.profileId, inputs.profile.version).catch(() => null);
  if (!profile) return null;
  const timeline = decimateForChart(selectPhase(profile, inputs.params.phase), options);
  timelineCache.set(key, timeline);
  return timeline;
}

type StudyPageData = Awaited<ReturnType<typeof computeStudyPage>>;
/** Study pages computed, by organisation, study, zoom and the organisation's data revision. */
const studyPages = new LRUCache<string, Promise<StudyPageData>>({ max: 100, ttl: VERSIONED_CACHE_TTL_MS });

/**
 * The results page: the saved study, what changed since, chart data of the current over time
 * (zoomable), the devices the what-if can switch to and the outage rule it cites. Kept until the
 * organisation's next audited change (organisationRevision): every input of the page is audited data.
 */
export async function studyPage(organisationId: number, id: number, view: ZoomView): Promise<StudyPageData> {
  const key = JSON.stringify([organisationId, id, view, await organisationRevision(organisationId)]);
  let page = studyPages.get(key);
  if (!page) {
    page = computeStudyPage(organisationId, id, view);
    // A failure (not found, database down) is not kept.
    page.catch(() => studyPages.delete(key));
    studyPages.set(key, page);
  }
  return page;
}

async function computeStudyPage(organisationId: number, id: number, view: ZoomView) {
  const study = await getStudy(organisationId, id);
  const json = studyJson(study);
  const { inputs, results } = json;
  const whole = { start: Date.parse(results.period.start) / 1000, end: Date.parse(results.period.end) / 1000 };
  const circuit = await Circuit.findOne({ where: { id: study.circuitId, organisationId } });
  // Times show in the circuit's zone as it is today (the grid keeps the clock it was counted in).
  const timeZone = circuit ? await circuitTimeZone(circuit) : "UTC";
  const range = zoomRange(whole, view, timeZone);
  const [crossing, stale, timeline, outageSource, devices] = await Promise.all([
    Crossing.findOne({ where: { id: study.crossingId, organisationId } }),
    staleReasons(organisationId, study),
    studyTimeline(organisationId, study, inputs, results, range),
    ruleSourceOf(organisationId, DEFAULT_RULES.faa.outageReporting),
    listDeviceProfiles(organisationId, { includeRetired: false }),
  ]);
  // Night windows the chart would not shade (a year has ~365) are not sent to the page either.
  const nightsShaded = !!timeline && timeline.required.length <= MAX_SHADED_WINDOWS;
  return {
    // One text, not ~2,400 values, to encode for the page on every view (shared/json-text.ts).
    study: toJsonText(json),
    stale,
    nightsShaded,
    crossing: crossing ? { id: crossing.id, name: crossing.name } : null,
    circuit: circuit ? { id: circuit.id, name: circuit.name, voltageKv: circuit.voltageKv } : null,
    timeline: timeline ? packTimeline(nightsShaded ? timeline : { ...timeline, required: [] }) : null,
    timeZone,
    range,
    whole,
    outageRule: referenceOf(outageSource),
    // The what-if may run the same study with another device profile (devices compared on one study).
    deviceChoices: devices.map((d) => ({ id: d.id, name: d.name, minCurrentA: d.spec.minCurrentA, storageWh: d.spec.storageWh ?? 0 })),
  };
}

/** Words for a profile whose data changed since the study ran; null when it did not. */
function profileDataChange(profile: { name: string; dataVersion: number; mapping: unknown } | null, inputs: StoredStudyInputs): string | null {
  if (!profile) return null;
  const ran = inputs.profile?.version;
  if (ran !== undefined) {
    if (profile.dataVersion === ran) return null;
    return `the data of load profile "${profile.name}" has changed since (appended or replaced: data version ${ran} then, ${profile.dataVersion} now); this page still shows the data the study ran on`;
  }
  // Saved before data versions: only appends were recorded, and its data was not kept.
  if (profile.dataVersion > 1 || appendCount(profile.mapping) > (inputs.profile?.appends ?? 0)) {
    return `the data of load profile "${profile.name}" has changed since (appended or replaced); the current-over-time chart shows today's data`;
  }
  return null;
}

/** What changed since a study ran (device profile edited, policy changed, profile deleted), in words. */
export async function staleReasons(organisationId: number, study: Study): Promise<string[]> {
  return (await staleReasonsOfStudies(organisationId, [study])).get(study.id) ?? [];
}

/**
 * The same for many studies at once (home lists): their load and device profiles are read in one
 * query each and the policy once, instead of three queries per study.
 */
export async function staleReasonsOfStudies(organisationId: number, studies: Study[]): Promise<Map<number, string[]>> {
  db();
  const ids = (key: "profileId" | "deviceProfileId") => [...new Set(studies.map((s) => s[key]).filter((x): x is number => x !== null))];
  const [profiles, devices, crossings, policy] = await Promise.all([
    LoadProfile.findAll({ where: { organisationId, id: ids("profileId") }, attributes: ["id", "name", "dataVersion", "mapping"] }),
    DeviceProfile.findAll({ where: { organisationId, id: ids("deviceProfileId") }, attributes: ["id", "name", "spec"] }),
    Crossing.findAll({ where: { organisationId, id: [...new Set(studies.map((s) => s.crossingId))] }, attributes: ["id", "temperatureNormals"] }),
    getPolicy(organisationId),
  ]);
  const profileById = new Map(profiles.map((p) => [p.id, p]));
  const deviceById = new Map(devices.map((d) => [d.id, d]));
  const normalsByCrossing = new Map(crossings.map((c) => [c.id, c.temperatureNormals?.monthlyC]));
  return new Map(
    studies.map((study) => {
      const inputs = study.inputs as unknown as StoredStudyInputs;
      const reasons: string[] = [];
      if (!study.profileId) reasons.push("its load profile has been deleted");
      else {
        const changed = profileDataChange(profileById.get(study.profileId) ?? null, inputs);
        if (changed) reasons.push(changed);
      }
      if (!study.deviceProfileId) reasons.push("its device profile has been deleted");
      else {
        const device = deviceById.get(study.deviceProfileId);
        if (device && JSON.stringify(device.spec) !== JSON.stringify(inputs.device)) reasons.push(`device profile "${device.name}" has been edited since`);
      }
      const merged = mergePolicy(policy, inputs.policyOverrides ?? {});
      if (JSON.stringify(merged) !== JSON.stringify(inputs.policy)) reasons.push("the organisation's verdict policy has changed since");
      const normals = normalsChange(normalsByCrossing.get(study.crossingId), inputs);
      if (normals) reasons.push(normals);
      return [study.id, reasons];
    }),
  );
}

/**
 * The crossing's monthly normal temperatures changed since a study, of a device with a cold
 * derating curve, that took them from the crossing (or ran before the crossing had any). A run that gave its own temperatures is not
 * affected; a re-run takes the crossing's current ones.
 */
function normalsChange(current: number[] | undefined, inputs: StoredStudyInputs): string | null {
  if (!inputs.device.coldDerating?.length) return null; // temperatures change nothing without a derating curve
  const used = inputs.params.monthlyTemperatureC;
  const fromCrossing = inputs.normalsFromCrossing === true || used === undefined;
  if (!fromCrossing || JSON.stringify(current ?? null) === JSON.stringify(used ?? null)) return null;
  if (used === undefined) return "monthly normal temperatures have been entered for the crossing since (the cold derating would use them)";
  return current === undefined ? "the crossing's monthly normal temperatures have been cleared since" : "the crossing's monthly normal temperatures have changed since";
}

/** Runs the same study again with today's device profile and policy (a new row; the old one stays). */
export async function rerunStudy(actor: Actor, studyId: number) {
  const study = await getStudy(actor.organisationId, studyId);
  const inputs = study.inputs as unknown as StoredStudyInputs;
  if (!study.profileId || !study.deviceProfileId) {
    throw new InputError("This study cannot run again as it was: its load profile or device profile has been deleted. Run a new study.", "form", 409);
  }
  // Today's circuit rating and time zone apply, as for any new run, and so do the profile's recorded
  // temperatures and (when the study took them from the crossing) the crossing's normals.
  const { ratingA: _rating, timeZone: _zone, recordedTemperatureC: _recorded, ...params } = inputs.params;
  if (inputs.normalsFromCrossing) delete params.monthlyTemperatureC;
  return startCrossingStudy(actor, {
    crossingId: study.crossingId,
    profileId: study.profileId,
    deviceProfileId: study.deviceProfileId,
    schedule: inputs.schedule,
    params,
    policy: inputs.policyOverrides ?? {},
  });
}
