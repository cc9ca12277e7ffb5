// docs/computation.md "Solvers": the smallest storage that reaches go and the largest minimum operating
// current that still does. Both are monotone in the simulation (more storage never darkens a
// moment that was lit; a higher minimum current never lights one that was dark), so bisection
// finds the boundary. The prepared study (samples, night windows, known intervals) is reused;
// only the simulation runs again.
import type { VerdictStatus } from "../../shared/study-schemas";
import type { CompiledDevice } from "./device";
import { verdictOf } from "./figures";
import type { StudyContext } from "./prepare";
import { simulate } from "./simulate";

export interface SolverResult {
  reachable: boolean;
  /** Present when reachable: the answer, on the safe side of the tolerance. */
  value?: number;
  unit: "Wh" | "A";
  tolerance: number;
  /** Simulations run. */
  iterations: number;
  reason: string;
}

function statusWith(context: StudyContext, device: CompiledDevice): VerdictStatus {
  return verdictOf({ ...context, device }, simulate(context.prepared, device)).status;
}

/**
 * The most simulations `solveMinStorage` can run for a load of `loadW`: the run at 0 Wh, the
 * doublings from a day of load up to a year of it, then the bisection down to the tolerance.
 */
export function minStorageSolverRuns(loadW: number, toleranceWh = 1): number {
  const maxWh = loadW * 24 * 366;
  const first = Math.max(toleranceWh, loadW * 24);
  return 2 + Math.max(0, Math.ceil(Math.log2(maxWh / first))) + Math.max(0, Math.ceil(Math.log2(maxWh / toleranceWh)));
}

/** Smallest usable storage (Wh) that gives a go verdict, within `toleranceWh` (default 1 Wh). */
export function solveMinStorage(context: StudyContext, options: { toleranceWh?: number; maxWh?: number; onIteration?: (iterations: number) => void } = {}): SolverResult {
  const tolerance = options.toleranceWh ?? 1;
  const base = context.device;
  const { loadW } = base.device;
  // "Huge": a whole year of load from storage alone.
  const maxWh = options.maxWh ?? loadW * 24 * 366;
  let iterations = 0;
  const goAt = (wh: number) => {
    iterations++;
    const status = statusWith(context, base.withChanges({ storageWh: wh }));
    options.onIteration?.(iterations);
    return status;
  };
  const result = (reachable: boolean, reason: string, value?: number): SolverResult => ({
    reachable,
    value,
    unit: "Wh",
    tolerance,
    iterations,
    reason,
  });

  const atZero = goAt(0);
  if (atZero === "insufficient-data") return result(false, "Not enough data for a verdict, so no storage size can be shown to reach go.");
  if (atZero === "go") return result(true, "Go without any storage.", 0);

  let lo = 0;
  let hi = Math.max(tolerance, loadW * 24); // start from one day of load and double
  for (;;) {
    const s = goAt(hi);
    if (s === "go") break;
    lo = hi;
    if (hi >= maxWh) {
      return result(false, `Even ${formatNumber(maxWh)} Wh of storage (a year of load) does not reach go: the light is dark for reasons storage cannot cover (e.g. it starts empty, or current is too low for too long).`);
    }
    hi = Math.min(maxWh, hi * 2);
  }
  while (hi - lo > tolerance) {
    const mid = (lo + hi) / 2;
    if (goAt(mid) === "go") hi = mid;
    else lo = mid;
  }
  // Round up to the tolerance grid: by monotonicity a larger store is still go.
  const value = Math.ceil(hi / tolerance - 1e-9) * tolerance;
  return result(true, `Go from about ${formatNumber(value)} Wh of usable storage (found within ${tolerance} Wh).`, value);
}

/** Largest minimum operating current (A) that still gives a go verdict, within `toleranceA` (default 0.5 A). */
export function solveMaxMinCurrent(context: StudyContext, options: { toleranceA?: number; onIteration?: (iterations: number) => void } = {}): SolverResult {
  const tolerance = options.toleranceA ?? 0.5;
  const base = context.device;
  const { maxCurrentA } = base.device;
  let iterations = 0;
  const goAt = (a: number) => {
    iterations++;
    const status = statusWith(context, base.withChanges({ minCurrentA: a }));
    options.onIteration?.(iterations);
    return status;
  };
  const result = (reachable: boolean, reason: string, value?: number): SolverResult => ({
    reachable,
    value,
    unit: "A",
    tolerance,
    iterations,
    reason,
  });

  const atZero = goAt(0);
  if (atZero === "insufficient-data") return result(false, "Not enough data for a verdict, so no minimum current can be shown to reach go.");
  if (atZero !== "go") {
    return result(false, "Not go even with a minimum operating current of 0 A: the harvest, load or storage must change instead.");
  }
  const top = Math.max(0, maxCurrentA - tolerance);
  if (goAt(top) === "go") {
    return result(true, `Go with any minimum operating current up to the rated maximum (${formatNumber(maxCurrentA)} A).`, top);
  }
  let lo = 0;
  let hi = top;
  while (hi - lo > tolerance) {
    const mid = (lo + hi) / 2;
    if (goAt(mid) === "go") lo = mid;
    else hi = mid;
  }
  // Round down to the tolerance grid: by monotonicity a lower minimum current is still go.
  const value = Math.floor(lo / tolerance + 1e-9) * tolerance;
  return result(true, `Go for devices whose minimum operating current is at most about ${formatNumber(value)} A (found within ${tolerance} A).`, value);
}

function formatNumber(x: number): string {
  return Number(x.toPrecision(4)).toLocaleString("en-US");
}
