// The optimiser form (crossing page and fleet page) as an optimiser request: the device profiles
// ticked become candidates with the costs typed beside them; storage is a list ("0, 20, 40") or a
// range with a step. Text stays text until here, so "" is never 0 (shared/fields.ts).
import type { Device } from "./study-schemas";
import { numberListFromText } from "./fields";

export interface CandidateDevice {
  id: number;
  name: string;
  spec: Device;
}

const number = (v: string | undefined): number | undefined => {
  if (v === undefined || v.trim() === "") return undefined;
  const x = Number(v.trim().replace(",", "."));
  return Number.isNaN(x) ? (v as unknown as number) : x; // text stays text, so zod names the field
};

/** The form's fields as the request body; `names[i]` is the device behind candidates[i] (for error messages). */
export function optimiseFormToRequest(form: Record<string, string>, devices: CandidateDevice[]) {
  const chosen = devices.filter((d) => form[`use-${d.id}`] === "on");
  const byRange = form.storageMode === "range";
  const request = {
    profileId: number(form.profileId),
    candidates: chosen.map((d) => ({
      name: d.name,
      device: d.spec,
      unitCost: number(form[`unitCost-${d.id}`]),
      installCost: number(form[`installCost-${d.id}`]),
      lifeYears: number(form[`lifeYears-${d.id}`]) ?? d.spec.lifeYears,
    })),
    storage: {
      ...(byRange
        ? { range: { fromWh: number(form.storageRangeFromWh), toWh: number(form.storageRangeToWh), stepWh: number(form.storageRangeStepWh) } }
        : { sizesWh: numberListFromText(form.storageSizesWh) ?? [] }),
      costPerWh: number(form.storageCostPerWh),
      lifeYears: number(form.storageLifeYears),
    },
    horizonYears: number(form.horizonYears),
    discountRatePercent: number(form.discountRatePercent),
    loadGrowthPercentPerYear: number(form.loadGrowthPercentPerYear),
    requireGoInLastYear: form.requireGoInLastYear === "on",
    monthlyTemperatureC: numberListFromText(form.monthlyTemperatureC),
    switchedOut: switchedOutFromText(form.switchedOut),
  };
  return { request, names: chosen.map((d) => d.name) };
}

/** A field error of candidates[i] ("candidates0UnitCost") shown with its device's name; of switchedOut[i] with its line. */
export function candidateErrorLabel(field: string, names: string[]): string | null {
  const out = /^switchedOut(\d+)/.exec(field);
  if (out) return `Switched-out line ${Number(out[1]) + 1}`;
  const m = /^candidates(\d+)/.exec(field);
  return m ? (names[Number(m[1])] ?? null) : null;
}

/** A date or a date-time without a zone is read as UTC (the engine's clock). */
function utcInstant(text: string): string {
  const t = text.trim();
  if (/^\d{4}-\d{2}-\d{2}$/.test(t)) return `${t}T00:00:00Z`;
  if (/^\d{4}-\d{2}-\d{2}[ T]\d{2}:\d{2}(:\d{2})?$/.test(t)) return `${t.replace(" ", "T")}${t.length === 16 ? ":00" : ""}Z`;
  return t;
}

/**
 * Switched-out periods typed one per line, "name, start, end" (dates or date-times, UTC unless a
 * zone is written). A line that does not split into three parts keeps its text as the name, so
 * the schema names its line and the missing times.
 */
export function switchedOutFromText(text: string | undefined): { name: string; start?: string; end?: string }[] | undefined {
  const lines = (text ?? "").split(/\r?\n/).map((l) => l.trim()).filter(Boolean);
  if (lines.length === 0) return undefined;
  return lines.map((line) => {
    const parts = line.split(/\s*[;,\t]\s*/);
    if (parts.length !== 3) return { name: line };
    return { name: parts[0], start: utcInstant(parts[1]), end: utcInstant(parts[2]) };
  });
}
