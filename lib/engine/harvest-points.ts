// A harvest curve typed from a datasheet as (current, watts) rows (docs/computation.md
// "Harvest curve from a table"). Rows are checked by the device schema: currents rise, watts ≥ 0.
import type { HarvestPoint } from "../../shared/study-schemas";

/**
 * Harvest power at a current from datasheet rows: linear between neighbouring rows; below the
 * first row, linear from (0 A, 0 W) up to it (a harvester gives nothing without current); above
 * the last row, held at its watts (never extrapolated upward: a datasheet's last row is the most
 * it promises, and harvesters saturate).
 */
export function interpolateHarvest(points: readonly HarvestPoint[], currentA: number): number {
  const first = points[0];
  const last = points[points.length - 1];
  if (currentA >= last.currentA) return last.watts;
  if (currentA <= first.currentA) {
    if (first.currentA <= 0) return first.watts;
    return currentA <= 0 ? 0 : (first.watts * currentA) / first.currentA;
  }
  let k = 1;
  while (points[k].currentA < currentA) k++;
  const a = points[k - 1];
  const b = points[k];
  return a.watts + ((b.watts - a.watts) * (currentA - a.currentA)) / (b.currentA - a.currentA);
}

/**
 * The rows as table nodes from 0 A to at least `maxA`, exact for the rule above: the origin when
 * the first row is above 0 A, every row, and the last row's watts held out to `maxA`.
 */
export function harvestPointNodes(points: readonly HarvestPoint[], maxA: number): { currentA: number[]; powerW: number[] } {
  const currentA: number[] = [];
  const powerW: number[] = [];
  if (points[0].currentA > 0) {
    currentA.push(0);
    powerW.push(0);
  }
  for (const p of points) {
    currentA.push(p.currentA);
    powerW.push(p.watts);
  }
  const last = points[points.length - 1];
  if (last.currentA < maxA) {
    currentA.push(maxA);
    powerW.push(last.watts);
  }
  return { currentA, powerW };
}

/** How a device's harvest is given, in words (lists, reports). */
export function harvestDescription(device: { harvestW?: string; harvestPoints?: readonly HarvestPoint[] }): string {
  if (device.harvestW !== undefined) return device.harvestW;
  const p = device.harvestPoints ?? [];
  if (p.length === 0) return "—";
  return `table of ${p.length} rows, ${p[0].currentA}–${p[p.length - 1].currentA} A, up to ${Math.max(...p.map((x) => x.watts))} W`;
}

/**
 * Currents at which to draw a harvest curve up to `maxA`: evenly spaced on a linear axis; on a log
 * axis evenly spaced in log10 from `fromA` (a tenth of the lowest current of interest), so the
 * region near the minimum current gets as many points as the decades above it.
 */
export function curveCurrents(fromA: number, maxA: number, scale: "log" | "linear", count = 120): number[] {
  const top = Number.isFinite(maxA) && maxA > 0 ? maxA : 1000;
  if (scale === "linear") return Array.from({ length: count + 1 }, (_, k) => (top * k) / count);
  const bottom = Math.min(Math.max(fromA, 0.01), top / 10);
  const [a, b] = [Math.log10(bottom), Math.log10(top)];
  return Array.from({ length: count + 1 }, (_, k) => 10 ** (a + ((b - a) * k) / count));
}

/** Powers of ten from `fromA` to `toA` (log-axis ticks: 1, 10, 100, 1000 A …). */
export function decadeTicks(fromA: number, toA: number): number[] {
  const ticks: number[] = [];
  for (let e = Math.floor(Math.log10(Math.max(fromA, 1e-3))); 10 ** e <= toA * 1.0001; e++) if (10 ** e >= fromA * 0.9999) ticks.push(10 ** e);
  return ticks;
}
