import { Form, Link } from "react-router";
import { flexRender, getCoreRowModel, getFilteredRowModel, getSortedRowModel, useReactTable } from "@tanstack/react-table";
import { PORTFOLIO_COLUMNS, needsAttention, portfolioColumnDefs, searchParamsOfView, type PortfolioRow, type PortfolioView } from "../../shared/portfolio";
import { VerdictBadge } from "./verdict-badge";

const COLUMN = new Map(PORTFOLIO_COLUMNS.map((c) => [c.id, c]));

/** Link target for sorting by `id`: ascending first, then descending, then back to no sort. */
function sortHref(view: PortfolioView, id: string): string {
  const current = view.sorting[0];
  const sorting = current?.id !== id ? [{ id, desc: false }] : current.desc ? [] : [{ id, desc: true }];
  const qs = searchParamsOfView({ ...view, sorting }).toString();
  return qs ? `?${qs}` : "?";
}

/**
 * Every crossing, sorted and filtered by TanStack Table with the view from the URL (so a view can be
 * shared and the CSV export matches it). Column headers are links that change the sort.
 */
export function PortfolioTable({ rows, view }: { rows: PortfolioRow[]; view: PortfolioView }) {
  const table = useReactTable({
    data: view.attention ? rows.filter(needsAttention) : rows,
    columns: portfolioColumnDefs,
    state: { sorting: view.sorting, columnFilters: view.filters },
    getCoreRowModel: getCoreRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getSortedRowModel: getSortedRowModel(),
    manualPagination: true,
  });
  const shown = table.getRowModel().rows;
  return (
    <div className="overflow-x-auto">
      <table data-testid="portfolio-table">
        <thead>
          {table.getHeaderGroups().map((g) => (
            <tr key={g.id}>
              {g.headers.map((h) => {
                const sorted = h.column.getIsSorted();
                return (
                  <th key={h.id} scope="col" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"} className="whitespace-nowrap">
                    <Link to={sortHref(view, h.column.id)} preventScrollReset className="text-night-100 no-underline hover:underline">
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      <span aria-hidden="true" className="ml-1 text-night-400">
                        {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                      </span>
                    </Link>
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {shown.map((row) => {
            const r = row.original;
            return (
              <tr key={r.crossingId} data-crossing={r.crossingId}>
                {row.getVisibleCells().map((cell) => {
                  const id = cell.column.id;
                  const col = COLUMN.get(id)!;
                  if (id === "crossing") return <td key={id}><Link to={`/crossings/${r.crossingId}`}>{r.crossing}</Link></td>;
                  if (id === "circuit") return <td key={id}><Link to={`/circuits/${r.circuitId}`}>{r.circuit}</Link> {r.voltageKv != null && <span className="figure text-night-400">{r.voltageKv} kV</span>}</td>;
                  if (id === "verdict") return <td key={id}><VerdictBadge status={r.verdict} /></td>;
                  if (id === "review")
                    return (
                      <td key={id} className={r.reviewStale ? "text-amber-glow" : undefined} title={r.staleReasons.join("; ") || undefined}>
                        {col.text(r)}
                      </td>
                    );
                  if (id === "studiedAt") return <td key={id} className="figure">{r.studyId ? <Link to={`/studies/${r.studyId}`}>{col.text(r)}</Link> : "never"}</td>;
                  const text = col.text(r);
                  const unit = id === "availability" || id === "coverage" ? " %" : "";
                  return (
                    <td key={id} className={col.numeric ? "figure text-right" : undefined}>
                      {text === "" ? "—" : `${text}${unit}`}
                    </td>
                  );
                })}
              </tr>
            );
          })}
        </tbody>
      </table>
      {shown.length === 0 && <p className="mt-2 text-night-400">No crossing matches these filters.</p>}
    </div>
  );
}

/** The filters as a GET form: its fields are the URL search params of the view. */
export function PortfolioFilters({ view, circuits }: { view: PortfolioView; circuits: string[] }) {
  const value = (id: string) => {
    const f = view.filters.find((x) => x.id === id)?.value;
    return typeof f === "string" ? f : "";
  };
  const range = (id: string, end: 0 | 1) => {
    const f = view.filters.find((x) => x.id === id)?.value;
    return Array.isArray(f) && f[end] != null ? String(f[end]) : "";
  };
  const choice = (id: string) => COLUMN.get(id)!.choices!;
  const sort = view.sorting[0];
  return (
    <Form method="get" className="card no-print flex flex-col gap-3" aria-label="Filter the portfolio">
      <div className="grid gap-3 sm:grid-cols-3 lg:grid-cols-6">
        <label className="flex flex-col gap-1">
          Crossing contains
          <input name="crossing" defaultValue={value("crossing")} />
        </label>
        <label className="flex flex-col gap-1">
          Circuit
          <select name="circuit" defaultValue={value("circuit")}>
            <option value="">Any</option>
            {circuits.map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
        </label>
        {(["kind", "verdict", "review"] as const).map((id) => (
          <label key={id} className="flex flex-col gap-1">
            {COLUMN.get(id)!.header}
            <select name={id} defaultValue={value(id)}>
              <option value="">Any</option>
              {Object.entries(choice(id)).map(([k, words]) => (
                <option key={k} value={k}>
                  {words}
                </option>
              ))}
            </select>
          </label>
        ))}
        <label className="flex flex-col gap-1">
          Recommended option contains
          <input name="recommendedOption" defaultValue={value("recommendedOption")} />
        </label>
      </div>
      <details open={PORTFOLIO_COLUMNS.some((c) => c.kind === "number" && view.filters.some((f) => f.id === c.id))}>
        <summary className="cursor-pointer text-sm text-night-200">Ranges (in the units shown)</summary>
        <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {PORTFOLIO_COLUMNS.filter((c) => c.kind === "number").map((c) => (
            <fieldset key={c.id} className="flex items-end gap-2">
              <legend className="text-sm text-night-200">{c.csvHeader}</legend>
              <input name={`${c.id}.min`} inputMode="decimal" aria-label={`${c.csvHeader} at least`} placeholder="min" defaultValue={range(c.id, 0)} className="w-24" />
              <span aria-hidden="true">–</span>
              <input name={`${c.id}.max`} inputMode="decimal" aria-label={`${c.csvHeader} at most`} placeholder="max" defaultValue={range(c.id, 1)} className="w-24" />
            </fieldset>
          ))}
        </div>
      </details>
      {view.attention && <input type="hidden" name="attention" value="1" />}
      {sort && <input type="hidden" name="sort" value={sort.id} />}
      {sort?.desc && <input type="hidden" name="dir" value="desc" />}
      <div className="flex gap-2">
        <button type="submit" className="btn">
          Apply filters
        </button>
        <Link to="/portfolio" className="btn-quiet">
          Clear
        </Link>
      </div>
    </Form>
  );
}
