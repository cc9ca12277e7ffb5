// A crossing's temperatures for cold-weather storage (docs/computation.md "Cold-weather storage"):
// its monthly normals (entered on the crossing page) and the monthly means recorded by a load
// CSV's temperature column (kept with the profile).
import { z } from "zod";
import { numberListFromText } from "./fields";
import { monthlyTemperatureC } from "./study-schemas";
import type { TemperatureUnit } from "./ingest-options";

export const temperatureNormalsSchema = z.object({
  monthlyC: monthlyTemperatureC,
  source: z.string().trim().max(500, "Keep the source under 500 characters.").optional().describe("where the normals come from (station, period, publication)"),
});
export type TemperatureNormals = z.output<typeof temperatureNormalsSchema>;

/** The crossing page's form: twelve numbers as text and a source; both empty clears the normals. */
export function temperatureNormalsFromForm(form: Record<string, string>): { clear: true } | { clear: false; value: unknown } {
  const text = (form.monthlyC ?? "").trim();
  const source = (form.source ?? "").trim();
  if (text === "" && source === "") return { clear: true };
  return { clear: false, value: { monthlyC: numberListFromText(text) ?? [], source: source === "" ? undefined : source } };
}

/** Monthly means of a load CSV's temperature column, as kept with the profile. */
export interface RecordedTemperatures {
  column: string;
  unit: TemperatureUnit;
  /** Mean per UTC month, "YYYY-MM" → °C (rounded to 0.01 °C), with the readings behind it. */
  months: Record<string, { meanC: number; readings: number }>;
}
