import { Form, redirect } from "react-router";
import type { Route } from "./+types/devices.$deviceId";
import { hasRole, requireRole, requireUser } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { deviceProfileJson, duplicateDeviceProfile, getDeviceProfile, setDeviceProfileRetired, updateDeviceProfile } from "~/services/devices.server";
import { deviceProfileSchema, deviceFormToInput } from "../../shared/device-forms";
import { DeviceForm } from "~/components/device-form";
import { FormMessage } from "~/components/forms";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const device = await orNotFound(getDeviceProfile(user.organisationId, pageId(params.deviceId)));
  return { device: deviceProfileJson(device), canEdit: hasRole(user, ["engineer"]) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const id = pageId(params.deviceId);
  const fields = await readForm(request);
  if (fields.intent === "duplicate") {
    const copy = await orNotFound(duplicateDeviceProfile(user, id));
    throw redirect(`/devices/${copy.id}`);
  }
  if (fields.intent === "retire" || fields.intent === "restore") {
    await orNotFound(setDeviceProfileRetired(user, id, fields.intent === "retire"));
    return { ok: true as const, errors: {}, message: fields.intent === "retire" ? "Retired: it is no longer offered for new studies." : "Back in use." };
  }
  const form = parseForm(deviceProfileSchema, deviceFormToInput(fields));
  if (!form.ok) return form.response;
  const saved = await withInputErrors(() => orNotFound(updateDeviceProfile(user, id, form.value)));
  if (!saved.ok) return saved.response;
  return { ok: true as const, errors: {}, message: "Saved. Earlier studies keep the values they ran with." };
}

export default function DevicePage({ loaderData, actionData }: Route.ComponentProps) {
  const { device, canEdit } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>{`${device.name} · Duskline`}</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1>
          {device.name} {device.retired && <span className="text-base text-night-400">(retired)</span>}
        </h1>
        {canEdit && (
          <Form method="post" className="flex gap-2">
            <button className="btn-quiet" name="intent" value="duplicate" type="submit">
              Duplicate
            </button>
            <button className="btn-quiet" name="intent" value={device.retired ? "restore" : "retire"} type="submit">
              {device.retired ? "Restore" : "Retire"}
            </button>
          </Form>
        )}
      </div>
      {actionData?.ok && actionData.message && <FormMessage tone="ok">{actionData.message}</FormMessage>}
      <DeviceForm key={device.updatedAt} values={device} errors={actionData?.ok ? undefined : actionData?.errors} message={actionData?.ok ? undefined : actionData?.message} submitLabel="Save changes" readOnly={!canEdit} />
    </div>
  );
}
