// The study report (lib/report/study-report.ts) built from a real engine run, and its PDF
// (app/services/report-pdf.server.tsx) read back with pdf.js.
import { describe, expect, it } from "vitest";
import type { Series } from "../../lib/series";
import { runStudy } from "../../lib/engine/simulate";
import { buildStudyReport, type ReportInputs } from "../../lib/report/study-report";
import { renderReportPdf, pdfText as spell } from "../../app/services/report-pdf.server";
import { pdfText } from "../support/pdf";
import { layoutMarkers } from "../../lib/markers";
import type { RuleReference } from "../../shared/marker-schemas";

// The rules of an FAA layout as shipped: spacing 200 ft [published: AC 70/7460-1K ¶34.a(2)(a)], the
// colour sequence [from memory: shipped unconfirmed]; one of them confirmed by a (invented) consultant.
function ruleList(): RuleReference[] {
  const refs = layoutMarkers({ ruleSet: "faa", spanLength: { value: 1450, unit: "ft" } }).references;
  return refs.map((r) => (r.key === "faa.spacing" ? { ...r, confirmedBy: "N. Name", confirmedOn: "2026-12-03", edition: "M", paragraph: "¶3.5.1.3", section: "AC 70/7460-1M ¶3.5.1.3" } : r));
}

const HOUR = 3600;
const DAY = 86_400;
const T0 = Date.UTC(2025, 0, 6) / 1000;

function inputs(): ReportInputs {
  // 30 days of 15-minute samples; every 5th day the current sits below the 50 A minimum until noon UTC.
  const n = 30 * 96 + 1;
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = T0 + i * 900;
    const s = i * 900;
    amps[i] = Math.floor(s / DAY) % 5 === 0 && s % DAY < 12 * HOUR ? 20 : 150;
  }
  const series: Series = { t, amps };
  const device = { minCurrentA: 50, maxCurrentA: 2000, harvestW: "0.1 * I", loadW: 4, standbyW: 0, storageWh: 0 };
  const location = { lat: 38.6, lon: -92.2 };
  const result = runStudy(series, { device, schedule: { kind: "night", sunAltitudeDeg: -0.833 }, location });
  const solver = { reachable: false, value: null, tolerance: 1, reason: "Storage alone cannot cover whole dark nights." };
  return {
    generatedAt: "2026-01-02T03:04:05.000Z",
    organisation: "Northfold Power",
    study: {
      id: 41,
      createdAt: "2026-01-01T00:00:00.000Z",
      inputsFingerprint: "abc123",
      inputs: {
        profile: { name: "Feeder 7 winter" },
        deviceProfile: { name: "Glowline 40" },
        device,
        location,
        schedule: { kind: "night", sunAltitudeDeg: -0.833 },
        params: { phase: "A" },
        policy: { goAvailability: 0.999, marginalAvailability: 0.99, maxDarkStretchHours: 0.5, minKnownHours: 8000, minCoverage: 0.9 },
      },
      results: { ...result, solvers: { minStorage: solver, maxMinCurrent: solver } },
      staleReasons: [],
    },
    crossing: { id: 7, name: "Glimmer River crossing", kind: "River", spanLength: { value: 1450, unit: "ft" } },
    circuit: { name: "Ridgeback 138", voltageKv: 138 },
    layout: null,
    curve: null,
    layoutErrors: [],
    options: { currency: "USD", rows: [], recommendation: null },
    review: {
      state: "approved",
      stale: false,
      staleReasons: [],
      decision: "do-not-proceed",
      approvedBy: "Morgan Vale",
      approvedAt: "2026-01-01T12:00:00.000Z",
      submittedBy: "Ellis Hart",
      studyId: 41,
      optionId: null,
      history: [],
    },
    rules: ruleList(),
    optionNames: {},
    quality: { coverage: 1, gaps: { count: 0, hours: 0 }, flatlines: [], zeroStretches: [], rowsRead: 2881, validSamples: 2881, duplicates: 0 },
  };
}

describe("study report model", () => {
  const x = inputs();
  const model = buildStudyReport(x);
  const section = (heading: string) => model.sections.find((s) => s.heading === heading);

  it("carries the verdict, the signer, the fingerprint and the caution", () => {
    expect(model.verdict.status).toBe(x.study.results.verdict.status);
    expect(model.title).toContain("Glimmer River crossing");
    expect(JSON.stringify(section("Review and decision"))).toContain("Morgan Vale");
    expect(JSON.stringify(section("Review and decision"))).toContain("Do not proceed");
    expect(JSON.stringify(section("Inputs"))).toContain("abc123");
    expect(model.deference).toMatch(/local codes, the aviation authority and licensed engineering practice/);
  });

  it("lists the nights that were not lit, with their dark minutes", () => {
    const nights = section("Night by night");
    expect(nights?.kind).toBe("nights");
    if (nights?.kind !== "nights") return;
    // Every 5th day's morning UTC (evening before, local time) is below the minimum: those nights are partly dark.
    const partly = nights.nights.filter((n) => n.status === "partly");
    expect(partly.length).toBeGreaterThanOrEqual(5);
    expect(nights.exceptions.length).toBe(nights.nights.filter((n) => n.status !== "lit" && n.status !== "none").length);
    const darkMinutes = nights.nights.reduce((a, n) => a + n.darkMinutes, 0);
    expect(darkMinutes / 60).toBeCloseTo(x.study.results.lighting.darkHours, 1);
  });

  it("shows one monthly row per month, rounded so lit + dark + unknown = required", () => {
    const monthly = section("Monthly figures");
    if (monthly?.kind !== "table") throw new Error("no monthly table");
    expect(monthly.rows.length).toBe(x.study.results.monthly.length);
    for (const row of monthly.rows) {
      const [required, lit, dark, unknown] = row.slice(1, 5).map((v) => Number(v.replace(/,/g, "")));
      expect(lit + dark + unknown).toBeCloseTo(required, 6);
    }
  });
});

describe("study report rule list", () => {
  it("carries each rule's status in plain words, never a bare status or 'from memory'", async () => {
    const model = buildStudyReport(inputs());
    const rules = model.sections.find((s) => s.heading === "Rule references");
    if (rules?.kind !== "table") throw new Error("no rule table");
    expect(rules.columns).toEqual(["Rule", "Section", "Status"]);
    const status = (start: string) => rules.rows.find((row) => row[0].startsWith(start))?.[2];
    expect(status("Markers spaced equally")).toBe("confirmed by N. Name on 2026-12-03 against AC 70/7460-1M ¶3.5.1.3");
    expect(status("Alternate orange, white, yellow")).toBe("unconfirmed: not yet checked against the text of AC 70/7460-1K ¶34.a(2)(b); confirm it in the rule book");
    expect(status("Spheres at least 36 in")).toMatch(/^published: checked against AC 70\/7460-1K ¶34\.a\(1\); edition K was replaced in December 2015/);
    for (const row of rules.rows) expect(["published", "common practice", "unconfirmed"]).not.toContain(row[2]);
    expect(JSON.stringify(rules)).not.toMatch(/from memory/i);
    const read = await pdfText(await renderReportPdf(model));
    expect(read.text.replace(/\s+/g, " ")).toContain("confirmed by N. Name on 2026-12-03");
    expect(read.text.replace(/\s+/g, " ")).toMatch(/unconfirmed: not yet checked against the text of/);
  }, 60_000);
});

describe("study report PDF", () => {
  it("is a PDF whose text holds the crossing, the verdict, the signer and the caution", async () => {
    const model = buildStudyReport(inputs());
    const bytes = await renderReportPdf(model);
    expect(Buffer.from(bytes.subarray(0, 5)).toString("latin1")).toBe("%PDF-");
    const read = await pdfText(bytes);
    expect(read.pages).toBeGreaterThanOrEqual(1);
    expect(read.title).toBe("Feasibility report: Glimmer River crossing");
    expect(read.text).toContain("Glimmer River crossing");
    expect(read.text).toContain(`Verdict: ${model.verdict.word}`);
    expect(read.text).toContain("Morgan Vale");
    expect(read.text).toContain("aviation authority");
    expect(read.text).toContain("Night by night");
  }, 60_000);

  it("spells signs the embedded font lacks", () => {
    expect(spell("≥ 99.9 % → go")).toBe(">= 99.9 % -> go");
  });
});
