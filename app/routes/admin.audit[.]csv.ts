import type { Route } from "./+types/admin.audit[.]csv";
import { requireRole } from "~/utils/auth.server";
import { searchAudit } from "~/services/audit.server";
import { parseAuditFilters } from "../../shared/audit-schemas";
import { toCsv } from "../../shared/csv";

/** The audit log view the page shows (same filters from the URL) as CSV, every matching entry up to 50,000. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  const { filters } = parseAuditFilters(new URL(request.url).searchParams);
  const entries = await searchAudit(admin.organisationId, filters, 50_000);
  const csv = toCsv(
    entries.map((e) => ({
      "time (UTC)": e.at,
      person: e.who,
      "e-mail": e.email ?? "",
      "what happened": e.sentence,
      action: e.action,
      record: e.entity,
      "record id": e.entityId ?? "",
    })),
  );
  return new Response(csv + "\r\n", {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="duskline-audit-${new Date().toISOString().slice(0, 10)}.csv"` },
  });
}
