// The temperature column of a load CSV (docs/computation.md "Cold-weather storage"): each readable
// value is converted to °C and added to its month of the circuit's calendar (UTC when no zone is
// given); the profile keeps the monthly means, which
// the engine uses for the cold derating in the months they cover. A blank cell is a gap (skipped);
// a value that is not a number or not a plausible air temperature stops the file, naming the row,
// since a misread column would silently change every cold month.
import type { DecimalSeparator, TemperatureUnit } from "../../shared/ingest-options";
import type { RecordedTemperatures } from "../../shared/temperature-schemas";
import { isBlank, parseDecimal } from "./numbers";

/** Plausible air temperatures at a crossing (°C), the same bounds as entered monthly normals. */
export const TEMPERATURE_RANGE_C = { min: -60, max: 60 } as const;

export type { RecordedTemperatures };

/** Why a temperature cell was refused, for the caller's row-naming error. */
export type TemperatureProblem = "not-a-number" | "out-of-range";

export function toCelsius(value: number, unit: TemperatureUnit): number {
  return unit === "F" ? ((value - 32) * 5) / 9 : value;
}

/**
 * Adds readings by calendar month: local months when `offsetAt` (local − UTC seconds at a UTC
 * second) is given, else UTC months, so a circuit's means match its study's months. `add` returns
 * a problem for a cell it refuses, null otherwise.
 */
export function createTemperatureAccumulator(column: string, unit: TemperatureUnit, decimal: DecimalSeparator, offsetAt: (t: number) => number = () => 0) {
  const sums = new Map<string, { sum: number; readings: number }>();
  const stamp = new Date(0);
  return {
    add(timeSec: number, cell: string | undefined): TemperatureProblem | null {
      if (cell === undefined || isBlank(cell)) return null;
      const value = parseDecimal(cell, decimal);
      if (value !== value) return "not-a-number";
      const c = toCelsius(value, unit);
      if (c < TEMPERATURE_RANGE_C.min || c > TEMPERATURE_RANGE_C.max) return "out-of-range";
      stamp.setTime((timeSec + offsetAt(timeSec)) * 1000);
      const key = `${stamp.getUTCFullYear()}-${String(stamp.getUTCMonth() + 1).padStart(2, "0")}`;
      const month = sums.get(key) ?? { sum: 0, readings: 0 };
      month.sum += c;
      month.readings++;
      sums.set(key, month);
      return null;
    },
    /** The monthly means, or null when the column held no reading at all. */
    result(): RecordedTemperatures | null {
      if (sums.size === 0) return null;
      const months: RecordedTemperatures["months"] = {};
      for (const key of [...sums.keys()].sort()) {
        const { sum, readings } = sums.get(key)!;
        months[key] = { meanC: Math.round((sum / readings) * 100) / 100, readings };
      }
      return { column, unit, months };
    },
  };
}

/** The monthly means as the study parameter `recordedTemperatureC` ("YYYY-MM" → °C). */
export function monthlyMeansC(recorded: Pick<RecordedTemperatures, "months"> | null | undefined): Record<string, number> | undefined {
  if (!recorded) return undefined;
  return Object.fromEntries(Object.entries(recorded.months).map(([month, m]) => [month, m.meanC]));
}

/**
 * Stored months with a newer upload's months (an append): a month the newer file has readings in
 * takes its mean from the newer file (the newer export wins, as for current samples).
 */
export function mergeRecordedTemperatures(stored: RecordedTemperatures | null, newer: RecordedTemperatures | null): RecordedTemperatures | null {
  if (!newer) return stored;
  if (!stored) return newer;
  const months = { ...stored.months, ...newer.months };
  return { column: newer.column, unit: newer.unit, months: Object.fromEntries(Object.keys(months).sort().map((k) => [k, months[k]])) };
}
