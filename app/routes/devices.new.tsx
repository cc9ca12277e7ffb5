import { redirect } from "react-router";
import type { Route } from "./+types/devices.new";
import { requireRole } from "~/utils/auth.server";
import { parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { createDeviceProfile } from "~/services/devices.server";
import { deviceProfileSchema, deviceFormToInput } from "../../shared/device-forms";
import { DeviceForm } from "~/components/device-form";

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireRole(context, "engineer");
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const form = parseForm(deviceProfileSchema, deviceFormToInput(await readForm(request)));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => createDeviceProfile(user, form.value));
  if (!saved.ok) return saved.response;
  throw redirect(`/devices/${saved.value.id}`);
}

export default function NewDevice({ actionData }: Route.ComponentProps) {
  return (
    <div className="flex flex-col gap-4">
      <title>New device profile · Duskline</title>
      <h1>New device profile</h1>
      <DeviceForm
        values={{ spec: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 } }}
        errors={actionData?.errors}
        message={actionData?.message}
        submitLabel="Create device profile"
      />
    </div>
  );
}
