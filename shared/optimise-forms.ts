// The optimiser form (crossing page and fleet page) as an optimiser request: the device profiles
// ticked become candidates with the costs typed beside them; storage is a list ("0, 20, 40") or a
// range with a step. Fields stay text: parseForm decodes them for the schema (shared/form-decode.ts).
import type { Device } from "./study-schemas";

export interface CandidateDevice {
  id: number;
  name: string;
  spec: Device;
}

const stated = (v: string | undefined) => (v === undefined || v.trim() === "" ? undefined : v);

/** The form's fields as the request body; `names[i]` is the device behind candidates[i] (for error messages). */
export function optimiseFormToRequest(form: Record<string, string>, devices: CandidateDevice[]) {
  const chosen = devices.filter((d) => form[`use-${d.id}`] === "on");
  const byRange = form.storageMode === "range";
  const request = {
    profileId: form.profileId,
    candidates: chosen.map((d) => ({
      name: d.name,
      device: d.spec,
      unitCost: form[`unitCost-${d.id}`],
      installCost: form[`installCost-${d.id}`],
      lifeYears: stated(form[`lifeYears-${d.id}`]) ?? d.spec.lifeYears,
    })),
    storage: {
      ...(byRange
        ? { range: { fromWh: form.storageRangeFromWh, toWh: form.storageRangeToWh, stepWh: form.storageRangeStepWh } }
        : { sizesWh: stated(form.storageSizesWh) ?? [] }),
      costPerWh: form.storageCostPerWh,
      lifeYears: form.storageLifeYears,
    },
    horizonYears: form.horizonYears,
    discountRatePercent: form.discountRatePercent,
    loadGrowthPercentPerYear: form.loadGrowthPercentPerYear,
    requireGoInLastYear: form.requireGoInLastYear === "on",
    monthlyTemperatureC: form.monthlyTemperatureC,
  };
  return { request, names: chosen.map((d) => d.name) };
}

/** A field error of candidates[i] ("candidates0UnitCost") shown with its device's name. */
export function candidateErrorLabel(field: string, names: string[]): string | null {
  const m = /^candidates(\d+)/.exec(field);
  return m ? (names[Number(m[1])] ?? null) : null;
}
