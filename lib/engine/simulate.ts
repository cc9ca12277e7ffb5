// The storage and lighting simulation of docs/computation.md ("Lit / dark"), over a prepared study.
// One pass over the known intervals, split at required-window, month and solar-hour boundaries,
// in sub-steps of at most 5 minutes, and split again where the current crosses a threshold, so
// every piece ("atom") has one state: harvest gate, lit-on-harvest-alone, above rating.
// Typed arrays and plain numbers only in the loop: no allocation per sample, no mathjs.
import type { Series } from "../series";
import type { StudyResult } from "../../shared/study-schemas";
import { cellOf, harvestAt, levelCrossings, usableFractionAt, type CompiledDevice, type HarvestTable } from "./device";
import { prepareStudy, type PreparedStudy, type StudyContext, type StudyInput } from "./prepare";
import { buildStudyResult } from "./figures";

/** docs/computation.md: simulation sub-steps are no longer than 5 minutes. */
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
  /** Harvester state in the band: GATE_OFF below the drop-out, GATE_ON from the turn-on current, GATE_HOLD between (hysteresis). */
  gate: Uint8Array;
  aboveMax: Uint8Array;
  /** Harvest alone covers the load while the harvester is on (lit without storage while required). */
  selfLit: Uint8Array;
  /** Harvest alone covers the standby draw (outside required time). */
  selfStandby: Uint8Array;
}

export const GATE_OFF = 0;
export const GATE_ON = 1;
export const GATE_HOLD = 2;

/** The current at which the harvester switches on: turnOnCurrentA, never below the drop-out minCurrentA. */
export function turnOnCurrentOf(device: CompiledDevice["device"]): number {
  return Math.max(device.turnOnCurrentA ?? device.minCurrentA, device.minCurrentA);
}

export function currentBands(device: CompiledDevice): Bands {
  const { minCurrentA, maxCurrentA, loadW, standbyW } = device.device;
  const turnOnA = turnOnCurrentOf(device.device);
  const table = device.table;
  // "Above the rating" is strict: the threshold sits one step above maxCurrentA.
  const aboveMaxFrom = maxCurrentA + Math.max(Math.abs(maxCurrentA) * Number.EPSILON, Number.MIN_VALUE);
  const lit = levelCrossings(table, loadW, minCurrentA);
  const stby = levelCrossings(table, standbyW, minCurrentA);
  const all = [minCurrentA, turnOnA, aboveMaxFrom, ...lit.crossingsA, ...stby.crossingsA].sort((a, b) => a - b);
  const thresholds = Float64Array.from(all.filter((x, i) => i === 0 || x > all[i - 1]));
  const count = thresholds.length + 1;
  const aboveMin = new Uint8Array(count);
  const gate = new Uint8Array(count);
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
    gate[b] = !aboveMin[b] ? GATE_OFF : thresholds[b - 1] >= turnOnA ? GATE_ON : GATE_HOLD;
    const h = device.harvestW(mid);
    selfLit[b] = aboveMin[b] && h >= loadW ? 1 : 0;
    selfStandby[b] = aboveMin[b] && h >= standbyW ? 1 : 0;
  }
  return { thresholds, aboveMin, gate, aboveMax, selfLit, selfStandby };
}

/** Raw totals of one simulation, per month of the study's calendar (seconds, Wh). */
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
 * One run. The whole per-interval path (splitting at horizons and thresholds, the lit/dark and
 * storage step, the harvest lookup) sits in one loop over local variables: V8 keeps them in
 * registers, whereas object fields and typed-array cells are loaded and stored on every step, and
 * a call it does not inline boxes every number passed. Running totals of the current month and
 * hour-of-day cell live in locals and are written back when the month or cell changes; every total
 * still receives the same additions in the same order, so the figures are unchanged to the bit.
 * Rare events (a dark stretch closing) go through methods.
 */
class Simulation {
  private readonly table: HarvestTable;
  /** Half the slope of each harvest-table cell, so a lookup needs no division. */
  private readonly halfSlope: Float64Array;
  private readonly th: Float64Array;
  private readonly aboveMinBand: Uint8Array;
  private readonly gateBand: Uint8Array;
  /** Usable storage (Wh) and charge efficiency in each month of the calendar (cold-weather derating). */
  private readonly capByMonth: Float64Array;
  private readonly efficiencyByMonth: Float64Array;
  private readonly aboveMaxBand: Uint8Array;
  private readonly selfLitBand: Uint8Array;
  private readonly selfStandbyBand: Uint8Array;
  private readonly hasStorage: boolean;
  private readonly loadW: number;
  private readonly standbyW: number;
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
  private readonly trace: Float32Array | null;

  // State carried from the loop to the stretch after the last known time.
  private charge: number;
  private minCharge: number;
  private minChargeAt: number;
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
    this.table = compiled.table;
    const x = compiled.table.currentA;
    const y = compiled.table.powerW;
    this.halfSlope = new Float64Array(x.length);
    for (let k = 0; k + 1 < x.length; k++) this.halfSlope[k] = (y[k + 1] - y[k]) / (x[k + 1] - x[k]) / 2;
    const bands = currentBands(compiled);
    this.th = bands.thresholds;
    this.aboveMinBand = bands.aboveMin;
    this.gateBand = bands.gate;
    this.aboveMaxBand = bands.aboveMax;
    this.selfLitBand = bands.selfLit;
    this.selfStandbyBand = bands.selfStandby;
    this.hasStorage = dev.storageWh > 0;
    this.loadW = dev.loadW;
    this.standbyW = dev.standbyW;
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
    // Cold months shrink the usable storage and its charge acceptance by the device's curve.
    this.capByMonth = new Float64Array(M).fill(dev.storageWh);
    this.efficiencyByMonth = new Float64Array(M).fill(dev.chargeEfficiency);
    if (dev.coldDerating && p.monthTemperatureC) {
      for (let m = 0; m < M; m++) {
        const tempC = p.monthTemperatureC[m];
        if (tempC !== tempC) continue; // no temperature known for this month: no derating
        const f = usableFractionAt(dev.coldDerating, tempC);
        this.capByMonth[m] = dev.storageWh * f;
        this.efficiencyByMonth[m] = dev.chargeEfficiency * f;
      }
    }
    this.charge = this.hasStorage ? Math.min(dev.initialCharge * dev.storageWh, this.capByMonth[0]) : 0;
    this.minCharge = this.charge;
    this.minChargeAt = p.periodStart;
    this.trace = options.traceCharge && this.hasStorage ? new Float32Array(p.t.length).fill(NaN) : null;
  }

  run(): SimulationTotals {
    const p = this.p;
    if (this.trace && p.t[0] >= p.periodStart) this.trace[0] = this.charge;
    const covered = this.walk();
    if (covered < p.periodEnd) this.unknownStretch(covered, p.periodEnd);
    if (this.open) this.closeStretch(this.openStart, this.openEnd, this.openMonth);
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
   * The loop over sample intervals; returns the end of the last known time. Each known interval is
   * cut where the month, the required window or the solar hour changes (the "horizon"), into
   * sub-steps of at most 5 minutes, and again where the current crosses a threshold, so every
   * piece has one state: harvest gate, lit on harvest alone, above the rating.
   */
  private walk(): number {
    const p = this.p;
    const { t, amps, periodStart, periodEnd, maxGapSeconds, windows } = p;
    const months = p.months.starts;
    const linear = p.interpolation === "linear";
    const nw = windows.length >> 1;
    // The grid's clock: offset (local − UTC) in force, and when the next offset takes over.
    const clock = p.gridClock.offsets;
    let clockIndex = 0;
    let clockOffset = clock[1];
    const trace = this.trace;
    const th = this.th;
    const nth = th.length;
    const aboveMinBand = this.aboveMinBand;
    const gateBand = this.gateBand;
    const capByMonth = this.capByMonth;
    const efficiencyByMonth = this.efficiencyByMonth;
    const aboveMaxBand = this.aboveMaxBand;
    const selfLitBand = this.selfLitBand;
    const selfStandbyBand = this.selfStandbyBand;
    const hasStorage = this.hasStorage;
    let capWh = capByMonth[0];
    const loadW = this.loadW;
    const standbyW = this.standbyW;
    let efficiency = efficiencyByMonth[0];
    const decayPerSecond = this.decayPerSecond;
    const known = this.known;
    const atOrAboveMin = this.atOrAboveMin;
    const aboveMax = this.aboveMax;
    const requiredKnown = this.requiredKnown;
    const lit = this.lit;
    const dark = this.dark;
    const cellKnown = this.cellKnown;
    const cellBelowMin = this.cellBelowMin;
    // The harvest table: integralAt of device.ts, inline, with a cursor on the last cell used.
    const table = this.table;
    const hx = table.currentA;
    const hy = table.powerW;
    const hc = table.cumulative;
    const hs = this.halfSlope;
    const hLast = hx.length - 2;
    const hMaxA = table.maxA;
    let hk = 0;
    // ∫harvest dI at the end current of the last piece: the next piece usually starts there.
    let lastEndA = NaN;
    let lastEndIntegral = 0;

    let charge = this.charge;
    // Hysteresis: the harvester's state carries from piece to piece; it starts off.
    let on = false;
    let minCharge = this.minCharge;
    let minChargeAt = this.minChargeAt;
    let lastDecayDt = -1;
    let lastDecay = 1;
    let open = false;
    let openStart = 0;
    let openEnd = 0;
    let openMonth = 0;

    let month = 0;
    let monthKnown = known[0];
    let monthAboveMin = atOrAboveMin[0];
    let monthAboveMax = aboveMax[0];
    let monthRequiredKnown = requiredKnown[0];
    let monthLit = lit[0];
    let monthDark = dark[0];
    let cell = 0;
    let cellKnownSum = cellKnown[0];
    let cellBelowSum = cellBelowMin[0];

    let bandHint = 0;
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
      if (a > covered) {
        // Unknown time before this interval: see unknownStretch. The harvester's state is unknown
        // too; take it as off (it must see the turn-on current again).
        on = false;
        if (hasStorage && decayPerSecond > 0) {
          const gap = a - covered;
          if (gap !== lastDecayDt) {
            lastDecayDt = gap;
            lastDecay = Math.exp(-decayPerSecond * gap);
          }
          charge *= lastDecay;
        }
        if (charge < minCharge) {
          minCharge = charge;
          minChargeAt = a;
        }
      }
      const i0 = amps[i];
      const slope = linear ? (amps[i + 1] - i0) / (t1 - t0) : 0;
      let cur = a;
      let icur = i0 + slope * (a - t0);
      while (cur < b) {
        // Month, required window and solar hour hold until `horizon`; look them up again only there.
        if (cur >= horizon) {
          if (months[month + 1] <= cur) {
            known[month] = monthKnown;
            atOrAboveMin[month] = monthAboveMin;
            aboveMax[month] = monthAboveMax;
            requiredKnown[month] = monthRequiredKnown;
            lit[month] = monthLit;
            dark[month] = monthDark;
            while (months[month + 1] <= cur) month++;
            monthKnown = known[month];
            monthAboveMin = atOrAboveMin[month];
            monthAboveMax = aboveMax[month];
            monthRequiredKnown = requiredKnown[month];
            monthLit = lit[month];
            monthDark = dark[month];
            capWh = capByMonth[month];
            efficiency = efficiencyByMonth[month];
            if (charge > capWh) charge = capWh; // what the cold makes unusable is not given back
          }
          while (w < nw && windows[2 * w + 1] <= cur) w++;
          if (cur >= nextHour) {
            while (clockIndex + 2 < clock.length && clock[clockIndex + 2] <= cur) clockIndex += 2;
            clockOffset = clock[clockIndex + 1];
            let hourStart = Math.floor((cur + clockOffset) / HOUR_S) * HOUR_S;
            if (hourStart + HOUR_S - clockOffset <= cur) hourStart += HOUR_S; // rounding at an exact boundary
            nextHour = hourStart + HOUR_S - clockOffset;
            // A change of offset (daylight saving) ends the local hour early.
            if (clockIndex + 2 < clock.length && clock[clockIndex + 2] < nextHour) nextHour = clock[clockIndex + 2];
            const solarDay = Math.floor(hourStart / DAY_S);
            if (solarDay !== lastSolarDay) {
              lastSolarDay = solarDay;
              solarMonth = new Date(solarDay * DAY_S * 1000).getUTCMonth();
            }
            const nextCell = solarMonth * 24 + (hourStart - solarDay * DAY_S) / HOUR_S;
            if (nextCell !== cell) {
              cellKnown[cell] = cellKnownSum;
              cellBelowMin[cell] = cellBelowSum;
              cell = nextCell;
              cellKnownSum = cellKnown[cell];
              cellBelowSum = cellBelowMin[cell];
            }
          }
          required = w < nw && windows[2 * w] <= cur;
          horizon = w < nw ? (required ? windows[2 * w + 1] : windows[2 * w]) : Infinity;
          if (months[month + 1] < horizon) horizon = months[month + 1];
          if (nextHour < horizon) horizon = nextHour;
        }
        let next = b < horizon ? b : horizon;
        if (cur + MAX_SUBSTEP_SECONDS < next) next = cur + MAX_SUBSTEP_SECONDS;
        const inext = i0 + slope * (next - t0);

        // Current bands at both ends; a ramp that crosses thresholds is split at each crossing,
        // in time order, into pieces [s, e] with currents [is, ie] in one band.
        // (A band is the count of thresholds at or below the current; try the last one first.)
        let bandAtStart = bandHint;
        if (!((bandAtStart === 0 || th[bandAtStart - 1] <= icur) && (bandAtStart === nth || icur < th[bandAtStart]))) {
          bandAtStart = 0;
          while (bandAtStart < nth && th[bandAtStart] <= icur) bandAtStart++;
        }
        let bandAtEnd = bandAtStart;
        if (icur !== inext && !((bandAtEnd === 0 || th[bandAtEnd - 1] <= inext) && (bandAtEnd === nth || inext < th[bandAtEnd]))) {
          bandAtEnd = 0;
          while (bandAtEnd < nth && th[bandAtEnd] <= inext) bandAtEnd++;
        }
        bandHint = bandAtEnd;
        const perAmp = bandAtStart === bandAtEnd ? 0 : (next - cur) / (inext - icur);
        let band = bandAtStart;
        let s = cur;
        let is = icur;
        for (;;) {
          const lastPiece = band === bandAtEnd;
          let e = next;
          let ie = inext;
          if (!lastPiece) {
            ie = th[bandAtEnd > band ? band : band - 1];
            const crossing = cur + (ie - icur) * perAmp;
            e = Math.min(next, Math.max(s, crossing));
          }
          const dt = e - s;
          if (dt > 0) {
            // One piece of constant state (docs/computation.md "Lit / dark").
            monthKnown += dt;
            cellKnownSum += dt;
            if (aboveMinBand[band] === 1) monthAboveMin += dt;
            else cellBelowSum += dt;
            const gate = gateBand[band];
            if (gate !== GATE_HOLD) on = gate === GATE_ON;
            const gated = on;
            if (aboveMaxBand[band] === 1) monthAboveMax += dt;
            if (required) monthRequiredKnown += dt;
            let darkFrom = NaN;
            if (!hasStorage) {
              if (required) {
                if (gated && selfLitBand[band] === 1) monthLit += dt;
                else darkFrom = s;
              }
            } else {
              let harvest = 0;
              if (gated) {
                // Mean harvest along the ramp is ∫h dI / (ie − is), exact for the table.
                const width = ie - is;
                if (Math.abs(width) < 1e-9 * (1 + Math.abs(is))) {
                  harvest = harvestAt(table, (is + ie) / 2);
                } else {
                  // ∫₀^I h dI' at both ends: the table cell holding I (the cursor hk moves a step or
                  // none between lookups), then the exact quadratic inside the cell.
                  let integralEnd: number;
                  if (ie >= hMaxA) integralEnd = hc[hLast + 1] + hy[hLast + 1] * (ie - hMaxA);
                  else if (ie <= 0) integralEnd = hy[0] * ie;
                  else {
                    if (hx[hk] > ie || (hk < hLast && hx[hk + 1] <= ie)) {
                      if (hk < hLast && hx[hk + 1] <= ie && (hk + 1 >= hLast || hx[hk + 2] > ie)) hk++;
                      else if (hk > 0 && hx[hk - 1] <= ie && hx[hk] > ie) hk--;
                      else hk = cellOf(table, ie);
                    }
                    const u = ie - hx[hk];
                    integralEnd = hc[hk] + u * (hy[hk] + hs[hk] * u);
                  }
                  let integralStart: number;
                  if (is === lastEndA) integralStart = lastEndIntegral;
                  else if (is >= hMaxA) integralStart = hc[hLast + 1] + hy[hLast + 1] * (is - hMaxA);
                  else if (is <= 0) integralStart = hy[0] * is;
                  else {
                    if (hx[hk] > is || (hk < hLast && hx[hk + 1] <= is)) {
                      if (hk < hLast && hx[hk + 1] <= is && (hk + 1 >= hLast || hx[hk + 2] > is)) hk++;
                      else if (hk > 0 && hx[hk - 1] <= is && hx[hk] > is) hk--;
                      else hk = cellOf(table, is);
                    }
                    const u = is - hx[hk];
                    integralStart = hc[hk] + u * (hy[hk] + hs[hk] * u);
                  }
                  lastEndA = ie;
                  lastEndIntegral = integralEnd;
                  harvest = (integralEnd - integralStart) / width;
                }
              }
              const draw = required ? loadW : standbyW;
              const surplus = gated && (required ? selfLitBand[band] : selfStandbyBand[band]) === 1;
              if (surplus) {
                const gain = harvest > draw ? (harvest - draw) * efficiency * dt * PER_HOUR : 0;
                const charged = charge + gain;
                charge = charged < capWh ? charged : capWh;
                if (required) monthLit += dt;
              } else {
                const deficitW = draw - harvest;
                const need = deficitW > 0 ? deficitW * dt * PER_HOUR : 0;
                if (charge >= need) {
                  charge -= need;
                  if (required) monthLit += dt;
                } else {
                  // Storage runs out inside this piece: lit until empty, dark (when required) after.
                  const litFor = (charge * HOUR_S) / deficitW;
                  charge = 0;
                  if (minCharge > 0) {
                    minCharge = 0;
                    minChargeAt = s + litFor;
                  }
                  if (required) {
                    monthLit += litFor;
                    darkFrom = s + litFor;
                  }
                }
              }
              if (decayPerSecond > 0) {
                if (dt !== lastDecayDt) {
                  lastDecayDt = dt;
                  lastDecay = Math.exp(-decayPerSecond * dt);
                }
                charge *= lastDecay;
              }
              if (charge < minCharge) {
                minCharge = charge;
                minChargeAt = e;
              }
            }
            if (darkFrom === darkFrom) {
              // Dark from darkFrom to e: extend the open stretch or start a new one.
              monthDark += e - darkFrom;
              if (open && darkFrom === openEnd) openEnd = e;
              else {
                if (open) this.closeStretch(openStart, openEnd, openMonth);
                open = true;
                openStart = darkFrom;
                openEnd = e;
                openMonth = month;
              }
            }
          }
          if (lastPiece) break;
          s = e;
          is = ie;
          band += bandAtEnd > band ? 1 : -1;
        }
        cur = next;
        icur = inext;
      }
      covered = b;
      if (trace) trace[i + 1] = charge;
    }

    known[month] = monthKnown;
    atOrAboveMin[month] = monthAboveMin;
    aboveMax[month] = monthAboveMax;
    requiredKnown[month] = monthRequiredKnown;
    lit[month] = monthLit;
    dark[month] = monthDark;
    cellKnown[cell] = cellKnownSum;
    cellBelowMin[cell] = cellBelowSum;
    this.charge = charge;
    this.minCharge = minCharge;
    this.minChargeAt = minChargeAt;
    this.open = open;
    this.openStart = openStart;
    this.openEnd = openEnd;
    this.openMonth = openMonth;
    return covered;
  }

  /**
   * Unknown time: never lit or dark. Storage is carried across unchanged except for self-discharge:
   * no charge is credited (we cannot know the line carried current) and no load is debited (we
   * cannot know it did not), so the charge never rises across a gap.
   */
  private unknownStretch(a: number, b: number): void {
    if (this.hasStorage && this.decayPerSecond > 0) this.charge *= Math.exp(-this.decayPerSecond * (b - a));
    if (this.charge < this.minCharge) {
      this.minCharge = this.charge;
      this.minChargeAt = b;
    }
  }

  /** Record a finished dark stretch [start, end] that began in month `month`. */
  private closeStretch(start: number, end: number, month: number): void {
    const len = end - start;
    const k = this.stretchCount * 2;
    if (k + 2 > this.stretches.length) {
      const grown = new Float64Array(this.stretches.length * 2);
      grown.set(this.stretches);
      this.stretches = grown;
    }
    this.stretches[k] = start;
    this.stretches[k + 1] = end;
    this.stretchCount++;
    this.darkEvents[month]++;
    if (len > this.longestDark[month]) this.longestDark[month] = len;
    if (len > REPORTABLE_OUTAGE_SECONDS) this.reportable[month]++;
  }
}

/** docs/computation.md: the full study of one series (one phase already selected) with one device. */
export function runStudy(series: Series, input: StudyInput): StudyResult {
  return studyResult(prepareStudy(series, input));
}

/** The full result of a prepared study (the solvers reuse the same context). */
export function studyResult(context: StudyContext): StudyResult {
  const totals = simulate(context.prepared, context.device, { traceCharge: true });
  return { ...buildStudyResult(context, totals), coldCost: coldCost(context, totals) };
}

/** What the cold months cost: the dark hours with the device's cold derating against the same run without it. */
function coldCost(context: StudyContext, derated: SimulationTotals): StudyResult["coldCost"] {
  const p = context.prepared;
  const dev = context.device.device;
  if (!dev.coldDerating || !p.monthTemperatureC || !(dev.storageWh > 0)) return null;
  const warm = simulate(p, context.device.withChanges({ coldDerating: undefined }));
  const sum = (xs: Float64Array) => xs.reduce((a, b) => a + b, 0);
  const darkHours = sum(derated.dark) / HOUR_S;
  const darkHoursWithoutDerating = sum(warm.dark) / HOUR_S;
  const requiredKnown = sum(warm.requiredKnown);
  return {
    darkHours,
    darkHoursWithoutDerating,
    extraDarkHours: darkHours - darkHoursWithoutDerating,
    availabilityWithoutDerating: requiredKnown > 0 ? sum(warm.lit) / requiredKnown : null,
    byMonth: p.months.labels.map((month, m) => ({ month, temperatureC: Number.isNaN(p.monthTemperatureC![m]) ? null : p.monthTemperatureC![m], extraDarkHours: (derated.dark[m] - warm.dark[m]) / HOUR_S })),
  };
}
