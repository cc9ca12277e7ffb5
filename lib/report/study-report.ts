// The study report (docs/report.md): one model of sections and tables, already worded and
// formatted, that both the printable page and the PDF render. Keeping the words here means the two
// never disagree, and the tests can read what a report says without parsing either output.
import type { HarvestPoint, StudyResult, VerdictStatus } from "../../shared/study-schemas";
import { harvestDescription } from "../engine/harvest-points";
import type { MarkerLayout, RuleReference } from "../../shared/marker-schemas";
import { statusWords } from "../../shared/rule-book";
import type { OptionComparisonRow } from "../../shared/cost-schemas";
import { REVIEW_DECISION_LABELS, REVIEW_STATE_LABELS, type ReviewJson } from "../../shared/review-schemas";
import { formatAvailability, formatHours, formatMoney, formatNumber, formatPercent, formatUtc, roundToTotal } from "../../shared/format";
import { SAFETY_CAUTION } from "../../shared/safety";
import { VERDICT_WORDS } from "../../shared/portfolio";
import { nightsOf, type Night } from "../engine/nights";
import { spanDrawing, type SpanCurve, type SpanDrawing } from "../span";


export interface ReportInputs {
  generatedAt: string;
  organisation: string;
  study: {
    id: number;
    createdAt: string;
    inputsFingerprint: string;
    inputs: {
      profile: { name: string };
      deviceProfile: { name: string };
      device: { minCurrentA: number; maxCurrentA: number; harvestW?: string; harvestPoints?: HarvestPoint[]; loadW: number; standbyW: number; storageWh: number };
      location: { lat: number; lon: number };
      schedule: { kind: "night"; sunAltitudeDeg: number } | { kind: "always" };
      params: { phase: string };
      policy: { goAvailability: number; marginalAvailability: number; maxDarkStretchHours: number; minKnownHours: number; minCoverage: number };
    };
    results: StudyResult & { solvers: { minStorage: Solver; maxMinCurrent: Solver } };
    staleReasons: string[];
  };
  crossing: { id: number; name: string; kind: string; spanLength: { value: number; unit: string } } | null;
  circuit: { name: string; voltageKv: number } | null;
  layout: MarkerLayout | null;
  /** The span's conductor curve, for the drawing (absent without a layout). */
  curve: SpanCurve | null;
  layoutErrors: string[];
  /** Option rows with, by option id, how many units each is costed for and where that count came from. */
  options: { currency: string; rows: OptionComparisonRow[]; recommendation: { name: string; reasons: string[] } | null; units?: Record<string, string> };
  /** The rules the crossing rests on (layout, wires, support lights in use), each with its status. */
  rules: RuleReference[];
  review: ReviewJson | null;
  optionNames: Record<number, string>;
  quality: { coverage?: number; gaps?: { count: number; hours: number }; flatlines?: unknown[]; zeroStretches?: unknown[]; duplicates?: number; validSamples?: number; rowsRead?: number } | null;
}

interface Solver {
  reachable: boolean;
  value?: number | null;
  tolerance: number;
  reason: string;
}

export type ReportSection =
  | { kind: "facts"; heading: string; rows: [string, string][]; note?: string }
  | { kind: "table"; heading: string; columns: string[]; rows: string[][]; note?: string }
  | { kind: "list"; heading: string; items: string[]; note?: string }
  | { kind: "nights"; heading: string; nights: Night[]; note: string; exceptions: string[][] }
  | { kind: "span"; heading: string; note: string; drawing: SpanDrawing };

export interface StudyReportModel {
  title: string;
  generatedAt: string;
  subtitle: string;
  verdict: { status: VerdictStatus; word: string; reasons: string[]; basis: string };
  caution: string;
  deference: string;
  sections: ReportSection[];
}

const dash = "—";

export function buildStudyReport(x: ReportInputs): StudyReportModel {
  const { study, crossing, circuit } = x;
  const r = study.results;
  const L = r.lighting;
  const inputs = study.inputs;
  const device = inputs.device;
  const sections: ReportSection[] = [];

  sections.push({
    kind: "facts",
    heading: "Crossing",
    rows: [
      ["Crossing", crossing?.name ?? "(deleted)"],
      ["Circuit", circuit ? `${circuit.name}, ${formatNumber(circuit.voltageKv)} kV` : dash],
      ["Kind", crossing?.kind ?? dash],
      ["Span", crossing ? `${formatNumber(crossing.spanLength.value)} ${crossing.spanLength.unit}` : dash],
      ["Location", `${inputs.location.lat.toFixed(4)}, ${inputs.location.lon.toFixed(4)}`],
    ],
  });
  if (x.layout && x.curve) {
    const lay = x.layout;
    const drawing = spanDrawing(x.curve, { width: 500, height: 160, padding: 12, markerDistances: lay.positions.map((p) => p.distanceFromSupportA.value) });
    sections.push({ kind: "span", heading: "Span and marker plan", drawing, note: `${lay.count} markers at ${formatNumber(lay.spacing.value, 1)} ${lay.spacing.unit} spacing (at most ${formatNumber(lay.maxSpacing.value, 1)} ${lay.maxSpacing.unit}, ${lay.ruleSet.toUpperCase()}), ${formatNumber(lay.markerDiameter.value)} ${lay.markerDiameter.unit} spheres on the ${lay.wire}.` });
    sections.push({
      kind: "table",
      heading: "Marker positions",
      columns: ["Marker", "From support A", "Colour", "Lit"],
      rows: lay.positions.map((p) => [String(p.index), `${formatNumber(p.distanceFromSupportA.value, 1)} ${p.distanceFromSupportA.unit}`, p.colour, p.lit ? "yes" : "no"]),
    });
  } else {
    sections.push({ kind: "list", heading: "Span and marker plan", items: x.layoutErrors.length ? x.layoutErrors : ["No marker layout: the crossing's span and marking details are incomplete."] });
  }

  sections.push({
    kind: "facts",
    heading: "Inputs",
    rows: [
      ["Study", `${study.id}, run ${formatUtc(study.createdAt)}`],
      ["Inputs fingerprint", study.inputsFingerprint],
      ["Load profile", `${inputs.profile.name}, phase ${inputs.params.phase}`],
      ["Device", `${inputs.deviceProfile.name}: ${device.minCurrentA}–${device.maxCurrentA} A, harvest ${harvestDescription(device)}${device.harvestW !== undefined ? " W" : ""}, load ${device.loadW} W, standby ${device.standbyW} W, storage ${device.storageWh} Wh`],
      ["Schedule", inputs.schedule.kind === "night" ? `night: sun below ${inputs.schedule.sunAltitudeDeg}°` : "always on"],
      ["Analysed period (UTC)", `${r.period.start.slice(0, 10)} to ${r.period.end.slice(0, 10)}`],
      ["Interpolation and gaps", `${r.settings.interpolation}; gaps over ${formatNumber(r.settings.maxGapSeconds / 60, 1)} min are unknown (${r.settings.maxGapSource})`],
    ],
    note: study.staleReasons.length ? `Inputs changed since this run: ${study.staleReasons.join("; ")}.` : undefined,
  });

  const unknownRequired = Math.max(0, L.requiredHours - L.requiredKnownHours);
  const [lit, dark, unknown] = roundToTotal([L.litHours, L.darkHours, unknownRequired], 1);
  sections.push({
    kind: "facts",
    heading: "Figures",
    rows: [
      ["Availability (lit / required known hours)", formatAvailability(L.availability)],
      ["Required hours: lit / dark / unknown", `${formatNumber(lit, 1)} / ${formatNumber(dark, 1)} / ${formatNumber(unknown, 1)}`],
      ["Longest dark stretch", formatHours(L.longestDarkStretchHours, 2)],
      ["Dark events, reportable (over 30 min)", `${L.darkEvents}, ${L.reportableOutages}`],
      ["Data coverage", r.period.coverage == null ? dash : formatPercent(r.period.coverage, 1)],
      [`Hours at or above ${device.minCurrentA} A`, formatHours(r.current.hoursAtOrAboveMin)],
      ...(r.annualised ? ([["Per year (scaled)", `${formatHours(r.annualised.darkHours)} dark, ${formatNumber(r.annualised.reportableOutages, 1)} reportable outages`]] as [string, string][]) : []),
    ],
  });

  sections.push({
    kind: "table",
    heading: "Monthly figures",
    columns: ["Month", "Required h", "Lit h", "Dark h", "Unknown h", "Availability", "Longest dark", "Reportable"],
    rows: r.monthly.map((m) => {
      const [l, d, u] = roundToTotal([m.litHours, m.darkHours, m.requiredUnknownHours ?? Math.max(0, m.requiredHours - m.requiredKnownHours)], 1);
      return [m.month, formatNumber(l + d + u, 1), formatNumber(l, 1), formatNumber(d, 1), formatNumber(u, 1), formatAvailability(m.availability, 2), formatHours(m.longestDarkStretchHours, 2), String(m.reportableOutages)];
    }),
    note: "Required = lit + dark + unknown; hours rounded so each row adds up.",
  });

  sections.push({
    kind: "table",
    heading: "Load-duration curve",
    columns: ["Share of known time", "Current exceeded"],
    rows: loadDurationRows(r.loadDuration),
    note: `The current the line carried for at least each share of the known time; the device needs ${device.minCurrentA} A.`,
  });

  if (r.nights) {
    const nights = nightsOf(r.nights, inputs.location.lon * 240);
    const notLit = nights.filter((n) => n.status === "dark" || n.status === "partly" || n.status === "unknown");
    sections.push({
      kind: "nights",
      heading: "Night by night",
      nights,
      note: `${nights.filter((n) => n.status === "lit").length} nights lit throughout, ${nights.filter((n) => n.status === "partly").length} partly dark, ${nights.filter((n) => n.status === "dark").length} dark, ${nights.filter((n) => n.status === "unknown").length} unknown. Nights run from local solar noon to the next and carry the date of their evening.`,
      exceptions: notLit.slice(0, 40).map((n) => [n.date, n.status === "partly" ? "partly dark" : n.status, formatNumber(n.darkMinutes, 0), formatNumber(n.unknownMinutes, 0), formatNumber(n.requiredMinutes, 0)]),
    });
  }

  sections.push({
    kind: "table",
    heading: "What it would take to reach go",
    columns: ["Question", "Answer", "Why"],
    rows: [
      ["Smallest storage that reaches go", r.solvers.minStorage.reachable ? `${formatNumber(r.solvers.minStorage.value ?? 0)} Wh (± ${r.solvers.minStorage.tolerance} Wh)` : "not reachable", r.solvers.minStorage.reason],
      ["Largest minimum current that still reaches go", r.solvers.maxMinCurrent.reachable ? `${formatNumber(r.solvers.maxMinCurrent.value ?? 0, 1)} A (± ${r.solvers.maxMinCurrent.tolerance} A)` : "not reachable", r.solvers.maxMinCurrent.reason],
    ],
  });

  sections.push({
    kind: "table",
    heading: "Lighting options and costs",
    columns: ["Option", "Units", "Feasibility", "Present value", "Per year", "Recommended"],
    rows: x.options.rows.map((o) => [o.name, x.options.units?.[o.id ?? ""] ?? "", o.feasibility.status, formatMoney(o.totalPV, x.options.currency), formatMoney(o.equivalentAnnualCost, x.options.currency), o.recommended ? "yes" : ""]),
    note: x.options.rows.length === 0 ? "No lighting options recorded for this crossing." : x.options.recommendation ? `Recommended: ${x.options.recommendation.name}. ${x.options.recommendation.reasons.join(" ")}` : "No option is recommended.",
  });

  sections.push(reviewSection(x));

  sections.push({
    kind: "facts",
    heading: "Policy in force for this run",
    rows: [
      ["Go", `availability at least ${formatPercent(inputs.policy.goAvailability, 2)} and no dark stretch over ${inputs.policy.maxDarkStretchHours} h`],
      ["Marginal", `availability at least ${formatPercent(inputs.policy.marginalAvailability, 2)}`],
      ["Enough data", `at least ${formatNumber(inputs.policy.minKnownHours)} known hours and ${formatPercent(inputs.policy.minCoverage, 0)} coverage`],
    ],
  });

  sections.push({
    kind: "table",
    heading: "Rule references",
    columns: ["Rule", "Section", "Status"],
    rows: x.rules.map((ref) => [ref.rule, ref.section, statusWords(ref)]),
    note: x.rules.length ? "Each rule's status in plain words: published (checked against the text), common practice, unconfirmed (to be confirmed in the rule book), or who confirmed it, when and against what." : "No rule references: no marker layout.",
  });

  sections.push({ kind: "list", heading: "Data quality", items: qualityItems(x.quality, r) });

  return {
    title: `Feasibility report: ${crossing?.name ?? `study ${study.id}`}`,
    subtitle: `${x.organisation} · ${circuit ? `${circuit.name} · ` : ""}study ${study.id}`,
    generatedAt: x.generatedAt,
    verdict: { status: r.verdict.status, word: VERDICT_WORDS[r.verdict.status], reasons: r.verdict.reasons, basis: r.verdict.basis.label },
    caution: `${SAFETY_CAUTION.lead} ${SAFETY_CAUTION.body}`,
    deference: "This report defers to local codes, the aviation authority and licensed engineering practice; it is not a filing or a determination.",
    sections,
  };
}

/** The curve read at every tenth of the known time. */
function loadDurationRows(points: { currentA: number; shareExceeded: number }[]): string[][] {
  if (points.length === 0) return [];
  const sorted = [...points].sort((a, b) => a.shareExceeded - b.shareExceeded);
  return [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1].map((p) => {
    // The highest current still exceeded for at least share p of the time.
    const at = sorted.filter((pt) => pt.shareExceeded >= p - 1e-9).reduce((best, pt) => (pt.currentA > best ? pt.currentA : best), -Infinity);
    return [formatPercent(p, 0), Number.isFinite(at) ? `${formatNumber(at, 1)} A` : dash];
  });
}

function reviewSection(x: ReportInputs): ReportSection {
  const rv = x.review;
  if (!rv) return { kind: "list", heading: "Review and decision", items: ["No review recorded."] };
  const rows: [string, string][] = [["State", `${REVIEW_STATE_LABELS[rv.state]}${rv.stale ? " (stale)" : ""}`]];
  if (rv.decision) rows.push(["Decision", `${REVIEW_DECISION_LABELS[rv.decision]}${rv.optionId ? `: ${x.optionNames[rv.optionId] ?? `option ${rv.optionId}`}` : ""}`]);
  if (rv.approvedBy) rows.push(["Signed by", `${rv.approvedBy}${rv.approvedAt ? `, ${formatUtc(rv.approvedAt)}` : ""}`]);
  if (rv.submittedBy) rows.push(["Submitted by", rv.submittedBy]);
  if (rv.studyId) rows.push(["Approval covers", rv.studyId === x.study.id ? `this study (${rv.studyId})` : `study ${rv.studyId}, not this one`]);
  const last = [...rv.history].reverse().find((h) => h.comment);
  if (last) rows.push(["Last comment", `${last.by}: ${last.comment}`]);
  return { kind: "facts", heading: "Review and decision", rows, note: rv.stale ? `The approval is stale: ${rv.staleReasons.join("; ")}.` : undefined };
}

function qualityItems(q: ReportInputs["quality"], r: StudyResult): string[] {
  const items = [`${formatNumber(r.settings.samplesUsed)} samples used; ${formatNumber(r.settings.samplesAboveCap)} above the ${formatNumber(r.settings.plausibilityCapA)} A plausibility cap dropped.`];
  if (!q) return [...items, "The load profile was deleted; its quality report is not available."];
  if (q.rowsRead != null) items.push(`${formatNumber(q.rowsRead)} rows read, ${formatNumber(q.validSamples ?? 0)} valid, ${formatNumber(q.duplicates ?? 0)} duplicates.`);
  if (q.coverage != null) items.push(`Profile coverage ${formatPercent(q.coverage, 1)}.`);
  if (q.gaps) items.push(`${q.gaps.count} gaps totalling ${formatHours(q.gaps.hours)}.`);
  items.push(`${q.flatlines?.length ?? 0} flat-line stretches, ${q.zeroStretches?.length ?? 0} zero-current stretches.`);
  return items;
}
