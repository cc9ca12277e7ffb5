import { z } from "zod";
import { deviceSchema } from "./study-schemas";
import { nameField, textField } from "./fields";
export { numbersFromForm } from "./fields";

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
