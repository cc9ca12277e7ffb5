import type { Route } from "./+types/api.v1.profiles.$profileId.append";
import { requireApiScope } from "~/utils/auth.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { readCsvUpload } from "~/utils/csv-upload.server";
import { getCircuit } from "~/services/circuits.server";
import { appendToProfile, getProfile, profileJson } from "~/services/profiles.server";

export const loader = () => methodNotAllowed(["POST"]);

/** A newer export appended to a profile (raw CSV body, mapping in the query, as for an upload). */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["POST"]);
    const user = await requireApiScope(context, "profiles:write", "engineer");
    const id = idParam(params.profileId, "Load profile");
    const profile = await getProfile(user.organisationId, id);
    const circuit = await getCircuit(user.organisationId, profile.circuitId);
    // A retried append with the same Idempotency-Key gets the first answer and appends nothing.
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readCsvUpload(request, circuit),
      async ({ result, query }) => {
        const { name: _name, file, ...mapping } = query;
        const appended = await appendToProfile(user, id, result, { sourceFile: file ?? null, mapping });
        return Response.json({ profile: profileJson(appended.profile), added: appended.added, replaced: appended.replaced, quality: appended.quality });
      },
    );
  });
