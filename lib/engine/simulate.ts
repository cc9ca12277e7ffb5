// The storage and lighting simulation of product.md §3 ("Lit / dark"), over a prepared study.
// One pass over the known intervals, split at required-window, month and solar-hour boundaries,
// in sub-steps of at most 5 minutes, and split again where the current crosses a threshold, so
// every piece ("atom") has one state: harvest gate, lit-on-harvest-alone, above rating.
// Typed arrays and plain numbers only in the loop: no allocation per sample, no mathjs.
import type { Series } from "../series";
import type { StudyResult } from "../../shared/study-schemas";
import { HarvestCursor, levelCrossings, type CompiledDevice } from "./device";
import { prepareStudy, type PreparedStudy, type StudyContext, type StudyInput } from "./prepare";
import { buildStudyResult } from "./figures";

/** product.md §3: simulation sub-steps are no longer than 5 minutes. */
export const MAX_SUBSTEP_SECONDS = 300;
/** Dark stretches longer than this are reportable outages (47 CFR 17.48: not corrected within 30 minutes). */
export const REPORTABLE_OUTAGE_SECONDS = 1800;

const HOUR_S = 3600;
const PER_HOUR = 1 / HOUR_S;
const DAY_S = 86_400;

/** Current bands between the device's thresholds, and what holds inside each band. */
interface Bands {
  thresholds: Float64Array;
  aboveMin: Uint8Array;
  aboveMax: Uint8Array;
  /** Harvest alone covers the load (lit without storage while required). */
  selfLit: Uint8Array;
  /** Harvest alone covers the standby draw (outside required time). */
  selfStandby: Uint8Array;
}

export function currentBands(device: CompiledDevice): Bands {
  const { minCurrentA, maxCurrentA, loadW, standbyW } = device.device;
  const table = device.table;
  // "Above the rating" is strict: the threshold sits one step above maxCurrentA.
  const aboveMaxFrom = maxCurrentA + Math.max(Math.abs(maxCurrentA) * Number.EPSILON, Number.MIN_VALUE);
  const lit = levelCrossings(table, loadW, minCurrentA);
  const stby = levelCrossings(table, standbyW, minCurrentA);
  const all = [minCurrentA, aboveMaxFrom, ...lit.crossingsA, ...stby.crossingsA].sort((a, b) => a - b);
  const thresholds = Float64Array.from(all.filter((x, i) => i === 0 || x > all[i - 1]));
  const count = thresholds.length + 1;
  const aboveMin = new Uint8Array(count);
  const aboveMax = new Uint8Array(count);
  const selfLit = new Uint8Array(count);
  const selfStandby = new Uint8Array(count);
  for (let b = 0; b < count; b++) {
    // Band b holds currents in [thresholds[b-1], thresholds[b]); judge it at its middle.
    const lo = b === 0 ? Math.min(0, thresholds[0] - 1) : thresholds[b - 1];
    const hi = b === count - 1 ? lo + Math.max(1, Math.abs(lo)) : thresholds[b];
    const mid = (lo + hi) / 2;
    aboveMin[b] = b > 0 && thresholds[b - 1] >= minCurrentA ? 1 : 0;
    aboveMax[b] = b > 0 && thresholds[b - 1] >= aboveMaxFrom ? 1 : 0;
    const h = device.harvestW(mid);
    selfLit[b] = aboveMin[b] && h >= loadW ? 1 : 0;
    selfStandby[b] = aboveMin[b] && h >= standbyW ? 1 : 0;
  }
  return { thresholds, aboveMin, aboveMax, selfLit, selfStandby };
}

/** Raw totals of one simulation, per UTC month of the calendar (seconds, Wh). */
export interface SimulationTotals {
  known: Float64Array;
  atOrAboveMin: Float64Array;
  aboveMax: Float64Array;
  requiredKnown: Float64Array;
  lit: Float64Array;
  dark: Float64Array;
  longestDark: Float64Array;
  darkEvents: Float64Array;
  reportable: Float64Array;
  /** Dark stretches [start, end, …] in order (epoch seconds). */
  stretches: Float64Array;
  /** Known and below-min seconds by local solar hour × month: index month * 24 + hour. */
  cellKnown: Float64Array;
  cellBelowMin: Float64Array;
  minChargeWh: number;
  minChargeAt: number;
  /** Storage charge at each sample time (index into prepared.t) when traced, NaN outside the period. */
  chargeTrace: Float32Array | null;
}

export interface SimulateOptions {
  /** Keep the storage charge at every sample for the worst-week chart. */
  traceCharge?: boolean;
}

export function simulate(p: PreparedStudy, compiled: CompiledDevice, options: SimulateOptions = {}): SimulationTotals {
  return new Simulation(p, compiled, options).run();
}

/**
 * One run. A class rather than closures: V8 keeps number fields of an object in place, while
 * numbers captured and reassigned in closures are boxed on every write.
 */
class Simulation {
  private readonly harvest: HarvestCursor;
  private readonly th: Float64Array;
  private readonly nth: number;
  private readonly aboveMinBand: Uint8Array;
  private readonly aboveMaxBand: Uint8Array;
  private readonly selfLitBand: Uint8Array;
  private readonly selfStandbyBand: Uint8Array;
  private readonly capWh: number;
  private readonly hasStorage: boolean;
  private readonly loadW: number;
  private readonly standbyW: number;
  private readonly efficiency: number;
  private readonly decayPerSecond: number;

  private readonly known: Float64Array;
  private readonly atOrAboveMin: Float64Array;
  private readonly aboveMax: Float64Array;
  private readonly requiredKnown: Float64Array;
  private readonly lit: Float64Array;
  private readonly dark: Float64Array;
  private readonly longestDark: Float64Array;
  private readonly darkEvents: Float64Array;
  private readonly reportable: Float64Array;
  private readonly cellKnown = new Float64Array(12 * 24);
  private readonly cellBelowMin = new Float64Array(12 * 24);
  private stretches = new Float64Array(1024);
  private stretchCount = 0;

  private charge: number;
  private minCharge: number;
  private minChargeAt: number;
  private readonly trace: Float32Array | null;

  private month = 0;
  private cell = 0;
  /** The piece being simulated: [start, end, current at start, current at end]. */
  private readonly span = new Float64Array(4);
  private open = false;
  private openStart = 0;
  private openEnd = 0;
  private openMonth = 0;

  constructor(
    private readonly p: PreparedStudy,
    compiled: CompiledDevice,
    options: SimulateOptions,
  ) {
    const dev = compiled.device;
    this.harvest = new HarvestCursor(compiled.table);
    const bands = currentBands(compiled);
    this.th = bands.thresholds;
    this.nth = bands.thresholds.length;
    this.aboveMinBand = bands.aboveMin;
    this.aboveMaxBand = bands.aboveMax;
    this.selfLitBand = bands.selfLit;
    this.selfStandbyBand = bands.selfStandby;
    this.capWh = dev.storageWh;
    this.hasStorage = dev.storageWh > 0;
    this.loadW = dev.loadW;
    this.standbyW = dev.standbyW;
    this.efficiency = dev.chargeEfficiency;
    // Self-discharge as a share of the charge per day: charge × (1 − pct/100)^days.
    this.decayPerSecond = dev.selfDischargePctPerDay > 0 ? -Math.log(1 - dev.selfDischargePctPerDay / 100) / 86_400 : 0;
    const M = p.months.labels.length;
    this.known = new Float64Array(M);
    this.atOrAboveMin = new Float64Array(M);
    this.aboveMax = new Float64Array(M);
    this.requiredKnown = new Float64Array(M);
    this.lit = new Float64Array(M);
    this.dark = new Float64Array(M);
    this.longestDark = new Float64Array(M);
    this.darkEvents = new Float64Array(M);
    this.reportable = new Float64Array(M);
    this.charge = this.hasStorage ? dev.initialCharge * dev.storageWh : 0;
    this.minCharge = this.charge;
    this.minChargeAt = p.periodStart;
    this.trace = options.traceCharge && this.hasStorage ? new Float32Array(p.t.length).fill(NaN) : null;
  }

  run(): SimulationTotals {
    const p = this.p;
    if (this.trace && p.t[0] >= p.periodStart) this.trace[0] = this.charge;
    const covered = this.walk();
    if (covered < p.periodEnd) this.unknownStretch(covered, p.periodEnd);
    this.closeStretch();
    return {
      known: this.known,
      atOrAboveMin: this.atOrAboveMin,
      aboveMax: this.aboveMax,
      requiredKnown: this.requiredKnown,
      lit: this.lit,
      dark: this.dark,
      longestDark: this.longestDark,
      darkEvents: this.darkEvents,
      reportable: this.reportable,
      stretches: this.stretches.slice(0, this.stretchCount * 2),
      cellKnown: this.cellKnown,
      cellBelowMin: this.cellBelowMin,
      minChargeWh: this.minCharge,
      minChargeAt: this.minChargeAt,
      chargeTrace: this.trace,
    };
  }

  /**
   * The loop over sample intervals; returns the end of the last known time. Kept apart from the
   * code after it so the optimised loop does not bail out on that code's first run.
   */
  private walk(): number {
    const p = this.p;
    const { t, amps, periodStart, periodEnd, maxGapSeconds, windows } = p;
    const months = p.months.starts;
    const linear = p.interpolation === "linear";
    const nw = windows.length >> 1;
    const solarOffset = p.solarOffsetSeconds;
    const trace = this.trace;
    let w = 0;
    let nextHour = -Infinity;
    let lastSolarDay = NaN;
    let solarMonth = 0;
    let horizon = -Infinity;
    let required = false;
    let covered = periodStart;
    for (let i = 0; i + 1 < t.length; i++) {
      const t0 = t[i];
      const t1 = t[i + 1];
      if (t1 - t0 > maxGapSeconds) continue;
      const a = t0 > periodStart ? t0 : periodStart;
      const b = t1 < periodEnd ? t1 : periodEnd;
      if (b <= a) continue;
      if (a > covered) this.unknownStretch(covered, a);
      const i0 = amps[i];
      const slope = linear ? (amps[i + 1] - i0) / (t1 - t0) : 0;
      let cur = a;
      let icur = i0 + slope * (a - t0);
      while (cur < b) {
        // Month, required window and solar hour hold until `horizon`; look them up again only there.
        if (cur >= horizon) {
          while (months[this.month + 1] <= cur) this.month++;
          while (w < nw && windows[2 * w + 1] <= cur) w++;
          if (cur >= nextHour) {
            let hourStart = Math.floor((cur + solarOffset) / HOUR_S) * HOUR_S;
            if (hourStart + HOUR_S - solarOffset <= cur) hourStart += HOUR_S; // rounding at an exact boundary
            nextHour = hourStart + HOUR_S - solarOffset;
            const solarDay = Math.floor(hourStart / DAY_S);
            if (solarDay !== lastSolarDay) {
              lastSolarDay = solarDay;
              solarMonth = new Date(solarDay * DAY_S * 1000).getUTCMonth();
            }
            this.cell = solarMonth * 24 + (hourStart - solarDay * DAY_S) / HOUR_S;
          }
          required = w < nw && windows[2 * w] <= cur;
          horizon = w < nw ? (required ? windows[2 * w + 1] : windows[2 * w]) : Infinity;
          if (months[this.month + 1] < horizon) horizon = months[this.month + 1];
          if (nextHour < horizon) horizon = nextHour;
        }
        let next = b < horizon ? b : horizon;
        if (cur + MAX_SUBSTEP_SECONDS < next) next = cur + MAX_SUBSTEP_SECONDS;
        const inext = i0 + slope * (next - t0);
        const span = this.span;
        span[0] = cur;
        span[1] = next;
        span[2] = icur;
        span[3] = inext;
        this.piece(required);
        cur = next;
        icur = inext;
      }
      covered = b;
      if (trace) trace[i + 1] = this.charge;
    }
    return covered;
  }

  /**
   * Unknown time: never lit or dark. Storage is carried across unchanged except for self-discharge:
   * no charge is credited (we cannot know the line carried current) and no load is debited (we
   * cannot know it did not), so the charge never rises across a gap.
   */
  private unknownStretch(a: number, b: number): void {
    if (this.hasStorage && this.decayPerSecond > 0) this.charge *= this.decayOver(b - a);
    this.noteCharge(b);
  }

  /**
   * Split the ramp in `span` at every threshold it crosses, in time order, and hand each part to
   * atomOfSpan. Numbers travel through `span` (a typed array) rather than as arguments: a call
   * that V8 does not inline would box every number argument on the heap.
   */
  private piece(required: boolean): void {
    const span = this.span;
    const a = span[0];
    const b = span[1];
    const ia = span[2];
    const ib = span[3];
    const th = this.th;
    const nth = this.nth;
    let ba = 0;
    while (ba < nth && th[ba] <= ia) ba++;
    let bb = ba;
    if (ia !== ib) {
      bb = 0;
      while (bb < nth && th[bb] <= ib) bb++;
    }
    if (ba === bb) {
      this.atomOfSpan(ba, required);
      return;
    }
    const perAmp = (b - a) / (ib - ia);
    let s = a;
    let is = ia;
    const up = bb > ba;
    for (let j = up ? ba : ba - 1; up ? j < bb : j >= bb; j += up ? 1 : -1) {
      const tc = Math.min(b, Math.max(s, a + (th[j] - ia) * perAmp));
      span[0] = s;
      span[1] = tc;
      span[2] = is;
      span[3] = th[j];
      this.atomOfSpan(up ? j : j + 1, required);
      s = tc;
      is = th[j];
    }
    span[0] = s;
    span[1] = b;
    span[2] = is;
    span[3] = ib;
    this.atomOfSpan(bb, required);
  }

  /** One piece of constant state over span = [start, end, current at start, current at end]: current band `band`, required or not. */
  private atomOfSpan(band: number, required: boolean): void {
    const span = this.span;
    const a = span[0];
    const b = span[1];
    const dt = b - a;
    if (dt <= 0) return;
    const m = this.month;
    this.known[m] += dt;
    this.cellKnown[this.cell] += dt;
    const gated = this.aboveMinBand[band] === 1;
    if (gated) this.atOrAboveMin[m] += dt;
    else this.cellBelowMin[this.cell] += dt;
    if (this.aboveMaxBand[band] === 1) this.aboveMax[m] += dt;
    if (required) this.requiredKnown[m] += dt;
    if (!this.hasStorage) {
      if (required) {
        if (this.selfLitBand[band] === 1) this.lit[m] += dt;
        else this.markDark();
      }
      return;
    }
    const harvest = gated ? this.harvest.mean(span) : 0;
    const draw = required ? this.loadW : this.standbyW;
    const surplus = (required ? this.selfLitBand[band] : this.selfStandbyBand[band]) === 1;
    if (surplus) {
      const gain = harvest > draw ? (harvest - draw) * this.efficiency * dt * PER_HOUR : 0;
      const next = this.charge + gain;
      this.charge = next < this.capWh ? next : this.capWh;
      if (required) this.lit[m] += dt;
    } else {
      const deficitW = draw - harvest;
      const need = deficitW > 0 ? deficitW * dt * PER_HOUR : 0;
      if (this.charge >= need) {
        this.charge -= need;
        if (required) this.lit[m] += dt;
      } else {
        // Storage runs out inside this piece: lit until empty, dark (when required) after.
        const litFor = (this.charge * HOUR_S) / deficitW;
        this.charge = 0;
        if (this.minCharge > 0) {
          this.minCharge = 0;
          this.minChargeAt = a + litFor;
        }
        if (required) {
          this.lit[m] += litFor;
          span[0] = a + litFor;
          this.markDark();
        }
      }
    }
    if (this.decayPerSecond > 0) this.charge *= this.decayOver(dt);
    if (this.charge < this.minCharge) {
      this.minCharge = this.charge;
      this.minChargeAt = b;
    }
  }

  private lastDecayDt = -1;
  private lastDecay = 1;

  /** Self-discharge factor over dt seconds; most steps repeat the sampling interval, so keep the last. */
  private decayOver(dt: number): number {
    if (dt !== this.lastDecayDt) {
      this.lastDecayDt = dt;
      this.lastDecay = Math.exp(-this.decayPerSecond * dt);
    }
    return this.lastDecay;
  }

  private noteCharge(at: number): void {
    if (this.charge < this.minCharge) {
      this.minCharge = this.charge;
      this.minChargeAt = at;
    }
  }

  /** The span [span[0], span[1]] is dark: extend the open stretch or start a new one. */
  private markDark(): void {
    const s = this.span[0];
    const e = this.span[1];
    this.dark[this.month] += e - s;
    if (this.open && s === this.openEnd) {
      this.openEnd = e;
      return;
    }
    this.closeStretch();
    this.open = true;
    this.openStart = s;
    this.openEnd = e;
    this.openMonth = this.month;
  }

  private closeStretch(): void {
    if (!this.open) return;
    this.open = false;
    const len = this.openEnd - this.openStart;
    const k = this.stretchCount * 2;
    if (k + 2 > this.stretches.length) {
      const grown = new Float64Array(this.stretches.length * 2);
      grown.set(this.stretches);
      this.stretches = grown;
    }
    this.stretches[k] = this.openStart;
    this.stretches[k + 1] = this.openEnd;
    this.stretchCount++;
    const m = this.openMonth;
    this.darkEvents[m]++;
    if (len > this.longestDark[m]) this.longestDark[m] = len;
    if (len > REPORTABLE_OUTAGE_SECONDS) this.reportable[m]++;
  }
}

/** product.md §3: the full study of one series (one phase already selected) with one device. */
export function runStudy(series: Series, input: StudyInput): StudyResult {
  return studyResult(prepareStudy(series, input));
}

/** The full result of a prepared study (the solvers reuse the same context). */
export function studyResult(context: StudyContext): StudyResult {
  const totals = simulate(context.prepared, context.device, { traceCharge: true });
  return buildStudyResult(context, totals);
}
