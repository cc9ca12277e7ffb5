import type { Route } from "./+types/api.v1.profiles.$profileId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { readCsvUpload } from "~/utils/csv-upload.server";
import { getCircuit } from "~/services/circuits.server";
import { deleteProfile, getProfile, profileJson, replaceProfileData } from "~/services/profiles.server";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const p = await getProfile(user.organisationId, idParam(params.profileId, "Load profile"));
    return Response.json({ ...profileJson(p), quality: p.quality });
  });

/** DELETE removes the profile; PUT replaces its data with a new export (raw CSV body, mapping in the query, as for an upload). */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "DELETE" && request.method !== "PUT") return methodNotAllowed(["GET", "PUT", "DELETE"]);
    const user = await requireApiScope(context, "profiles:write", "engineer");
    const id = idParam(params.profileId, "Load profile");
    if (request.method === "DELETE") {
      await deleteProfile(user, id);
      return new Response(null, { status: 204 });
    }
    const profile = await getProfile(user.organisationId, id);
    const circuit = await getCircuit(user.organisationId, profile.circuitId);
    const { result, query } = await readCsvUpload(request, circuit);
    const { name: _name, file, ...mapping } = query;
    const replaced = await replaceProfileData(user, id, result, { sourceFile: file ?? null, mapping });
    return Response.json({ profile: profileJson(replaced.profile), quality: replaced.quality, keptForStudies: replaced.keptForStudies });
  });
