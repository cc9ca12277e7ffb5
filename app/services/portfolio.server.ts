// The portfolio: every crossing of an organisation, studied or not, with its latest study's
// figures, its recommended option and its review state (shared/portfolio.ts shapes the view).
import { col, fn, literal } from "sequelize";
import { LRUCache } from "lru-cache";
import { Circuit, Crossing, LightingOption, Study } from "../../db/models";
import { describeView, needsAttention, rowsInView, type PortfolioRow, type PortfolioView } from "../../shared/portfolio";
import type { VerdictStatus } from "../../shared/study-schemas";
import { db } from "../utils/db.server";
import { markingPlan } from "./crossing-marking.server";
import { crossingOptionsView } from "./lighting-options.server";
import { reviewSummaries } from "./reviews.server";
import { organisationRevision, VERSIONED_CACHE_TTL_MS } from "./audit.server";

// Figures read out of the stored results without loading them whole (they hold the monthly tables).
const RESULT_FIELDS: [string, string][] = [
  ["$.period.coverage", "coverage"],
  ["$.lighting.reportableOutages", "reportable"],
  ["$.annualised.darkHours", "annualDarkHours"],
  ["$.annualised.reportableOutages", "annualReportable"],
];

interface LatestStudy {
  id: number;
  crossingId: number;
  verdict: VerdictStatus;
  availability: number | null;
  darkHours: number;
  longestDarkHours: number;
  createdAt: Date;
  coverage: string | number | null;
  reportable: string | number | null;
  annualDarkHours: string | number | null;
  annualReportable: string | number | null;
}

const num = (v: string | number | null | undefined) => (v == null || v === "" || v === "null" ? null : Number(v));

async function latestStudies(organisationId: number): Promise<Map<number, LatestStudy>> {
  const latestIds = (await Study.findAll({ attributes: [[fn("MAX", col("id")), "id"]], where: { organisationId }, group: [col("crossing_id")], raw: true })).map((r) => r.id);
  if (!latestIds.length) return new Map();
  const rows = (await Study.findAll({
    where: { organisationId, id: latestIds },
    attributes: ["id", "crossingId", "verdict", "availability", "darkHours", "longestDarkHours", "createdAt", ...RESULT_FIELDS.map(([path, name]) => [literal(`JSON_VALUE(results, '${path}')`), name] as [ReturnType<typeof literal>, string])],
    raw: true,
  })) as unknown as LatestStudy[];
  return new Map(rows.map((s) => [s.crossingId, s]));
}

/** Recommended option and its equivalent annual cost, for crossings that have options. */
async function recommendations(organisationId: number, crossings: Crossing[], circuits: Map<number, Circuit>) {
  const withOptions = new Set((await LightingOption.findAll({ where: { organisationId }, attributes: ["crossingId"], raw: true })).map((o) => o.crossingId));
  const out = new Map<number, { name: string; eac: number; currency: string }>();
  for (const x of crossings) {
    const circuit = circuits.get(x.circuitId);
    if (!withOptions.has(x.id) || !circuit) continue;
    const marking = await markingPlan(x, circuit);
    const view = await crossingOptionsView(organisationId, x, marking);
    const rec = view.comparison.recommendation;
    const row = rec ? view.comparison.rows.find((r) => r.id === rec.id) : undefined;
    if (rec && row) out.set(x.id, { name: rec.name, eac: row.equivalentAnnualCost, currency: view.currency });
  }
  return out;
}

/**
 * Every row costs a marker plan, an options comparison and an approval's staleness check, tens
 * of milliseconds for the demo organisation: too much to redo on every read of the portfolio
 * (docs/performance.md). Every change that can move a row is audited in the same transaction
 * (studies, options, crossings and their details, reviews, rule book, policy, profiles,
 * devices), so the organisation's data revision says whether the rows computed last are still
 * right (organisationRevision). Each process keeps its own few entries.
 */
const rowsCache = new LRUCache<string, Promise<PortfolioRow[]>>({ max: 50, ttl: VERSIONED_CACHE_TTL_MS });

/** Portfolio rows of every crossing, or of one circuit's (`circuitId`, for the circuit page's map). */
export async function portfolioRows(organisationId: number, only: { circuitId?: number } = {}): Promise<PortfolioRow[]> {
  const key = `${organisationId}:${await organisationRevision(organisationId)}`;
  let rows = rowsCache.get(key);
  if (!rows) {
    rows = computePortfolioRows(organisationId);
    rows.catch(() => rowsCache.delete(key));
    rowsCache.set(key, rows);
  }
  const all = await rows;
  return only.circuitId ? all.filter((r) => r.circuitId === only.circuitId) : all;
}

async function computePortfolioRows(organisationId: number): Promise<PortfolioRow[]> {
  db();
  const crossings = await Crossing.findAll({ where: { organisationId }, order: [["name", "ASC"]] });
  const circuits = new Map((await Circuit.findAll({ where: { organisationId } })).map((c) => [c.id, c]));
  const [latest, reviews, recommended] = await Promise.all([latestStudies(organisationId), reviewSummaries(organisationId), recommendations(organisationId, crossings, circuits)]);
  return crossings.map((x) => {
    const s = latest.get(x.id);
    const circuit = circuits.get(x.circuitId);
    const review = reviews.get(x.id);
    const rec = recommended.get(x.id);
    return {
      crossingId: x.id,
      crossing: x.name,
      circuitId: x.circuitId,
      circuit: circuit?.name ?? "",
      voltageKv: circuit?.voltageKv ?? null,
      kind: x.kind,
      lat: x.lat,
      lon: x.lon,
      studyId: s?.id ?? null,
      verdict: s?.verdict ?? null,
      availability: s?.availability ?? null,
      // The study's own scaling to a year when its period is not one whole year.
      darkHoursPerYear: s ? (num(s.annualDarkHours) ?? s.darkHours) : null,
      longestDarkHours: s?.longestDarkHours ?? null,
      reportablePerYear: s ? (num(s.annualReportable) ?? num(s.reportable)) : null,
      coverage: s ? num(s.coverage) : null,
      recommendedOption: rec?.name ?? null,
      equivalentAnnualCost: rec?.eac ?? null,
      currency: rec?.currency ?? null,
      reviewState: review?.state ?? "draft",
      reviewStale: review?.stale ?? false,
      staleReasons: review?.staleReasons ?? [],
      decision: review?.decision ?? null,
      studiedAt: s ? new Date(s.createdAt).toISOString() : null,
    };
  });
}

const RANK: Record<string, number> = { "no-go": 0, marginal: 1, "insufficient-data": 2, "not-studied": 3, go: 4 };

/** Counts by verdict, every row, and what needs attention (worst first; never-studied crossings included). */
export async function portfolio(organisationId: number): Promise<Portfolio> {
  const rows = await portfolioRows(organisationId);
  // The rows are one array per version (rowsCache), so what is made from them is kept with them.
  let made = portfolios.get(rows);
  if (!made) portfolios.set(rows, (made = summarise(rows)));
  return made;
}

type Portfolio = ReturnType<typeof summarise>;
const portfolios = new WeakMap<PortfolioRow[], Portfolio>();

function summarise(rows: PortfolioRow[]) {
  const counts = { go: 0, marginal: 0, "no-go": 0, "insufficient-data": 0, "not-studied": 0 };
  for (const r of rows) counts[r.verdict ?? "not-studied"]++;
  const attention = rows
    .filter(needsAttention)
    .sort((a, b) => RANK[a.verdict ?? "not-studied"] - RANK[b.verdict ?? "not-studied"] || (a.availability ?? 1) - (b.availability ?? 1) || a.crossing.localeCompare(b.crossing));
  return { counts, stale: rows.filter((r) => r.reviewStale).length, rows, attention };
}

interface PortfolioInView {
  /** The crossings the view shows, in the rows' order. */
  inViewIds: number[];
  /** The view in words, with its count. */
  description: string;
}
const views = new WeakMap<PortfolioRow[], LRUCache<string, PortfolioInView>>();

/**
 * The portfolio with the crossings a view (filters, sort) shows. Filtering and sorting run the
 * table model over every row, about a tenth of the page's CPU; a view of one version of the rows
 * is kept with them.
 */
export async function portfolioInView(organisationId: number, view: PortfolioView): Promise<Portfolio & PortfolioInView> {
  const made = await portfolio(organisationId);
  let byView = views.get(made.rows);
  if (!byView) views.set(made.rows, (byView = new LRUCache({ max: 20 })));
  const key = JSON.stringify(view);
  let inView = byView.get(key);
  if (!inView) {
    const rows = rowsInView(made.rows, view);
    byView.set(key, (inView = { inViewIds: rows.map((r) => r.crossingId), description: describeView(view, rows.length) }));
  }
  return { ...made, ...inView };
}
