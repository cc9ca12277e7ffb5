import type { Route } from "./+types/api.v1.circuits.$circuitId.profiles";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, idParam, methodNotAllowed } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { assertDatabaseReachable } from "~/utils/db.server";
import { readCsvUpload } from "~/utils/csv-upload.server";
import { getCircuit } from "~/services/circuits.server";
import { listProfiles, profileJson, saveProfile } from "~/services/profiles.server";
import { withIdempotency } from "~/services/idempotency.server";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const page = pageRequest(request);
    const { items, next } = pageOf(await listProfiles(user.organisationId, idParam(params.circuitId, "Circuit")), page);
    return Response.json({ profiles: items.map((p) => ({ ...profileJson(p), quality: p.quality })), next });
  });

/** Raw CSV body (text/csv), mapping in the query string; streamed, never held whole. */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    // Refuse at once, before the body is read, when the database would not take the result.
    await assertDatabaseReachable();
    const user = await requireApiScope(context, "profiles:write", "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    const circuit = await getCircuit(user.organisationId, circuitId);
    // A retried upload with the same Idempotency-Key gets the first answer, not a second profile.
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const { result, query } = await readCsvUpload(request, circuit);
      const { name, file, ...mapping } = query;
      return save(async (transaction) => {
        const profile = await saveProfile(user, circuitId, result, { name, sourceFile: file ?? null, mapping }, transaction);
        return created(
          { profile: { id: profile.id, name: profile.name, phases: result.phases, start: result.start, end: result.end, samples: profile.samples, temperature: result.temperature }, quality: result.quality, warnings: result.warnings },
          `/api/v1/profiles/${profile.id}`,
        );
      });
    });
  });
