import type { Route } from "./+types/api.v1.devices";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { createDeviceProfile, deviceProfileJson, listDeviceProfiles } from "~/services/devices.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { deviceProfileSchema } from "../../shared/device-forms";

/** The organisation's device profiles (retired ones too, marked `retired`). */
export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "devices:read");
    const { items, next } = pageOf(await listDeviceProfiles(user.organisationId), pageRequest(request));
    return Response.json({ devices: items.map(deviceProfileJson), next });
  });

export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "devices:write", "engineer");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, deviceProfileSchema),
      async (input) => {
        const device = await createDeviceProfile(user, input);
        return created(deviceProfileJson(device), `/api/v1/devices/${device.id}`);
      },
    );
  });
