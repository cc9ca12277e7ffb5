import type { Route } from "./+types/api.v1.profiles.$profileId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { deleteProfile, getProfile, profileJson } from "~/services/profiles.server";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const p = await getProfile(user.organisationId, idParam(params.profileId, "Load profile"));
    return Response.json({ ...profileJson(p), quality: p.quality });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "DELETE") return methodNotAllowed(["GET", "DELETE"]);
    const user = await requireApiScope(context, "profiles:write", "engineer");
    await deleteProfile(user, idParam(params.profileId, "Load profile"));
    return new Response(null, { status: 204 });
  });
