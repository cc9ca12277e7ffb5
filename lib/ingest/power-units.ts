// Historian exports that store power instead of current (docs/computation.md "Power units"):
// three-phase power on a line of line-to-line voltage V_LL carries the current
//   I = S / (√3 · V_LL),  S = √(P² + Q²)  or  S = |P| / pf.
// Pure arithmetic; the ingest applies it per row.

import { POWER_UNITS, type PowerUnit } from "../../shared/ingest-options";

export { POWER_UNITS, type PowerUnit };

export function isPowerUnit(unit: string): unit is PowerUnit {
  return (POWER_UNITS as readonly string[]).includes(unit);
}

/** Active power (W) rather than apparent power (VA): needs a power factor or a reactive column. */
export function isActivePower(unit: PowerUnit): boolean {
  return unit === "MW" || unit === "kW";
}

/** Volt-amperes per unit of the column: 10⁶ for MW and MVA, 10³ for kW and kVA. */
function scaleOf(unit: PowerUnit): number {
  return unit === "MW" || unit === "MVA" ? 1e6 : 1e3;
}

export interface PowerConversion {
  unit: PowerUnit;
  /** Line-to-line voltage in kV. */
  voltageKv: number;
  /** Power factor for active power without a reactive column (0 < pf ≤ 1); default 1. */
  powerFactor?: number;
  /** The reactive power (MVAr for MW, kVAr for kW) comes from a second column. */
  withReactive?: boolean;
}

/**
 * Amperes per unit of apparent power: I = S·scale / (√3 · V_LL). For active power without a
 * reactive column the power factor is folded in (S = P / pf).
 */
export function ampsPerUnit(c: PowerConversion): number {
  const base = scaleOf(c.unit) / (Math.sqrt(3) * c.voltageKv * 1000);
  return isActivePower(c.unit) && !c.withReactive ? base / (c.powerFactor ?? 1) : base;
}

/**
 * Current in amperes from one reading. Power may flow either way along a line; the current is
 * its magnitude, so the sign of P (and Q) does not matter.
 */
export function currentFromPower(c: PowerConversion, value: number, reactive?: number): number {
  const s = reactive === undefined ? Math.abs(value) : Math.hypot(value, reactive);
  return s * ampsPerUnit({ ...c, withReactive: reactive !== undefined });
}

/** The conversion in words, for the quality report. */
export function describePowerConversion(c: PowerConversion, column: string, reactiveColumn?: string): string {
  const v = `${c.voltageKv} kV line-to-line`;
  const reactiveUnit = c.unit === "MW" ? "MVAr" : "kVAr";
  const s = !isActivePower(c.unit)
    ? `S = "${column}" in ${c.unit}`
    : reactiveColumn
      ? `S = √(P² + Q²) with P = "${column}" in ${c.unit} and Q = "${reactiveColumn}" in ${reactiveUnit}`
      : `S = |P| / pf with P = "${column}" in ${c.unit} and pf = ${c.powerFactor ?? 1}`;
  const perUnit = ampsPerUnit({ ...c, withReactive: Boolean(reactiveColumn) });
  return `Current from power: I = S / (√3 · V_LL) at ${v}; ${s}; 1 ${isActivePower(c.unit) && !reactiveColumn ? c.unit : c.unit === "MW" ? "MVA" : c.unit === "kW" ? "kVA" : c.unit} → ${perUnit.toPrecision(6)} A.`;
}
