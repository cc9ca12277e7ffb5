// The engine's entry for a worker process (app/utils/worker-pool.server.ts runs it in a pool of
// processes). Pure: tasks come in as plain data and typed arrays, results go back the same way, so
// nothing here knows about processes, the database or the request. Engine errors cannot cross
// into another process as their own classes, so they travel as tagged data and are rebuilt on the
// other side (`rebuildEngineError`).
import { decodeAmps, decodeTimes } from "../series-codec";
import { selectPhase, type PhaseChoice, type ProfileSeries, type Series } from "../series";
import { IngestError, ingestCsvText, type IngestExample } from "../ingest/ingest";
import { ingestSamples } from "../ingest/samples";
import { monthlyMeansC } from "../ingest/temperatures";
import type { IngestOptionsInput } from "../../shared/ingest-options";
import type { StudyResult } from "../../shared/study-schemas";
import { DeviceError } from "./device";
import { prepareStudy, StudyInputError, type StudyInput } from "./prepare";
import { studyResult } from "./simulate";
import { solveMaxMinCurrent, solveMinStorage, type SolverResult } from "./solvers";
import { optimise, type OptimiseInput, type OptimiseResult } from "../optimise/optimise";

/** A stored profile's samples as their BLOB bytes (series-codec format): decoded in the worker. */
export interface EncodedProfile {
  times: Uint8Array;
  phases: { A?: Uint8Array; B?: Uint8Array; C?: Uint8Array };
}

/** The load history of a stateless request: samples or CSV text, ingested in the worker. */
export type LoadData = { samples: readonly (readonly [string, number | null])[] } | { csv: string; csvOptions: IngestOptionsInput };

export type EngineTask =
  | {
      kind: "study";
      profile: EncodedProfile;
      phase: PhaseChoice;
      input: StudyInput;
      /** Also run both solvers (saved studies); a what-if does not. */
      solvers: boolean;
    }
  | {
      kind: "feasibility";
      data: LoadData;
      phase: PhaseChoice;
      input: StudyInput;
    }
  | {
      kind: "optimise";
      /** Samples or CSV (POST /api/v1/optimise), or a stored profile (the crossing page and circuit jobs). */
      data: LoadData | { profile: EncodedProfile };
      phase: PhaseChoice;
      input: OptimiseInput;
    };

export interface StudyOutput {
  result: StudyResult;
  solvers?: { minStorage: SolverResult; maxMinCurrent: SolverResult };
}

/** The quality report of the feasibility input (the ingest's report, with its warnings). */
export type FeasibilityQuality = Record<string, unknown>;

export type EngineError =
  | { kind: "device"; message: string; path: string[] }
  | { kind: "study-input"; message: string; issues: { path: string[]; message: string }[] }
  | { kind: "ingest"; status: IngestError["status"]; title: string; detail: string; examples: IngestExample[]; path?: string; option?: string }
  | { kind: "phase"; message: string }
  | { kind: "too-few-samples"; quality: FeasibilityQuality };

export type OptimiseOutput = OptimiseResult & { quality: FeasibilityQuality };

export type EngineReply<T> = { ok: true; value: T } | { ok: false; error: EngineError };

/** A phase that is not in the data (selectPhase throws a plain Error). */
export class PhaseError extends Error {
  name = "PhaseError";
}

/** Fewer than two valid samples: nothing can be computed. */
export class TooFewSamplesError extends Error {
  name = "TooFewSamplesError";
  constructor(readonly quality: FeasibilityQuality) {
    super("Fewer than two valid samples.");
  }
}

/** Receives a study's or the optimiser's progress (0–1) while it runs. */
export type OnProgress = (share: number) => void;

export default function runEngineTask(task: EngineTask, onProgress?: OnProgress): EngineReply<StudyOutput> | EngineReply<StudyOutput & { quality: FeasibilityQuality }> | EngineReply<OptimiseOutput> {
  try {
    if (task.kind === "optimise") return { ok: true, value: runOptimiseTask(task, onProgress) };
    return { ok: true, value: task.kind === "study" ? runStudyTask(task, onProgress) : runFeasibilityTask(task) };
  } catch (error) {
    const tagged = tagEngineError(error);
    if (tagged) return { ok: false, error: tagged };
    throw error;
  }
}

export function decodeProfile(profile: EncodedProfile): ProfileSeries {
  const phases: ProfileSeries["phases"] = {};
  for (const p of ["A", "B", "C"] as const) {
    const bytes = profile.phases[p];
    if (bytes) phases[p] = decodeAmps(bytes);
  }
  return { t: decodeTimes(profile.times), phases };
}

function channelOf(series: ProfileSeries, phase: PhaseChoice): Series {
  try {
    return selectPhase(series, phase);
  } catch (error) {
    throw new PhaseError((error as Error).message);
  }
}

function runStudyTask(task: Extract<EngineTask, { kind: "study" }>, onProgress?: OnProgress): StudyOutput {
  // Progress shares: prepare ~10 %, the study ~20 %, the storage solver (more bisection steps)
  // ~40 %, the current solver the rest. Iteration counts are typical, not bounds.
  const report = (x: number) => onProgress?.(Math.min(1, Math.max(0, x)));
  const context = prepareStudy(channelOf(decodeProfile(task.profile), task.phase), task.input);
  report(0.1);
  const result = studyResult(context);
  report(0.3);
  if (!task.solvers) return { result };
  const minStorage = solveMinStorage(context, { onIteration: (i) => report(0.3 + 0.4 * Math.min(1, i / 30)) });
  const maxMinCurrent = solveMaxMinCurrent(context, { onIteration: (i) => report(0.7 + 0.28 * Math.min(1, i / 15)) });
  report(1);
  return { result, solvers: { minStorage, maxMinCurrent } };
}

/** The channel to study from samples, CSV text or a stored profile, with the ingest's quality report. */
function loadChannel(data: LoadData | { profile: EncodedProfile }, phase: PhaseChoice, monthsTimeZone?: string): { channel: Series; quality: FeasibilityQuality; temperatureC?: Record<string, number> } {
  const { series, quality, temperatureC }: { series: ProfileSeries; quality: unknown; temperatureC?: Record<string, number> } =
    "profile" in data
      ? { series: decodeProfile(data.profile), quality: {} }
      : "samples" in data
        ? ingestSamples(data.samples)
        : (() => {
            // Recorded temperatures by the study's months: local with a timeZone, else UTC.
            const r = ingestCsvText(data.csv, data.csvOptions, { monthsTimeZone });
            return { series: r.series, quality: { ...r.quality, warnings: r.warnings }, temperatureC: monthlyMeansC(r.temperature) };
          })();
  const channel = channelOf(series, phase);
  if (channel.t.length < 2) throw new TooFewSamplesError(quality as unknown as FeasibilityQuality);
  return { channel, quality: quality as unknown as FeasibilityQuality, temperatureC };
}

/** The study input with the CSV's recorded monthly temperatures, when its temperature column gave some. */
function withRecorded<T extends { params?: StudyInput["params"] }>(input: T, temperatureC: Record<string, number> | undefined): T {
  return temperatureC ? { ...input, params: { ...input.params, recordedTemperatureC: temperatureC } } : input;
}

function runFeasibilityTask(task: Extract<EngineTask, { kind: "feasibility" }>): StudyOutput & { quality: FeasibilityQuality } {
  const { channel, quality, temperatureC } = loadChannel(task.data, task.phase, task.input.params?.timeZone);
  return { result: studyResult(prepareStudy(channel, withRecorded(task.input, temperatureC))), quality };
}

function runOptimiseTask(task: Extract<EngineTask, { kind: "optimise" }>, onProgress?: OnProgress): OptimiseOutput {
  const { channel, quality, temperatureC } = loadChannel(task.data, task.phase, task.input.params?.timeZone);
  const result = optimise(channel, withRecorded(task.input, temperatureC), { onProgress: (done, most) => onProgress?.(Math.min(0.99, done / most)) });
  return { ...result, quality };
}

function tagEngineError(error: unknown): EngineError | null {
  if (error instanceof DeviceError) return { kind: "device", message: error.message, path: [...error.path] };
  if (error instanceof StudyInputError) return { kind: "study-input", message: error.message, issues: error.issues };
  if (error instanceof IngestError) return { kind: "ingest", status: error.status, title: error.title, detail: error.detail, examples: error.examples, path: error.path, option: error.option };
  if (error instanceof PhaseError) return { kind: "phase", message: error.message };
  if (error instanceof TooFewSamplesError) return { kind: "too-few-samples", quality: error.quality };
  return null;
}

/** The engine's own error class again, on the calling thread. */
export function rebuildEngineError(error: EngineError): Error {
  switch (error.kind) {
    case "device":
      return new DeviceError(error.message, error.path);
    case "study-input":
      return new StudyInputError(error.message, error.issues);
    case "ingest":
      return Object.assign(new IngestError(error.status, error.title, error.detail, error.examples, error.path), { option: error.option });
    case "phase":
      return new PhaseError(error.message);
    case "too-few-samples":
      return new TooFewSamplesError(error.quality);
  }
}

/** Runs a task on the calling thread: the pool's fallback and the reference its tests compare with. */
export function runEngineTaskInThread<T extends EngineTask>(task: T): T extends { kind: "feasibility" } ? StudyOutput & { quality: FeasibilityQuality } : T extends { kind: "optimise" } ? OptimiseOutput : StudyOutput {
  const reply = runEngineTask(task);
  if (!reply.ok) throw rebuildEngineError(reply.error);
  return reply.value as never;
}
