// The portfolio view (shared/portfolio.ts): URL params ⇄ view, filtering and sorting through
// TanStack Table's core, and the CSV records (readable headers with units, values as shown).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import Papa from "papaparse";
import { CSV_COLUMNS, csvRecords, describeView, needsAttention, rowsInView, searchParamsOfView, viewFromSearchParams, type PortfolioRow } from "../../shared/portfolio";
import { toCsv } from "../../shared/csv";

function row(id: number, over: Partial<PortfolioRow> = {}): PortfolioRow {
  return {
    crossingId: id,
    crossing: `Crossing ${id}`,
    circuitId: 1,
    circuit: "Ridgeback 138",
    voltageKv: 138,
    kind: "river",
    lat: 38,
    lon: -92,
    studyId: id * 10,
    verdict: "go",
    availability: 0.9995,
    darkHoursPerYear: 2.25,
    longestDarkHours: 0.25,
    reportablePerYear: 0,
    coverage: 0.987,
    recommendedOption: "Solar markers",
    equivalentAnnualCost: 1234.56,
    currency: "USD",
    reviewState: "draft",
    reviewStale: false,
    staleReasons: [],
    decision: null,
    studiedAt: "2026-11-02T10:00:00.000Z",
    ...over,
  };
}

const ROWS = [
  row(1, { crossing: "Glimmer River", verdict: "no-go", availability: 0.91234, darkHoursPerYear: 410.04 }),
  row(2, { crossing: "Old Mill Road", kind: "road", verdict: "marginal", availability: 0.995, darkHoursPerYear: 21.96 }),
  row(3, { crossing: "Hollowmere Canyon", kind: "canyon", reviewState: "approved", reviewStale: true, staleReasons: ["a new study ran"] }),
  row(4, { crossing: "Saltbrook approach", kind: "airport-vicinity", verdict: null, studyId: null, availability: null, darkHoursPerYear: null, longestDarkHours: null, reportablePerYear: null, coverage: null, studiedAt: null }),
  row(5, { crossing: "Quarry Lake", kind: "lake", reviewState: "approved" }),
];

const view = (qs: string) => viewFromSearchParams(new URLSearchParams(qs));
const names = (rows: PortfolioRow[]) => rows.map((r) => r.crossing);

describe("portfolio view", () => {
  it("filters by verdict, including never studied", () => {
    expect(names(rowsInView(ROWS, view("verdict=no-go")))).toEqual(["Glimmer River"]);
    expect(names(rowsInView(ROWS, view("verdict=not-studied")))).toEqual(["Saltbrook approach"]);
  });

  it("keeps at most 200 characters of a text filter, so a huge one is not repeated in every link", () => {
    const kept = view(`crossing=${"Glimmer".repeat(1000)}`);
    expect(searchParamsOfView(kept).get("crossing")).toHaveLength(200);
    expect(names(rowsInView(ROWS, view(`crossing=${" Glimmer River ".padEnd(5000, " ")}`)))).toEqual(["Glimmer River"]);
  });

  it("filters by review state; a stale approval is both stale and approved", () => {
    expect(names(rowsInView(ROWS, view("review=stale")))).toEqual(["Hollowmere Canyon"]);
    expect(names(rowsInView(ROWS, view("review=approved")))).toEqual(["Hollowmere Canyon", "Quarry Lake"]);
  });

  it("filters numbers in the unit shown (availability in per cent) and drops rows without a value", () => {
    expect(names(rowsInView(ROWS, view("availability.max=99.6")))).toEqual(["Glimmer River", "Old Mill Road"]);
    expect(names(rowsInView(ROWS, view("darkHoursPerYear.min=20&darkHoursPerYear.max=100")))).toEqual(["Old Mill Road"]);
  });

  it("sorts ascending and descending, never-studied rows last either way", () => {
    expect(names(rowsInView(ROWS, view("sort=darkHoursPerYear&dir=desc")))).toEqual(["Glimmer River", "Old Mill Road", "Hollowmere Canyon", "Quarry Lake", "Saltbrook approach"]);
    expect(names(rowsInView(ROWS, view("sort=darkHoursPerYear"))).at(-1)).toBe("Saltbrook approach");
    expect(names(rowsInView(ROWS, view("sort=crossing")))).toEqual(["Glimmer River", "Hollowmere Canyon", "Old Mill Road", "Quarry Lake", "Saltbrook approach"]);
  });

  it("lists needing attention: not go, never studied, or stale", () => {
    expect(ROWS.filter(needsAttention).map((r) => r.crossingId)).toEqual([1, 2, 3, 4]);
    expect(names(rowsInView(ROWS, view("attention=1&kind=canyon")))).toEqual(["Hollowmere Canyon"]);
  });

  it("ignores unknown choices and columns instead of failing", () => {
    expect(view("verdict=maybe&sort=nope&availability.min=abc")).toEqual({ sorting: [], filters: [], attention: false });
  });

  it("round-trips a view through the URL (property)", () => {
    const choice = <T,>(xs: readonly T[]) => fc.option(fc.constantFrom(...xs), { nil: undefined });
    fc.assert(
      fc.property(
        choice(["go", "no-go", "not-studied"] as const),
        choice(["stale", "draft"] as const),
        fc.option(fc.integer({ min: 0, max: 100 }), { nil: undefined }),
        choice(["crossing", "coverage"] as const),
        fc.boolean(),
        fc.boolean(),
        (verdict, review, min, sort, desc, attention) => {
          const qs = new URLSearchParams();
          if (verdict) qs.set("verdict", verdict);
          if (review) qs.set("review", review);
          if (min != null) qs.set("coverage.min", String(min));
          if (sort) qs.set("sort", sort);
          if (sort && desc) qs.set("dir", "desc");
          if (attention) qs.set("attention", "1");
          const v = viewFromSearchParams(qs);
          expect(viewFromSearchParams(searchParamsOfView(v))).toEqual(v);
        },
      ),
    );
  });

  it("describes the view in words", () => {
    expect(describeView(view("verdict=no-go&sort=darkHoursPerYear&dir=desc"), 1)).toBe("1 crossing · verdict No-go · sorted by dark h / year, descending");
  });
});

describe("portfolio CSV", () => {
  it("has readable headers with units, percentages not fractions, words not keys", () => {
    const csv = toCsv(csvRecords(rowsInView(ROWS, view("sort=crossing"))), { columns: CSV_COLUMNS });
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true });
    expect(parsed.meta.fields).toEqual([
      "Crossing",
      "Circuit",
      "Voltage (kV)",
      "Kind",
      "Verdict",
      "Availability (%)",
      "Dark hours per year (h)",
      "Longest dark stretch (h)",
      "Reportable outages per year",
      "Data coverage (%)",
      "Recommended option",
      "Equivalent annual cost (per year)",
      "Currency",
      "Review",
      "Last study (UTC date)",
    ]);
    const glimmer = parsed.data[0];
    // 0.91234 → 91.234 % rounded down as on the page; hours to one decimal as on the page.
    expect(glimmer).toMatchObject({ Crossing: "Glimmer River", Verdict: "No-go", Kind: "River", "Availability (%)": "91.234", "Dark hours per year (h)": "410.0", "Data coverage (%)": "98.7", "Equivalent annual cost (per year)": "1235", Currency: "USD", Review: "Draft" });
    const canyon = parsed.data.find((r) => r.Crossing === "Hollowmere Canyon")!;
    expect(canyon.Review).toBe("Approved (stale)");
    expect(canyon.Kind).toBe("Canyon");
    const never = parsed.data.find((r) => r.Crossing === "Saltbrook approach")!;
    expect(never).toMatchObject({ Verdict: "Not studied", "Availability (%)": "", "Last study (UTC date)": "", Kind: "Airport vicinity" });
  });

  it("writes the header even for an empty view", () => {
    expect(toCsv(csvRecords([]), { columns: CSV_COLUMNS }).split("\r\n")[0]).toBe(CSV_COLUMNS.join(","));
  });
});
