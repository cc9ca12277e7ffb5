import type { Route } from "./+types/optimise[.]csv";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { fleetCsvRecords, optimiseJobResult } from "~/services/optimise.server";
import { problem } from "~/utils/http.server";
import { toCsv } from "../../shared/csv";

/** The recommended device per crossing of a finished fleet run (?job=), with the fleet total, as CSV. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  const job = new URL(request.url).searchParams.get("job");
  if (!job) throw problem(400, "Which run?", "Name the optimiser run: /optimise.csv?job=<id>.", { errors: [{ path: "job", message: "Name the optimiser run." }] });
  const result = await orNotFound(optimiseJobResult(user.organisationId, pageId(job), "fleet"));
  return new Response(toCsv(fleetCsvRecords(result)) + "\r\n", {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="duskline-optimiser-run-${job}.csv"` },
  });
}
