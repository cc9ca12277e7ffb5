import type { Route } from "./+types/portfolio[.]csv";
import { requireUser } from "~/utils/auth.server";
import { portfolio } from "~/services/studies.server";
import { toCsv } from "../../shared/csv";

/** The portfolio as CSV (`toCsv`: quoted as needed, formula-like cells neutralised). */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const { rows } = await portfolio(user.organisationId);
  const csv = toCsv(
    rows.map((r) => ({
      crossing: r.crossing,
      circuit: r.circuit,
      voltage_kv: r.voltageKv,
      kind: r.kind,
      verdict: r.verdict ?? "not-studied",
      availability: r.availability ?? "",
      dark_hours: r.darkHours ?? "",
      longest_dark_hours: r.longestDarkHours ?? "",
      study_id: r.studyId ?? "",
      studied_at_utc: r.studiedAt ?? "",
    })),
  );
  return new Response(csv + "\r\n", {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="duskline-portfolio-${new Date().toISOString().slice(0, 10)}.csv"` },
  });
}
