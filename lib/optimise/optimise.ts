// The cheapest device and storage size that reaches go on a crossing's load history.
//
// Conventions (docs/optimiser.md states them in full):
// - A candidate is a device profile fitted with one storage size; the device's own `storageWh`
//   is replaced by the size tried.
// - Cost of a candidate over the horizon, at the discount rate: device (unit + install) at year
//   0 and again at every whole multiple of its life inside the horizon; storage (size × cost per
//   Wh) at year 0 and at every multiple of the storage life; optional annual maintenance at the
//   end of each year. No salvage value. Present value and equivalent annual cost (capital
//   recovery factor) as in lib/costs/lifecycle.ts, whose factors are reused.
// - Pruning by monotonicity: more storage never darkens a moment that was lit, so the verdict
//   "go" is monotone in storage. For each device the smallest go size is found by bisection over
//   the sorted sizes; sizes above it are go without simulation, and sizes below the largest size
//   shown not to be go are not go. No size larger than the smallest known go size is simulated.
// - "insufficient-data" does not depend on the device (only on known hours and coverage): once
//   one simulation says so, every candidate has that verdict.
import { presentWorthOfAmount, presentWorthOfSeries, replacementYears, crf } from "../costs/lifecycle";
import { figureSet, verdictOf } from "../engine/figures";
import { prepareStudy, type PreparedStudy, type StudyContext, type StudyInput } from "../engine/prepare";
import { simulate } from "../engine/simulate";
import { DeviceError } from "../engine/device";
import { minStorageSolverRuns, solveMinStorage } from "../engine/solvers";
import type { Series } from "../series";
import type { DeviceInput, VerdictStatus } from "../../shared/study-schemas";

export interface OptimiseCandidate {
  name: string;
  device: DeviceInput;
  unitCost: number;
  installCost: number;
  lifeYears: number;
  annualMaintenance?: number;
}

export interface StorageChoice {
  sizesWh: number[];
  costPerWh: number;
  lifeYears: number;
}

export interface OptimiseInput extends Omit<StudyInput, "device"> {
  candidates: OptimiseCandidate[];
  storage: StorageChoice;
  horizonYears: number;
  discountRatePercent: number;
  /** Load growth per year (%, negative for a line losing load), compounded over each device's life. */
  loadGrowthPercentPerYear?: number;
  /** Judge each candidate on the load of the last year of its life (the history grown by the rate above). */
  requireGoInLastYear?: boolean;
}

/** Load scale of the last year of a device's life: the history grown (1 + g)^(life − 1) (docs/optimiser.md). */
export function lastYearLoadScale(loadScale: number, growthPercentPerYear: number, lifeYears: number): number {
  return loadScale * Math.pow(1 + growthPercentPerYear / 100, Math.max(0, Math.ceil(lifeYears) - 1));
}

/** How a row's verdict is known: by simulation, or inferred from a simulated neighbour. */
export type Evaluation = "simulated" | "inferred-go" | "inferred-not-go" | "inferred-insufficient-data";

export interface OptimiseRow {
  name: string;
  storageWh: number;
  /** Null when only "not go" is known (inferred from a larger size that is not go). */
  verdict: VerdictStatus | null;
  evaluation: Evaluation;
  availability: number | null;
  longestDarkStretchHours: number | null;
  presentValue: number;
  equivalentAnnualCost: number;
}

export interface OptimiseResult {
  candidates: OptimiseRow[];
  recommended: { name: string; storageWh: number; equivalentAnnualCost: number } | null;
  /** When nothing reaches go: the simulated candidate with the best availability, and what it would take. */
  closest: { name: string; storageWh: number; availability: number | null; verdict: VerdictStatus | null; wouldTake: string } | null;
  simulations: number;
}

export function candidateCost(candidate: OptimiseCandidate, storageWh: number, storage: StorageChoice, horizonYears: number, discountRatePercent: number) {
  const i = discountRatePercent / 100;
  const deviceInitial = candidate.unitCost + candidate.installCost;
  const storageInitial = storageWh * storage.costPerWh;
  const presentValue =
    deviceInitial +
    storageInitial +
    replacementYears(candidate.lifeYears, horizonYears).reduce((sum, year) => sum + presentWorthOfAmount(deviceInitial, i, year), 0) +
    replacementYears(storage.lifeYears, horizonYears).reduce((sum, year) => sum + presentWorthOfAmount(storageInitial, i, year), 0) +
    presentWorthOfSeries(candidate.annualMaintenance ?? 0, i, horizonYears);
  return { presentValue, equivalentAnnualCost: presentValue * crf(i, horizonYears) };
}

interface Outcome {
  verdict: VerdictStatus;
  availability: number | null;
  longestDarkStretchHours: number;
}

/** One device's storage sizes: bisection for the smallest go size; outcomes of the sizes simulated. */
function exploreDevice(context: StudyContext, sizes: number[], count: () => void): { outcomes: Map<number, Outcome>; smallestGo: number } {
  const outcomes = new Map<number, Outcome>();
  const run = (index: number): Outcome => {
    const known = outcomes.get(index);
    if (known) return known;
    count();
    const device = context.device.withChanges({ storageWh: sizes[index] });
    const totals = simulate(context.prepared, device);
    const whole = figureSet(context.prepared, totals).whole;
    const outcome = { verdict: verdictOf({ ...context, device }, totals).status, availability: whole.availability, longestDarkStretchHours: whole.longestDarkStretchHours };
    outcomes.set(index, outcome);
    return outcome;
  };
  // Invariant: every index < lo is not go (or unknown below a not-go), every index ≥ hi is go.
  let lo = 0;
  let hi = sizes.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const outcome = run(mid);
    if (outcome.verdict === "insufficient-data") return { outcomes, smallestGo: sizes.length };
    if (outcome.verdict === "go") hi = mid;
    else lo = mid + 1;
  }
  return { outcomes, smallestGo: lo };
}

export interface OptimiseOptions {
  /** Called after each simulation with the count so far and the most the run can need. */
  onProgress?: (simulations: number, most: number) => void;
}

export function optimise(series: Series, input: OptimiseInput, options: OptimiseOptions = {}): OptimiseResult {
  const sizes = [...new Set(input.storage.sizesWh)].sort((a, b) => a - b);
  let simulations = 0;
  // Bisection needs at most ⌈log2(sizes + 1)⌉ runs per device; when nothing reaches go, the
  // closest's solver may add as many runs as it can take for the largest load, counted as they run
  // (so the bar never sits full while they do).
  const most =
    input.candidates.length * Math.ceil(Math.log2(sizes.length + 1)) +
    Math.max(0, ...input.candidates.map((c) => minStorageSolverRuns(Number(c.device.loadW) || 0)));
  const count = () => {
    simulations++;
    options.onProgress?.(simulations, most);
  };
  const rows: OptimiseRow[] = [];
  const contexts = new Map<string, StudyContext>();
  const prepared = new Map<string, PreparedStudy>();
  let insufficient = false;

  for (const [index, candidate] of input.candidates.entries()) {
    const context = contextFor(series, input, index, prepared);
    contexts.set(candidate.name, context);
    const { outcomes, smallestGo } = insufficient ? { outcomes: new Map<number, Outcome>(), smallestGo: sizes.length } : exploreDevice(context, sizes, count);
    if ([...outcomes.values()].some((o) => o.verdict === "insufficient-data")) insufficient = true;
    sizes.forEach((storageWh, index) => {
      const outcome = outcomes.get(index);
      const evaluation: Evaluation = outcome ? "simulated" : insufficient ? "inferred-insufficient-data" : index >= smallestGo ? "inferred-go" : "inferred-not-go";
      rows.push({
        name: candidate.name,
        storageWh,
        verdict: outcome?.verdict ?? (evaluation === "inferred-go" ? "go" : evaluation === "inferred-insufficient-data" ? "insufficient-data" : null),
        evaluation,
        availability: outcome?.availability ?? null,
        longestDarkStretchHours: outcome?.longestDarkStretchHours ?? null,
        ...candidateCost(candidate, storageWh, input.storage, input.horizonYears, input.discountRatePercent),
      });
    });
  }
  // Once insufficient data is known, rows explored before it carry the same verdict.
  if (insufficient) for (const row of rows) if (row.evaluation !== "simulated") Object.assign(row, { verdict: "insufficient-data", evaluation: "inferred-insufficient-data" });

  const cheapestGo = rows.filter((r) => r.verdict === "go").sort((a, b) => a.equivalentAnnualCost - b.equivalentAnnualCost)[0];
  const recommended = cheapestGo ? { name: cheapestGo.name, storageWh: cheapestGo.storageWh, equivalentAnnualCost: cheapestGo.equivalentAnnualCost } : null;
  return { candidates: rows, recommended, closest: recommended || insufficient ? null : closestOf(rows, contexts, count), simulations };
}

/** A candidate's study context; an invalid device names the candidate and its place in the list. */
function contextFor(series: Series, input: OptimiseInput, index: number, prepared: Map<string, PreparedStudy>): StudyContext {
  const candidate = input.candidates[index];
  try {
    return prepareStudy(series, { ...input, params: paramsFor(input, candidate), device: candidate.device }, prepared);
  } catch (error) {
    if (error instanceof DeviceError) throw new DeviceError(`Candidate "${candidate.name}": ${error.message}`, ["candidates", String(index), "device", ...error.path]);
    throw error;
  }
}

/** The study parameters a candidate is judged on: the last year of its life when asked. */
function paramsFor(input: OptimiseInput, candidate: OptimiseCandidate): StudyInput["params"] {
  if (!input.requireGoInLastYear || !input.loadGrowthPercentPerYear) return input.params;
  return { ...input.params, loadScale: lastYearLoadScale(input.params?.loadScale ?? 1, input.loadGrowthPercentPerYear, candidate.lifeYears) };
}

function closestOf(rows: OptimiseRow[], contexts: Map<string, StudyContext>, count: () => void): OptimiseResult["closest"] {
  const best = rows
    .filter((r) => r.evaluation === "simulated")
    .sort((a, b) => (b.availability ?? -1) - (a.availability ?? -1) || a.equivalentAnnualCost - b.equivalentAnnualCost)[0];
  if (!best) return null;
  const solved = solveMinStorage(contexts.get(best.name)!, { onIteration: count });
  return { name: best.name, storageWh: best.storageWh, availability: best.availability, verdict: best.verdict, wouldTake: solved.reason };
}
