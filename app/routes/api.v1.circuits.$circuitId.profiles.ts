import type { Route } from "./+types/api.v1.circuits.$circuitId.profiles";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { problem } from "~/utils/http.server";
import { getEnv } from "~/utils/env.server";
import { assertDatabaseReachable } from "~/utils/db.server";
import { getCircuit } from "~/services/circuits.server";
import { ingestByteStream, listProfiles, profileJson, saveProfile } from "~/services/profiles.server";
import { withIdempotency } from "~/services/idempotency.server";
import { formatBytes } from "../../shared/format";
import { profileUploadSchema } from "../../shared/ingest-options";
import { discardBody, limitedChunks } from "~/utils/body.server";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    const profiles = await listProfiles(user.organisationId, idParam(params.circuitId, "Circuit"));
    return Response.json({ profiles: profiles.map((p) => ({ ...profileJson(p), quality: p.quality })) });
  });

/** Raw CSV body (text/csv), mapping in the query string; streamed, never held whole. */
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    // Refuse at once, before the body is read, when the database would not take the result.
    await assertDatabaseReachable();
    const user = await requireApiUser(context, "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    await getCircuit(user.organisationId, circuitId);
    const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
    if (type && !["text/csv", "text/plain", "application/csv", "application/octet-stream", "text/tab-separated-values"].includes(type)) {
      discardBody(request);
      return problem(415, "Unsupported media type", `Send the CSV file itself as the body (Content-Type: text/csv), not ${type}.`);
    }
    const limit = getEnv().UPLOAD_MAX_BYTES;
    const declared = Number(request.headers.get("content-length") ?? 0);
    if (declared > limit) {
      discardBody(request);
      return problem(413, "File too large", `The file is ${formatBytes(declared)}; the limit is ${formatBytes(limit)}.`, { limitBytes: limit, errors: [{ path: "body", message: `At most ${formatBytes(limit)}.` }] });
    }
    if (!request.body) return problem(400, "Empty file", "The request has no body: send the CSV file as the body.", { errors: [{ path: "body", message: "Send the CSV file as the body." }] });
    // A retried upload with the same Idempotency-Key gets the first answer, not a second profile.
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const query = Object.fromEntries(new URL(request.url).searchParams);
      profileUploadSchema.parse(query); // the name and file name, before a byte is read
      // Bytes counted as they arrive: past the limit the upload stops at once (413), chunked or not.
      const result = await ingestByteStream(limitedChunks(request.body!, limit), query, limit);
      const { name, file, ...mapping } = query;
      return save(async (transaction) => {
        const profile = await saveProfile(user, circuitId, result, { name, sourceFile: file ?? null, mapping }, transaction);
        return Response.json(
          { profile: { id: profile.id, name: profile.name, phases: result.phases, start: result.start, end: result.end, samples: profile.samples }, quality: result.quality, warnings: result.warnings },
          { status: 201, headers: { Location: `/api/v1/profiles/${profile.id}` } },
        );
      });
    });
  });
