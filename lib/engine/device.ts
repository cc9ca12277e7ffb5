// A device profile made ready for the simulation: the harvest expression is parsed and checked
// once, then tabulated over current so the inner loop never calls mathjs (docs/computation.md "Device").
import { parse, type MathNode } from "mathjs";
import { deviceSchema, type ColdPoint, type Device, type DeviceInput } from "../../shared/study-schemas";
import { harvestPointNodes, interpolateHarvest } from "./harvest-points";

/** An invalid device profile; `path` names the field, as the API's `errors: [{path, message}]` wants. */
export class DeviceError extends Error {
  constructor(
    message: string,
    readonly path: string[] = ["harvestW"],
  ) {
    super(message);
    this.name = "DeviceError";
  }
}

/** mathjs functions a harvest curve may use: plain real arithmetic only (no assignment, units, matrices, I/O). */
const ALLOWED_FUNCTIONS = new Set([
  "abs", "min", "max", "sqrt", "cbrt", "exp", "log", "log10", "log2", "pow", "square", "cube", "hypot",
  "sin", "cos", "tan", "asin", "acos", "atan", "atan2", "sinh", "cosh", "tanh",
  "floor", "ceil", "round", "fix", "sign", "mod", "clamp", "add", "subtract", "multiply", "divide",
]);
const ALLOWED_CONSTANTS = new Set(["pi", "PI", "e", "E", "tau", "phi"]);
const ALLOWED_NODES = new Set([
  "ConstantNode", "SymbolNode", "OperatorNode", "FunctionNode", "ParenthesisNode", "ConditionalNode",
]);

/** Default table range: the plausibility cap, 10 × the rated maximum (docs/computation.md "Samples"). */
export const PLAUSIBILITY_CAP_FACTOR = 10;

/** Table accuracy goal; the interpolated table stays within 0.1 % of direct evaluation. */
const TABLE_RELATIVE_TOLERANCE = 2e-4;
const TABLE_ABSOLUTE_TOLERANCE_W = 1e-6;
const TABLE_START_CELLS = 512;
const TABLE_MAX_NODES = 1 << 17;
const LOOKUP_BUCKETS = 4096;

/**
 * Harvest power tabulated over current: nodes `currentA` ascending from 0 to `maxA`, `powerW` at each
 * node (linear between nodes, held at the last value above `maxA`) and `energyAs`, the running
 * integral of power over current (W·A), which gives the exact mean harvest along a current ramp.
 */
export interface HarvestTable {
  maxA: number;
  currentA: Float64Array;
  powerW: Float64Array;
  cumulative: Float64Array;
  /** For each of LOOKUP_BUCKETS equal slices of [0, maxA], the last node at or below the slice start. */
  bucketNode: Int32Array;
}

export interface CompiledDevice {
  device: Device;
  table: HarvestTable;
  /** Harvest power in W at current I (A), from the table; ignores minCurrentA. */
  harvestW(currentA: number): number;
  /** Mean harvest in W while the current runs linearly from `fromA` to `toA`; ignores minCurrentA. */
  meanHarvestW(fromA: number, toA: number): number;
  /** Direct mathjs evaluation, for tests and checks only (slow). */
  evaluateDirect(currentA: number): number;
  /** The same device and table with other storage or minimum current (for the solvers). */
  withChanges(changes: Partial<Pick<Device, "storageWh" | "minCurrentA" | "coldDerating">>): CompiledDevice;
}

export interface CompileOptions {
  /** Highest current the table must cover; default 10 × maxCurrentA. */
  tableMaxA?: number;
  /** Reuse the table of an earlier compile of the same expression and range (default true). */
  reuseTable?: boolean;
}

/**
 * Recently built tables by expression and range. Tabulating costs thousands of mathjs evaluations
 * (milliseconds), and re-runs, what-ifs and solvers compile the same device again and again. The
 * table is a pure function of the two, so reuse gives the same numbers. Tables are read-only.
 */
const TABLE_CACHE_SIZE = 32;
const tableCache = new Map<string, HarvestTable>();

function cachedTable(expression: string, maxA: number, build: () => HarvestTable): HarvestTable {
  const key = `${maxA}\u0000${expression}`;
  const hit = tableCache.get(key);
  if (hit) {
    tableCache.delete(key); // re-insert: Map order is the recency order
    tableCache.set(key, hit);
    return hit;
  }
  const table = build();
  tableCache.set(key, table);
  if (tableCache.size > TABLE_CACHE_SIZE) tableCache.delete(tableCache.keys().next().value as string);
  return table;
}

/**
 * Usable share of the storage at a temperature: linear between the curve's points, held at the
 * end points outside them (docs/computation.md "Cold-weather storage"). Points rise in °C.
 */
export function usableFractionAt(curve: readonly ColdPoint[], tempC: number): number {
  if (tempC <= curve[0].tempC) return curve[0].usableFraction;
  const last = curve[curve.length - 1];
  if (tempC >= last.tempC) return last.usableFraction;
  let k = 1;
  while (curve[k].tempC < tempC) k++;
  const a = curve[k - 1];
  const b = curve[k];
  return a.usableFraction + ((b.usableFraction - a.usableFraction) * (tempC - a.tempC)) / (b.tempC - a.tempC);
}

/** Parse, check and tabulate a device profile. Throws DeviceError with a readable message. */
export function compileDevice(input: DeviceInput | Device, options: CompileOptions = {}): CompiledDevice {
  const parsed = deviceSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new DeviceError(issue.message, issue.path.map(String));
  }
  const device = parsed.data;
  const tableMaxA = options.tableMaxA ?? PLAUSIBILITY_CAP_FACTOR * device.maxCurrentA;
  if (!(tableMaxA > 0) || !Number.isFinite(tableMaxA)) {
    throw new DeviceError("The current range to tabulate must be a positive number of amperes.", ["maxCurrentA"]);
  }
  if (device.harvestPoints) {
    // Datasheet rows: the table is the rows themselves (exact for linear interpolation).
    const points = device.harvestPoints;
    const nodes = harvestPointNodes(points, tableMaxA);
    const table = tableFromNodes(Float64Array.from(nodes.currentA), Float64Array.from(nodes.powerW));
    return assemble(device, table, (i) => interpolateHarvest(points, i));
  }
  const expression = device.harvestW ?? "";
  const evaluate = compileHarvestExpression(expression);
  const table =
    options.reuseTable === false ? tabulate(evaluate, tableMaxA) : cachedTable(expression, tableMaxA, () => tabulate(evaluate, tableMaxA));
  return assemble(device, table, evaluate);
}

function assemble(device: Device, table: HarvestTable, evaluate: (i: number) => number): CompiledDevice {
  return {
    device,
    table,
    harvestW: (i) => harvestAt(table, i),
    meanHarvestW: (a, b) => meanHarvest(table, a, b),
    evaluateDirect: evaluate,
    withChanges(changes) {
      const next = { ...device, ...changes };
      if (!(next.minCurrentA < next.maxCurrentA)) {
        throw new DeviceError("Maximum current must be above the minimum operating current.", ["maxCurrentA"]);
      }
      return assemble(next, table, evaluate);
    },
  };
}

/** Parse the expression and check what it may contain; returns a direct evaluator of power at I. */
export function compileHarvestExpression(expression: string): (currentA: number) => number {
  let root: MathNode;
  try {
    root = parse(expression);
  } catch (err) {
    throw new DeviceError(`The harvest expression cannot be read: ${(err as Error).message}.`);
  }
  let usesCurrent = false;
  root.traverse((node, path, parent) => {
    if (!ALLOWED_NODES.has(node.type)) {
      throw new DeviceError(
        `The harvest expression may only use numbers, I, arithmetic, comparisons, "? :" and functions such as min, max and sqrt (found ${describeNode(node)}).`,
      );
    }
    if (node.type === "ConstantNode" && typeof (node as unknown as { value: unknown }).value !== "number") {
      throw new DeviceError("The harvest expression may only contain numbers, not text.");
    }
    if (node.type !== "SymbolNode") return;
    const name = (node as unknown as { name: string }).name;
    if (path === "fn" && parent?.type === "FunctionNode") {
      if (!ALLOWED_FUNCTIONS.has(name)) {
        throw new DeviceError(
          `Unknown function "${name}" in the harvest expression. Allowed: ${[...ALLOWED_FUNCTIONS].join(", ")}.`,
        );
      }
      return;
    }
    if (name === "I") usesCurrent = true;
    else if (!ALLOWED_CONSTANTS.has(name)) {
      throw new DeviceError(
        `Unknown symbol "${name}" in the harvest expression. Use I for the line current in amperes; constants allowed: pi, e.`,
      );
    }
  });
  if (!usesCurrent) {
    throw new DeviceError("The harvest expression does not depend on the line current I (e.g. min(0.004 * I^2, 15)).");
  }
  const code = root.compile();
  const scope = { I: 0 };
  return (currentA: number) => {
    scope.I = currentA;
    let value: unknown;
    try {
      value = code.evaluate(scope);
    } catch (err) {
      throw new DeviceError(`The harvest expression fails at I = ${formatA(currentA)}: ${(err as Error).message}.`);
    }
    if (typeof value === "boolean") value = value ? 1 : 0;
    if (typeof value !== "number") {
      throw new DeviceError(`The harvest expression does not give a real number of watts at I = ${formatA(currentA)}.`);
    }
    return value;
  };
}

function describeNode(node: MathNode): string {
  switch (node.type) {
    case "AssignmentNode":
    case "FunctionAssignmentNode":
      return "an assignment";
    case "ArrayNode":
      return "a list or matrix";
    case "AccessorNode":
    case "IndexNode":
      return "an index";
    case "ObjectNode":
      return "an object";
    case "BlockNode":
      return "several statements";
    case "RangeNode":
      return "a range";
    default:
      return node.type;
  }
}

function formatA(a: number): string {
  return `${Number(a.toPrecision(6))} A`;
}

function checkedPower(evaluate: (i: number) => number, currentA: number): number {
  const p = evaluate(currentA);
  if (!Number.isFinite(p)) {
    throw new DeviceError(`The harvest power is not a finite number at I = ${formatA(currentA)}.`);
  }
  if (p < 0) {
    throw new DeviceError(
      `The harvest power is negative (${Number(p.toPrecision(4))} W) at I = ${formatA(currentA)}; use max(0, …) if the curve dips below zero.`,
    );
  }
  return p;
}

/**
 * Adaptive table: start from an even grid, halve every cell where the curve at the quarter points
 * or the middle differs from the straight line between the cell's ends by more than the tolerance.
 * This keeps the table small where the curve is straight (e.g. a saturated harvester) and dense
 * near kinks and near zero for I² curves.
 */
function tabulate(evaluate: (i: number) => number, maxA: number): HarvestTable {
  const xs: number[] = [];
  const ys: number[] = [];
  const push = (x: number, y: number) => {
    if (xs.length >= TABLE_MAX_NODES) {
      throw new DeviceError("The harvest expression is too irregular to tabulate over the current range.");
    }
    xs.push(x);
    ys.push(y);
  };
  const minWidth = maxA * 1e-10;
  const refine = (a: number, fa: number, b: number, fb: number, depth: number) => {
    // Compare the straight line with the curve at the quarter points and the middle.
    const m = (a + b) / 2;
    const fm = checkedPower(evaluate, m);
    const q1 = (a + m) / 2;
    const q3 = (m + b) / 2;
    const f1 = checkedPower(evaluate, q1);
    const f3 = checkedPower(evaluate, q3);
    const off = (x: number, fx: number) => Math.abs(fx - (fa + ((fb - fa) * (x - a)) / (b - a))) - TABLE_RELATIVE_TOLERANCE * Math.abs(fx);
    const worst = Math.max(off(m, fm), off(q1, f1), off(q3, f3));
    if (worst > TABLE_ABSOLUTE_TOLERANCE_W && b - a > minWidth && depth < 60) {
      refine(a, fa, m, fm, depth + 1);
      refine(m, fm, b, fb, depth + 1);
    } else {
      push(b, fb);
    }
  };
  const step = maxA / TABLE_START_CELLS;
  let fa = checkedPower(evaluate, 0);
  push(0, fa);
  for (let k = 0; k < TABLE_START_CELLS; k++) {
    const a = k * step;
    const b = k === TABLE_START_CELLS - 1 ? maxA : (k + 1) * step;
    const fb = checkedPower(evaluate, b);
    refine(a, fa, b, fb, 0);
    fa = fb;
  }
  return tableFromNodes(Float64Array.from(xs), Float64Array.from(ys));
}

/** A table over nodes rising from 0 A; its range ends at the last node. */
function tableFromNodes(currentA: Float64Array, powerW: Float64Array): HarvestTable {
  const maxA = currentA[currentA.length - 1];
  const cumulative = new Float64Array(currentA.length);
  for (let k = 1; k < currentA.length; k++) {
    cumulative[k] = cumulative[k - 1] + ((powerW[k - 1] + powerW[k]) / 2) * (currentA[k] - currentA[k - 1]);
  }
  const bucketNode = new Int32Array(LOOKUP_BUCKETS + 1);
  let node = 0;
  for (let b = 0; b <= LOOKUP_BUCKETS; b++) {
    const x = (b / LOOKUP_BUCKETS) * maxA;
    while (node + 1 < currentA.length && currentA[node + 1] <= x) node++;
    bucketNode[b] = node;
  }
  return { maxA, currentA, powerW, cumulative, bucketNode };
}

/** Index k of the table cell [x_k, x_{k+1}] holding I (0 ≤ I < maxA). */
export function cellOf(table: HarvestTable, currentA: number): number {
  const x = table.currentA;
  let k = table.bucketNode[Math.floor((currentA / table.maxA) * LOOKUP_BUCKETS)];
  const last = x.length - 2;
  while (k < last && x[k + 1] <= currentA) k++;
  return k;
}

export function harvestAt(table: HarvestTable, currentA: number): number {
  const { currentA: x, powerW: y } = table;
  if (currentA >= table.maxA) return y[y.length - 1];
  if (currentA <= 0) return y[0];
  const k = cellOf(table, currentA);
  return y[k] + ((y[k + 1] - y[k]) * (currentA - x[k])) / (x[k + 1] - x[k]);
}

/** ∫₀^I harvest dI' over the table (W·A); linear above maxA with the held last value. */
export function integralAt(table: HarvestTable, currentA: number): number {
  const { currentA: x, powerW: y, cumulative: c } = table;
  const n = x.length;
  if (currentA >= table.maxA) return c[n - 1] + y[n - 1] * (currentA - table.maxA);
  if (currentA <= 0) return y[0] * currentA;
  const k = cellOf(table, currentA);
  const u = currentA - x[k];
  const slope = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
  return c[k] + y[k] * u + (slope * u * u) / 2;
}

/** Mean harvest while current runs linearly from a to b: ∫h dI / (b − a), exact for the table. */
export function meanHarvest(table: HarvestTable, fromA: number, toA: number): number {
  const span = toA - fromA;
  if (Math.abs(span) < 1e-9 * (1 + Math.abs(fromA))) return harvestAt(table, (fromA + toA) / 2);
  return (integralAt(table, toA) - integralAt(table, fromA)) / span;
}

/**
 * Currents from `fromA` upward where `harvest(I) − levelW` changes sign, solved exactly on the
 * table's straight pieces; with `atFrom` whether harvest ≥ level at `fromA`. Used to split the
 * timeline where the light can or cannot run on harvest alone.
 */
export function levelCrossings(table: HarvestTable, levelW: number, fromA: number): { atFrom: boolean; crossingsA: number[] } {
  const { currentA: x, powerW: y } = table;
  const atFrom = harvestAt(table, fromA) >= levelW;
  const crossingsA: number[] = [];
  let above = atFrom;
  for (let k = 0; k + 1 < x.length; k++) {
    if (x[k + 1] <= fromA) continue;
    const endAbove = y[k + 1] >= levelW;
    if (endAbove !== above) {
      const slope = (y[k + 1] - y[k]) / (x[k + 1] - x[k]);
      let at = slope === 0 ? x[k + 1] : x[k] + (levelW - y[k]) / slope;
      at = Math.min(Math.max(at, Math.max(x[k], fromA)), x[k + 1]);
      crossingsA.push(at);
      above = endAbove;
    }
  }
  return { atFrom, crossingsA };
}
