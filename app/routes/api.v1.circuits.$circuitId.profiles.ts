import type { Route } from "./+types/api.v1.circuits.$circuitId.profiles";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed } from "~/utils/api.server";
import { problem } from "~/utils/http.server";
import { getEnv } from "~/utils/env.server";
import { getCircuit } from "~/services/circuits.server";
import { ingestByteStream, listProfiles, profileJson, saveProfile } from "~/services/profiles.server";
import { formatBytes } from "../../shared/format";
import { isPowerUnit } from "../../lib/ingest/power-units";

export const loader = ({ request, params }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(request);
    const profiles = await listProfiles(user.organisationId, idParam(params.circuitId, "Circuit"));
    return Response.json({ profiles: profiles.map((p) => ({ ...profileJson(p), quality: p.quality })) });
  });

/** Raw CSV body (text/csv), mapping in the query string; streamed, never held whole. */
export const action = ({ request, params }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiUser(request, "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    const circuit = await getCircuit(user.organisationId, circuitId);
    const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
    if (type && !["text/csv", "text/plain", "application/csv", "application/octet-stream", "text/tab-separated-values"].includes(type)) {
      return problem(415, "Unsupported media type", `Send the CSV file itself as the body (Content-Type: text/csv), not ${type}.`);
    }
    const limit = getEnv().UPLOAD_MAX_BYTES;
    const declared = Number(request.headers.get("content-length") ?? 0);
    if (declared > limit) {
      return problem(413, "File too large", `The file is ${formatBytes(declared)}; the limit is ${formatBytes(limit)}.`, { limitBytes: limit });
    }
    if (!request.body) return problem(422, "Empty file", "The request has no body (0 bytes): send the CSV file as the body.");
    const query = Object.fromEntries(new URL(request.url).searchParams);
    // Power converts to current at the circuit's line-to-line voltage unless the upload names another.
    if (isPowerUnit(query.unit ?? "") && !query.voltageKv) query.voltageKv = String(circuit.voltageKv);
    const result = await ingestByteStream(request.body, query, limit);
    const { name, file, ...mapping } = query;
    const profile = await saveProfile(user, circuitId, result, { name, sourceFile: file ?? null, mapping });
    return Response.json(
      { profile: { id: profile.id, name: profile.name, phases: result.phases, start: result.start, end: result.end, samples: profile.samples }, quality: result.quality, warnings: result.warnings },
      { status: 201, headers: { Location: `/api/v1/profiles/${profile.id}` } },
    );
  });
