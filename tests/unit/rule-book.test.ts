// The rule book over the shipped tables (lib/rulebook), and its words (shared/rule-book).
// Values are the shipped defaults of data/rules/*.json; each names its source and status below.
import { describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { DEFAULT_RULES, layoutMarkers } from "../../lib/markers";
import { numericValues, ruleEntries, withNumbers, withRules } from "../../lib/rulebook/book";
import { citation, editionFindings, needsConfirmation, ruleConfirmFromForm, ruleConfirmSchema, statusWords, type RuleSource } from "../../shared/rule-book";

const entries = ruleEntries(DEFAULT_RULES);
const byKey = (key: string) => entries.find((e) => e.source.key === key)!;

describe("rule entries of the shipped tables", () => {
  it("lists every sourced value once, with its rule set", () => {
    const keys = entries.map((e) => e.source.key);
    expect(new Set(keys).size).toBe(keys.length);
    expect(keys).toEqual(expect.arrayContaining(["faa.sphere-diameter", "faa.spacing", "faa.colour-sequence", "faa.lit-markers", "icao.spacing-80cm", "icao.spacing-between"]));
    // 200 ft [published: AC 70/7460-1K ¶34.a(2)(a)]
    expect(byKey("faa.spacing")).toMatchObject({ ruleSet: "faa", values: { value: 200, unit: "ft" }, source: { status: "published", edition: "K", paragraph: "¶34.a(2)(a)" } });
    // colour sequence [from memory (AC 70/7460-1K ¶34.a(2)(b))] ships as unconfirmed
    expect(byKey("faa.colour-sequence").source.status).toBe("unconfirmed");
  });

  it("gives back the same tables when every rule is stored unchanged", () => {
    expect(withRules(DEFAULT_RULES, entries)).toEqual(DEFAULT_RULES);
  });

  it("lays out with an overridden value (faa.spacing 200 → 150 ft: 1,000 ft span → 7 intervals, 6 markers)", () => {
    const spacing = byKey("faa.spacing");
    const rules = withRules(DEFAULT_RULES, [{ values: withNumbers(spacing.values, { value: 150 }), source: spacing.source }]);
    expect(layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } }, rules).count).toBe(6);
    // The shipped 200 ft gives 5 intervals, 4 markers [published: AC 70/7460-1K ¶34.a(2)(a)].
    expect(layoutMarkers({ ruleSet: "faa", spanLength: { value: 1000, unit: "ft" } }).count).toBe(4);
  });

  it("refuses a book whose ICAO diameters would no longer increase", () => {
    const row = byKey("icao.spacing-80cm");
    expect(numericValues(row.values).map((n) => n.path)).toEqual(["diameter.value", "maxSpacing.value"]);
    expect(() => withRules(DEFAULT_RULES, [{ values: withNumbers(row.values, { "diameter.value": 200 }), source: row.source }])).toThrow(ZodError);
  });
});

describe("status in plain words", () => {
  const source = (over: Partial<RuleSource>): RuleSource => ({ ...byKey("faa.spacing").source, ...over });

  it("says who confirmed a rule, when and against what", () => {
    const words = statusWords(source({ edition: "M", paragraph: "¶3.5.1.3", confirmedBy: "N. Name", confirmedOn: "2026-12-03" }));
    expect(words).toBe("confirmed by N. Name on 2026-12-03 against AC 70/7460-1M ¶3.5.1.3");
  });

  it("says an unconfirmed rule is unconfirmed, and never 'from memory'", () => {
    for (const e of entries) expect(statusWords(e.source)).not.toMatch(/memory/i);
    expect(statusWords(byKey("faa.colour-sequence").source)).toBe("unconfirmed: not yet checked against the text of AC 70/7460-1K ¶34.a(2)(b); confirm it in the rule book");
  });

  it("flags a published rule checked against a replaced edition (K, replaced December 2015)", () => {
    const words = statusWords(byKey("faa.spacing").source);
    expect(words).toContain("published: checked against AC 70/7460-1K ¶34.a(2)(a)");
    expect(words).toContain("edition K was replaced in December 2015 (the current edition is M)");
    expect(needsConfirmation(byKey("faa.spacing").source)).toBe(true);
    expect(needsConfirmation(source({ confirmedBy: "N. Name", confirmedOn: "2026-12-03", edition: "M" }))).toBe(false);
    // ICAO: published with the quotation's first words [published: Annex 14 Vol. I ch. 6].
    expect(statusWords(byKey("icao.spacing-between").source)).toContain("(“progressively increasing with the diameter…”)");
    expect(citation({ document: "Annex 14 Vol. I", edition: null, paragraph: "ch. 6" })).toBe("Annex 14 Vol. I ch. 6");
  });

  it("finds mixed and replaced editions among the rules a layout cites", () => {
    const findings = editionFindings([byKey("faa.spacing").source, byKey("faa.lit-markers").source]);
    expect(findings).toContain("The rules used mix editions K and L of AC 70/7460-1; confirm them against one current edition.");
    expect(findings.some((f) => f.includes("AC 70/7460-1K") && f.includes("December 2015"))).toBe(true);
    expect(editionFindings([source({ edition: "M" })])).toEqual([]);
  });
});

describe("confirm form", () => {
  it("reads numbers, refuses text and a date that is not a date", () => {
    const ok = ruleConfirmSchema.safeParse(ruleConfirmFromForm({ edition: "M", paragraph: "¶3.5.1.3", confirmedOn: "2026-12-01", value_value: "150" }, ["value"]));
    expect(ok.success && ok.data.numbers).toEqual({ value: 150 });
    const bad = ruleConfirmSchema.safeParse(ruleConfirmFromForm({ edition: "", paragraph: "x", confirmedOn: "2026-02-30", value_value: "lots" }, ["value"]));
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["edition", "confirmedOn", "numbers.value"]));
  });
});

describe("runway-end distance (unconfirmed rule, from memory: 1,500 ft working extent of the critical area)", () => {
  // 50 ft spacing near runway ends [published: AC 70/7460-1K ¶34.a(2)(a)]; the 1,500 ft extent is
  // Duskline's reading [from memory, unconfirmed: the circular's smaller-sphere distance, AC 70/7460-1K ¶34.a(1)].
  it("ships as unconfirmed and tells users how to confirm it", () => {
    const area = byKey("faa.runway-end-area");
    expect(area.source.status).toBe("unconfirmed");
    expect(statusWords(area.source)).toMatch(/^unconfirmed: .*confirm it in the rule book$/);
  });
  it("sets the reduced spacing by itself within the area, and says so with the rule", () => {
    const near = layoutMarkers({ ruleSet: "faa", spanLength: { value: 300, unit: "ft" }, runwayEndDistance: { value: 900, unit: "ft" } });
    expect(near.count).toBe(5); // 300 ft at ≤ 50 ft: 6 intervals
    expect(near.notes).toContain("The nearest runway end is 900 ft away, within the 1,500 ft (457 m) critical area: the reduced runway-end spacing applies.");
    expect(near.references.map((r) => r.key)).toEqual(expect.arrayContaining(["faa.runway-end-area", "faa.spacing-runway-end"]));
    const far = layoutMarkers({ ruleSet: "faa", spanLength: { value: 300, unit: "ft" }, runwayEndDistance: { value: 600, unit: "m" } });
    expect(far.count).toBe(1); // 300 ft at ≤ 200 ft: 2 intervals
    expect(far.notes.some((n) => n.includes("beyond the 1,500 ft"))).toBe(true);
    // The organisation's book decides the extent: 2,500 ft puts 600 m (1,968.5 ft) inside.
    const area = byKey("faa.runway-end-area");
    const rules = withRules(DEFAULT_RULES, [{ values: withNumbers(area.values, { "distance.value": 2500 }), source: area.source }]);
    expect(layoutMarkers({ ruleSet: "faa", spanLength: { value: 300, unit: "ft" }, runwayEndDistance: { value: 600, unit: "m" } }, rules).count).toBe(5);
  });
});

describe("20 in (51 cm) spheres: the conditions checked from the span", () => {
  // Allowed on less extensive lines, or below 50 ft AGL within 1,500 ft of a runway end
  // [published: AC 70/7460-1K ¶34.a(1)]; canyon, lake and river crossings are extensive (same paragraph).
  const base = { ruleSet: "faa" as const, spanLength: { value: 600, unit: "ft" as const }, markerDiameter: { value: 20, unit: "in" as const } };

  it("allows them on a less extensive line and says which condition applies", () => {
    const layout = layoutMarkers({ ...base, extensive: false });
    expect(layout.notes).toContain("20 in spheres are allowed: the crossing is not a canyon, lake or river crossing, so it is taken as a less extensive line.");
  });

  it("allows them on an extensive crossing only for a low line near a runway end", () => {
    const low = layoutMarkers({ ...base, extensive: true, highestWireHeight: { value: 40, unit: "ft" }, runwayEndDistance: { value: 1000, unit: "ft" } });
    expect(low.notes).toContain("20 in spheres are allowed: the highest wire is 40 ft above the ground (below 50 ft) and the nearest runway end is 1,000 ft away (within 1,500 ft).");
    const high = parseMarkerLayout({ ...base, extensive: true, highestWireHeight: { value: 18.3, unit: "m" }, runwayEndDistance: { value: 1000, unit: "ft" } });
    expect(high).toEqual([{ path: "markerDiameter", message: expect.stringContaining("20 in spheres are not allowed here: this is an extensive crossing") }]);
    expect(high[0].message).toContain("the highest wire is 60 ft above the ground, the nearest runway end is 1,000 ft away");
  });
});

function parseMarkerLayout(input: Parameters<typeof layoutMarkers>[0]) {
  try {
    layoutMarkers(input);
    return [];
  } catch (error) {
    return (error as { errors: { path: string; message: string }[] }).errors;
  }
}
