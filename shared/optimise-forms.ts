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
  };
  return { request, names: chosen.map((d) => d.name) };
}

/** A field error of candidates[i] ("candidates0UnitCost") shown with its device's name. */
export function candidateErrorLabel(field: string, names: string[]): string | null {
  const m = /^candidates(\d+)/.exec(field);
  return m ? (names[Number(m[1])] ?? null) : null;
}
