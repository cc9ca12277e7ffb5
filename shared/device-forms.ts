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

/** A device form's fields as the profile's input: the cold curve from its pairs (parseForm decodes the numbers). */
export function deviceFormToInput(form: Record<string, string>): Record<string, unknown> {
  return { ...form, coldDerating: coldDeratingFromText(form.coldDerating) };
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
