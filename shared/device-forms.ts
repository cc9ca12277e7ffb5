import { z } from "zod";
import { deviceSchema } from "./study-schemas";
import { nameField, textField } from "./fields";

/** The cold derating curve as typed on the form: "°C:fraction" pairs, e.g. "-20:0.5, 0:0.8, 20:1"; `decodeForm` reads the numbers. */
export function coldDeratingFromText(text: string | undefined): unknown {
  if (text === undefined || text.trim() === "") return undefined;
  const pairs = text.split(/[,;\n]+/).map((p) => p.trim()).filter(Boolean);
  const points = pairs.map((p) => /^([-−+]?\d+(?:\.\d+)?)\s*:\s*(\d+(?:\.\d+)?)$/.exec(p));
  // Text that does not read as pairs stays text, so the schema names the field.
  if (points.some((m) => !m)) return text;
  return points.map((m) => ({ tempC: m![1], usableFraction: m![2] }));
}

/** The curve back as the form's text. */
export function coldDeratingText(curve: { tempC: number; usableFraction: number }[] | undefined): string {
  return (curve ?? []).map((p) => `${p.tempC}:${p.usableFraction}`).join(", ");
}

/** Form names of a harvest table's cells: harvestPoints.0.currentA, harvestPoints.0.watts, … */
export const harvestCellName = (row: number, field: "currentA" | "watts") => `harvestPoints.${row}.${field}`;

/**
 * The harvest table's rows from the form's cells, in row order, as text (parseForm decodes the
 * numbers). Rows left empty at the end are dropped; an empty row in the middle stays, so its
 * message names the row the user sees.
 */
export function harvestPointsFromForm(form: Record<string, string>): unknown[] {
  const rows: Record<string, string>[] = [];
  for (const [key, value] of Object.entries(form)) {
    const m = /^harvestPoints\.(\d{1,3})\.(currentA|watts)$/.exec(key);
    if (m) (rows[Number(m[1])] ??= {})[m[2]] = value;
  }
  const filled = Array.from(rows, (r) => r ?? {});
  while (filled.length > 0 && Object.values(filled[filled.length - 1]).every((v) => v.trim() === "")) filled.pop();
  return filled.map((r) => ({ currentA: r.currentA ?? "", watts: r.watts ?? "" }));
}

/**
 * A device form's fields as the profile's input (parseForm decodes the numbers): the cold curve
 * from its pairs, and the harvest as the expression or the table, whichever the form's
 * `harvestMode` chose.
 */
export function deviceFormToInput(form: Record<string, string>): Record<string, unknown> {
  const { harvestMode, harvestW, ...rest } = Object.fromEntries(Object.entries(form).filter(([k]) => !k.startsWith("harvestPoints.")));
  const harvest = harvestMode === "table" ? { harvestPoints: harvestPointsFromForm(form) } : { harvestW };
  return { ...rest, ...harvest, coldDerating: coldDeratingFromText(form.coldDerating) };
}


/**
 * A device profile as the organisation keeps it: name and note beside the device fields,
 * all at one level so error paths match the form's field names.
 */
export const deviceProfileSchema = z.intersection(
  z.object({
    name: nameField("Enter a name."),
    note: textField(5000).nullish().transform((v) => v || null),
  }),
  deviceSchema,
);
export type DeviceProfileInput = z.infer<typeof deviceProfileSchema>;

export function splitDeviceProfile(input: DeviceProfileInput) {
  const { name, note, ...spec } = input;
  return { name, note, spec };
}
