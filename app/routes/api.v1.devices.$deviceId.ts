import type { Route } from "./+types/api.v1.devices.$deviceId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { deviceProfileJson, getDeviceProfile, setDeviceProfileRetired, updateDeviceProfile } from "~/services/devices.server";
import { deviceProfileSchema } from "../../shared/device-forms";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "devices:read");
    return Response.json(deviceProfileJson(await getDeviceProfile(user.organisationId, idParam(params.deviceId, "Device profile"))));
  });

/** PUT replaces the profile (earlier studies keep the values they ran with); DELETE retires it, as on the page. */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "PUT" && request.method !== "DELETE") return methodNotAllowed(["GET", "PUT", "DELETE"]);
    const user = await requireApiScope(context, "devices:write", "engineer");
    const id = idParam(params.deviceId, "Device profile");
    if (request.method === "PUT") return Response.json(deviceProfileJson(await updateDeviceProfile(user, id, await readJson(request, deviceProfileSchema))));
    return Response.json(deviceProfileJson(await setDeviceProfileRetired(user, id, true)));
  });
