// The portfolio table: its columns, the view (sort and filters) read from and written to URL
// search params, and the rows in a view. Sorting and filtering run through TanStack Table's
// headless core, the same code on the page, in the CSV export and in the tests, so the CSV is
// exactly the filtered view.
import { createTable, getCoreRowModel, getFilteredRowModel, getSortedRowModel, type ColumnDef, type ColumnFiltersState, type FilterFn, type SortingState } from "@tanstack/table-core";
import { CROSSING_KIND_LABELS, CROSSING_KINDS, type CrossingKind } from "./circuit-schemas";
import { formatAvailability, formatMoney, formatNumber } from "./format";
import { REVIEW_STATE_LABELS, REVIEW_STATES, type ReviewDecision, type ReviewState } from "./review-schemas";
import { VERDICT_STATUSES, type VerdictStatus } from "./study-schemas";

export interface PortfolioRow {
  crossingId: number;
  crossing: string;
  circuitId: number;
  circuit: string;
  voltageKv: number | null;
  kind: CrossingKind;
  lat: number;
  lon: number;
  studyId: number | null;
  verdict: VerdictStatus | null;
  /** Share 0–1. */
  availability: number | null;
  /** Per year: scaled to a year when the period is not one whole year (the study's own annualised figure). */
  darkHoursPerYear: number | null;
  longestDarkHours: number | null;
  reportablePerYear: number | null;
  /** Share 0–1 of the analysed period with known current. */
  coverage: number | null;
  recommendedOption: string | null;
  equivalentAnnualCost: number | null;
  currency: string | null;
  reviewState: ReviewState;
  reviewStale: boolean;
  staleReasons: string[];
  decision: ReviewDecision | null;
  studiedAt: string | null;
}

export const VERDICT_WORDS: Record<VerdictStatus | "not-studied", string> = {
  go: "Go",
  marginal: "Marginal",
  "no-go": "No-go",
  "insufficient-data": "Insufficient data",
  "not-studied": "Not studied",
};
export const VERDICT_FILTERS = [...VERDICT_STATUSES, "not-studied"] as const;
export type VerdictFilter = (typeof VERDICT_FILTERS)[number];
export const REVIEW_FILTERS = [...REVIEW_STATES, "stale"] as const;
export type ReviewFilter = (typeof REVIEW_FILTERS)[number];

export const reviewWords = (r: Pick<PortfolioRow, "reviewState" | "reviewStale">) => `${REVIEW_STATE_LABELS[r.reviewState]}${r.reviewStale ? " (stale)" : ""}`;
export const verdictKey = (r: Pick<PortfolioRow, "verdict">): VerdictFilter => r.verdict ?? "not-studied";

/** Numbers as the page shows them: percentages of shares, hours to one decimal. */
const percentText = (share: number | null, digits: number) => (share == null ? "" : formatAvailability(share, digits).replace(" %", ""));
const fixed = (v: number | null, digits: number) => (v == null ? "" : v.toFixed(digits));

type Kind = "text" | "choice" | "number";
export interface PortfolioColumn {
  id: string;
  header: string;
  /** Header of the CSV column, with its unit. */
  csvHeader: string;
  kind: Kind;
  /** Choices of a choice column: URL value → words. */
  choices?: Record<string, string>;
  /** The value sorted and filtered on (numbers in the unit shown: per cent for shares). */
  value: (r: PortfolioRow) => string | number | null;
  /** What the page and the CSV show. */
  text: (r: PortfolioRow) => string;
  numeric?: boolean;
}

const pct = (share: number | null) => (share == null ? null : share * 100);

export const PORTFOLIO_COLUMNS: PortfolioColumn[] = [
  { id: "crossing", header: "Crossing", csvHeader: "Crossing", kind: "text", value: (r) => r.crossing, text: (r) => r.crossing },
  { id: "circuit", header: "Circuit", csvHeader: "Circuit", kind: "text", value: (r) => r.circuit, text: (r) => (r.voltageKv == null ? r.circuit : `${r.circuit} (${r.voltageKv} kV)`) },
  { id: "kind", header: "Kind", csvHeader: "Kind", kind: "choice", choices: Object.fromEntries(CROSSING_KINDS.map((k) => [k, CROSSING_KIND_LABELS[k]])), value: (r) => r.kind, text: (r) => CROSSING_KIND_LABELS[r.kind] },
  { id: "verdict", header: "Verdict", csvHeader: "Verdict", kind: "choice", choices: VERDICT_WORDS, value: (r) => verdictKey(r), text: (r) => VERDICT_WORDS[verdictKey(r)] },
  { id: "availability", header: "Availability", csvHeader: "Availability (%)", kind: "number", numeric: true, value: (r) => pct(r.availability), text: (r) => percentText(r.availability, 3) },
  { id: "darkHoursPerYear", header: "Dark h / year", csvHeader: "Dark hours per year (h)", kind: "number", numeric: true, value: (r) => r.darkHoursPerYear, text: (r) => fixed(r.darkHoursPerYear, 1) },
  { id: "longestDarkHours", header: "Longest dark (h)", csvHeader: "Longest dark stretch (h)", kind: "number", numeric: true, value: (r) => r.longestDarkHours, text: (r) => fixed(r.longestDarkHours, 2) },
  { id: "reportablePerYear", header: "Reportable / year", csvHeader: "Reportable outages per year", kind: "number", numeric: true, value: (r) => r.reportablePerYear, text: (r) => fixed(r.reportablePerYear, 1) },
  { id: "coverage", header: "Coverage", csvHeader: "Data coverage (%)", kind: "number", numeric: true, value: (r) => pct(r.coverage), text: (r) => (r.coverage == null ? "" : (r.coverage * 100).toFixed(1)) },
  { id: "recommendedOption", header: "Recommended option", csvHeader: "Recommended option", kind: "text", value: (r) => r.recommendedOption, text: (r) => r.recommendedOption ?? "" },
  {
    id: "equivalentAnnualCost",
    header: "Annual cost",
    csvHeader: "Equivalent annual cost (per year)",
    kind: "number",
    numeric: true,
    value: (r) => r.equivalentAnnualCost,
    text: (r) => (r.equivalentAnnualCost == null ? "" : formatMoney(r.equivalentAnnualCost, r.currency ?? "USD")),
  },
  { id: "review", header: "Review", csvHeader: "Review", kind: "choice", choices: { ...REVIEW_STATE_LABELS, stale: "Approved (stale)" }, value: (r) => (r.reviewStale ? "stale" : r.reviewState), text: reviewWords },
  { id: "studiedAt", header: "Last study", csvHeader: "Last study (UTC date)", kind: "text", value: (r) => r.studiedAt?.slice(0, 10) ?? null, text: (r) => r.studiedAt?.slice(0, 10) ?? "" },
];

const COLUMN_BY_ID = new Map(PORTFOLIO_COLUMNS.map((c) => [c.id, c]));

/** A filter value: text to contain, a choice, or a [min, max] range (either end open). */
export type FilterValue = string | [number | null, number | null];

// Filters: a stale approval also matches "approved"; ranges compare the value as shown.
const textFilter: FilterFn<PortfolioRow> = (row, id, want: string) => String(row.getValue(id) ?? "").toLowerCase().includes(want.toLowerCase());
const choiceFilter: FilterFn<PortfolioRow> = (row, id, want: string) => {
  const v = row.getValue(id);
  return v === want || (id === "review" && want === "approved" && v === "stale");
};
const rangeFilter: FilterFn<PortfolioRow> = (row, id, [min, max]: [number | null, number | null]) => {
  const v = row.getValue<number | null>(id);
  if (v == null) return false;
  return (min == null || v >= min) && (max == null || v <= max);
};

export const portfolioColumnDefs: ColumnDef<PortfolioRow>[] = PORTFOLIO_COLUMNS.map((c) => ({
  id: c.id,
  header: c.header,
  // undefined, not null, so `sortUndefined` puts rows without a value last.
  accessorFn: (r) => c.value(r) ?? undefined,
  filterFn: c.kind === "text" ? textFilter : c.kind === "choice" ? choiceFilter : rangeFilter,
  // Rows with no value (never studied) sort last whichever way.
  sortUndefined: "last",
  sortingFn: c.numeric ? "basic" : "alphanumeric",
}));

export interface PortfolioView {
  sorting: SortingState;
  filters: ColumnFiltersState;
  /** Only crossings needing attention (not go, never studied, or a stale approval). */
  attention: boolean;
}

/**
 * URL form: `sort=darkHoursPerYear&dir=desc`, `verdict=no-go`, `crossing=river` (contains),
 * `availability.max=99.9` / `.min` (numbers in the unit shown), `attention=1`.
 */
/** The longest text filter kept from a URL: names are at most 200 characters. */
const TEXT_FILTER_MAX_CHARS = 200;

export function viewFromSearchParams(params: URLSearchParams): PortfolioView {
  const sortId = params.get("sort");
  const sorting: SortingState = sortId && COLUMN_BY_ID.has(sortId) ? [{ id: sortId, desc: params.get("dir") === "desc" }] : [];
  const filters: ColumnFiltersState = [];
  for (const c of PORTFOLIO_COLUMNS) {
    if (c.kind === "number") {
      const [min, max] = ["min", "max"].map((end) => {
        const raw = params.get(`${c.id}.${end}`);
        const n = raw == null || raw.trim() === "" ? NaN : Number(raw);
        return Number.isFinite(n) ? n : null;
      });
      if (min != null || max != null) filters.push({ id: c.id, value: [min, max] });
    } else {
      // A search longer than any name can only match nothing, and would be repeated in every link of the page.
      const v = params.get(c.id)?.trim().slice(0, TEXT_FILTER_MAX_CHARS);
      if (!v) continue;
      if (c.kind === "choice" && !(v in (c.choices ?? {}))) continue;
      filters.push({ id: c.id, value: v });
    }
  }
  return { sorting, filters, attention: params.get("attention") === "1" };
}

export function searchParamsOfView(view: PortfolioView): URLSearchParams {
  const out = new URLSearchParams();
  for (const f of view.filters) {
    if (Array.isArray(f.value)) {
      const [min, max] = f.value as [number | null, number | null];
      if (min != null) out.set(`${f.id}.min`, String(min));
      if (max != null) out.set(`${f.id}.max`, String(max));
    } else out.set(f.id, String(f.value));
  }
  if (view.attention) out.set("attention", "1");
  const s = view.sorting[0];
  if (s) {
    out.set("sort", s.id);
    if (s.desc) out.set("dir", "desc");
  }
  return out;
}

/** Not go, never studied, or an approval gone stale. */
export const needsAttention = (r: PortfolioRow) => r.verdict !== "go" || r.reviewStale;

/** The rows of a view, filtered and sorted by TanStack Table's core row models. */
export function rowsInView(rows: PortfolioRow[], view: PortfolioView): PortfolioRow[] {
  const data = view.attention ? rows.filter(needsAttention) : rows;
  const options = {
    data,
    columns: portfolioColumnDefs,
    state: {},
    onStateChange: () => {},
    renderFallbackValue: null,
    getCoreRowModel: getCoreRowModel<PortfolioRow>(),
    getFilteredRowModel: getFilteredRowModel<PortfolioRow>(),
    getSortedRowModel: getSortedRowModel<PortfolioRow>(),
  };
  // As useReactTable does: start from the table's initial state, then apply the view.
  const table = createTable<PortfolioRow>(options);
  table.setOptions((prev) => ({ ...prev, state: { ...table.initialState, sorting: view.sorting, columnFilters: view.filters } }));
  return table.getRowModel().rows.map((r) => r.original);
}

/** CSV header order (units in the headers). */
export const CSV_COLUMNS = PORTFOLIO_COLUMNS.flatMap((c) => (c.id === "circuit" ? [c.csvHeader, "Voltage (kV)"] : c.id === "equivalentAnnualCost" ? [c.csvHeader, "Currency"] : [c.csvHeader]));

/** The CSV records of rows: readable headers with units, values as the page shows them. */
export function csvRecords(rows: PortfolioRow[]): Record<string, string>[] {
  return rows.map((r) => {
    const rec: Record<string, string> = {};
    for (const c of PORTFOLIO_COLUMNS) {
      rec[c.csvHeader] = c.id === "equivalentAnnualCost" ? (r.equivalentAnnualCost == null ? "" : String(Math.round(r.equivalentAnnualCost))) : c.id === "circuit" ? r.circuit : c.text(r);
      if (c.id === "circuit") rec["Voltage (kV)"] = r.voltageKv == null ? "" : String(r.voltageKv);
      if (c.id === "equivalentAnnualCost") rec["Currency"] = r.equivalentAnnualCost == null ? "" : (r.currency ?? "");
    }
    return rec;
  });
}

/** "3 crossings · verdict no-go · sorted by dark hours per year, highest first" for the page and the CSV name. */
export function describeView(view: PortfolioView, count: number): string {
  const parts = [`${formatNumber(count)} crossing${count === 1 ? "" : "s"}`];
  if (view.attention) parts.push("needing attention");
  for (const f of view.filters) {
    const c = COLUMN_BY_ID.get(f.id)!;
    if (Array.isArray(f.value)) {
      const [min, max] = f.value as [number | null, number | null];
      parts.push(`${c.header.toLowerCase()} ${min != null ? `≥ ${min}` : ""}${min != null && max != null ? " and " : ""}${max != null ? `≤ ${max}` : ""}`);
    } else parts.push(c.kind === "choice" ? `${c.header.toLowerCase()} ${c.choices?.[String(f.value)] ?? f.value}` : `${c.header.toLowerCase()} contains "${f.value}"`);
  }
  const s = view.sorting[0];
  if (s) parts.push(`sorted by ${COLUMN_BY_ID.get(s.id)!.header.toLowerCase()}${s.desc ? ", descending" : ""}`);
  return parts.join(" · ");
}
