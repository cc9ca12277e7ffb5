import { z } from "zod";
import { deviceSchema } from "./study-schemas";

export const DEVICE_NUMBER_FIELDS = [
  "minCurrentA",
  "maxCurrentA",
  "loadW",
  "standbyW",
  "storageWh",
  "chargeEfficiency",
  "selfDischargePctPerDay",
  "initialCharge",
  "lifeYears",
] as const;

/** Form text → numbers (empty fields left out so the schema's defaults apply). */
export function numbersFromForm(form: Record<string, unknown>, keys: readonly string[]): Record<string, unknown> {
  const out: Record<string, unknown> = { ...form };
  for (const k of keys) {
    const v = form[k];
    if (v === "" || v == null) delete out[k];
    else if (typeof v === "string") out[k] = Number(v.replace(",", "."));
  }
  return out;
}

/**
 * A device profile as the organisation keeps it: name and note beside the device fields,
 * all at one level so error paths match the form's field names.
 */
export const deviceProfileSchema = z.intersection(
  z.object({
    name: z.string({ error: "Enter a name." }).trim().min(1, "Enter a name.").max(200),
    note: z.string().trim().max(5000).nullish().transform((v) => v || null),
  }),
  deviceSchema,
);
export type DeviceProfileInput = z.infer<typeof deviceProfileSchema>;

export function splitDeviceProfile(input: DeviceProfileInput) {
  const { name, note, ...spec } = input;
  return { name, note, spec };
}
