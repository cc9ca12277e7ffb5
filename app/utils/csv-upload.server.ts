// A raw CSV request body (upload and append): media type and size checked, the mapping read
// from the query string, power converted at the circuit's voltage unless the query names one,
// and the body streamed through the ingester (recorded temperatures by the circuit's months).
import { getEnv } from "./env.server";
import { problem } from "./http.server";
import { ingestByteStream } from "../services/profiles.server";
import { circuitTimeZone } from "../services/circuits.server";
import type { Circuit } from "../../db/models";
import { isPowerUnit } from "../../lib/ingest/power-units";
import type { IngestResult } from "../../lib/ingest/ingest";
import { formatBytes } from "../../shared/format";
import { profileUploadSchema } from "../../shared/ingest-options";
import { discardBody, limitedChunks } from "./body.server";

const CSV_TYPES = ["text/csv", "text/plain", "application/csv", "application/octet-stream", "text/tab-separated-values"];

/** Throws a problem Response for a body that cannot be a CSV upload. */
export async function readCsvUpload(request: Request, circuit: Pick<Circuit, "voltageKv" | "organisationId" | "timeZone">): Promise<{ result: IngestResult; query: Record<string, string> }> {
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  if (type && !CSV_TYPES.includes(type)) {
    discardBody(request);
    throw problem(415, "Unsupported media type", `Send the CSV file itself as the body (Content-Type: text/csv), not ${type}.`);
  }
  const limit = getEnv().UPLOAD_MAX_BYTES;
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > limit) {
    discardBody(request);
    throw problem(413, "File too large", `The file is ${formatBytes(declared)}; the limit is ${formatBytes(limit)}.`, { limitBytes: limit, errors: [{ path: "body", message: `At most ${formatBytes(limit)}.` }] });
  }
  if (!request.body) throw problem(422, "Empty file", "The request has no body (0 bytes): send the CSV file as the body.", { errors: [{ path: "body", message: "Send the CSV file as the body." }] });
  const query = Object.fromEntries(new URL(request.url).searchParams);
  profileUploadSchema.parse(query); // the name and file name, before a byte is read
  // Power converts to current at the circuit's line-to-line voltage unless the upload names another.
  if (isPowerUnit(query.unit ?? "") && !query.voltageKv) query.voltageKv = String(circuit.voltageKv);
  // Bytes counted as they arrive: past the limit the upload stops at once (413), chunked or not.
  return { result: await ingestByteStream(limitedChunks(request.body, limit), query, limit, declared || undefined, await circuitTimeZone(circuit)), query };
}
