import { Form, Link } from "react-router";
import type { Route } from "./+types/admin.audit";
import { requireRole } from "~/utils/auth.server";
import { auditFilterChoices, searchAudit } from "~/services/audit.server";
import { parseAuditFilters } from "../../shared/audit-schemas";

const LIMIT = 500;

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireRole(context, "admin");
  const search = new URL(request.url).searchParams;
  const { filters, problems } = parseAuditFilters(search);
  const [entries, choices] = await Promise.all([searchAudit(admin.organisationId, filters, LIMIT), auditFilterChoices(admin.organisationId)]);
  return { entries, choices, filters, problems, query: search.toString() };
}

export default function AdminAudit({ loaderData }: Route.ComponentProps) {
  const { entries, choices, filters, problems, query } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>Audit log · Duskline</title>
      <h1>Audit log</h1>
      <p className="text-sm text-night-400">
        Every change in your organisation, newest first (at most {LIMIT} shown). Times are UTC.
      </p>
      <Form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Filter the audit log">
        <FilterSelect label="Person" name="person" value={filters.person} anyLabel="Anyone" options={choices.people.map((p) => ({ value: String(p.id), label: p.name }))} />
        <FilterSelect label="Record" name="entity" value={filters.entity} anyLabel="Any kind" options={choices.entities.map((e) => ({ value: e, label: e.replace(/-/g, " ") }))} />
        <FilterSelect label="Action" name="action" value={filters.action} anyLabel="Any action" options={choices.actions.map((a) => ({ value: a, label: a.replace(/[.-]/g, " ") }))} />
        <label className="flex flex-col gap-1 text-sm">
          From (UTC day)
          <input type="date" name="from" defaultValue={filters.from ?? ""} />
        </label>
        <label className="flex flex-col gap-1 text-sm">
          To (UTC day, included)
          <input type="date" name="to" defaultValue={filters.to ?? ""} />
        </label>
        <button type="submit" className="btn">
          Show
        </button>
        <Link to="/admin/audit" className="text-sm">
          Clear filters
        </Link>
        <a href={`/admin/audit.csv${query ? `?${query}` : ""}`} className="text-sm" download>
          Download this view (CSV)
        </a>
      </Form>
      {problems.length > 0 && (
        <p role="alert" className="text-sm text-amber-glow">
          Some filters were ignored: {problems.join("; ")}
        </p>
      )}
      <div className="card overflow-x-auto">
        <table>
          <thead>
            <tr>
              <th scope="col">When (UTC)</th>
              <th scope="col">What happened</th>
            </tr>
          </thead>
          <tbody>
            {entries.map((e) => (
              <tr key={e.id}>
                <td className="figure whitespace-nowrap">{e.at.replace("T", " ").slice(0, 19)}</td>
                <td title={e.email ?? undefined}>{e.sentence}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {entries.length === 0 && <p className="py-4 text-night-400">Nothing recorded{query ? " for these filters" : " yet"}.</p>}
      </div>
    </div>
  );
}

function FilterSelect(props: { label: string; name: string; value: string | number | undefined; anyLabel: string; options: { value: string; label: string }[] }) {
  return (
    <label className="flex flex-col gap-1 text-sm">
      {props.label}
      <select name={props.name} defaultValue={props.value ?? ""}>
        <option value="">{props.anyLabel}</option>
        {props.options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </label>
  );
}
