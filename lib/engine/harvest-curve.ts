// Harvest curves for drawing (device page, comparison): power at each current, from an expression
// or from datasheet rows, zero below the device's minimum current as the simulation has it.
import type { Device } from "../../shared/study-schemas";
import { compileDevice, compileHarvestExpression, levelCrossings } from "./device";
import { curveCurrents, interpolateHarvest } from "./harvest-points";

export type CurveDevice = Pick<Device, "minCurrentA" | "maxCurrentA" | "harvestW" | "harvestPoints">;

/** The device's harvest at each current; throws DeviceError for an expression that cannot be read. */
export function harvestCurve(device: CurveDevice, scale: "log" | "linear", count = 120): { currentA: number; watts: number }[] {
  const evaluate = device.harvestPoints?.length ? (i: number) => interpolateHarvest(device.harvestPoints!, i) : compileHarvestExpression(device.harvestW ?? "");
  const lowest = Math.max(0.1, device.minCurrentA > 0 ? device.minCurrentA / 10 : 1);
  return curveCurrents(lowest, device.maxCurrentA, scale, count).map((i) => ({ currentA: i, watts: i >= device.minCurrentA ? evaluate(i) : 0 }));
}

/** Currents at which devices are compared side by side (A). */
export const COMPARISON_CURRENTS_A = [25, 50, 100, 200, 500, 1000];

/**
 * Side-by-side figures of one device: harvest at each comparison current (0 below its minimum)
 * and the lowest current at which the harvest carries the load (null when it never does up to the
 * rated maximum), found on the engine's own table so it agrees with the simulation.
 */
export function comparisonRow(device: Device): { harvestW: number[]; carriesLoadFromA: number | null } {
  const compiled = compileDevice(device);
  const at = (i: number) => (i >= device.minCurrentA ? compiled.harvestW(i) : 0);
  const { atFrom, crossingsA } = levelCrossings(compiled.table, device.loadW, device.minCurrentA);
  const from = atFrom ? device.minCurrentA : (crossingsA[0] ?? null);
  return { harvestW: COMPARISON_CURRENTS_A.map(at), carriesLoadFromA: from !== null && from <= device.maxCurrentA ? from : null };
}
