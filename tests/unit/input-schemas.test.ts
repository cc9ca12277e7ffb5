// The shared schemas refuse what used to be read silently wrong or crash later (issue 8,
// items 4 and 5): lone surrogates, control characters, null/""/true as numbers, ids like "abc".
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { circuitSchema, crossingSchema } from "../../shared/circuit-schemas";
import { apiKeySchema, signInSchema } from "../../shared/account-schemas";
import { idField, isWellFormed } from "../../shared/fields";
import { safeParseForm } from "../../shared/form-decode";
import { TIMESTAMP_RANGE_DESCRIPTION } from "../../shared/ingest-options";
import { feasibilityRequestSchema, studyParamsSchema } from "../../shared/study-schemas";
import { MAX_SPAN_YEARS, MAX_YEAR, MIN_YEAR } from "../../lib/ingest/time-range";

const crossing = { name: "River", lat: 35.2, lon: -97.4, spanLength: { value: 300, unit: "m" }, kind: "river" };
const paths = (r: { success: boolean; error?: z.ZodError }) => (r.error?.issues ?? []).map((i) => i.path.join("."));

describe("well-formed text", () => {
  it("tells lone surrogates from pairs", () => {
    expect(isWellFormed("zz-\ud800x")).toBe(false);
    expect(isWellFormed("\udc00")).toBe(false);
    expect(isWellFormed("ab\ud800")).toBe(false);
    expect(isWellFormed("river 🌊")).toBe(true); // a surrogate pair
    expect(isWellFormed("Zürich – Rhône")).toBe(true);
  });

  it("names refuse lone surrogates and control characters, keep ordinary text", () => {
    expect(paths(circuitSchema.safeParse({ name: "zz-\ud800x", voltageKv: 138, phases: 3 }))).toEqual(["name"]);
    expect(paths(circuitSchema.safeParse({ name: "a\u0000b", voltageKv: 138, phases: 3 }))).toEqual(["name"]);
    expect(paths(apiKeySchema.safeParse({ name: "line\nbreak", role: "engineer", scopes: ["circuits:read"] }))).toEqual(["name"]);
    expect(circuitSchema.parse({ name: "  Ligne Rhône 🌊 ", voltageKv: 138, phases: 3 }).name).toBe("Ligne Rhône 🌊");
    expect(circuitSchema.parse({ name: "N", voltageKv: 138, phases: 3, notes: "two\nlines" }).notes).toBe("two\nlines");
  });
});

describe("numbers in the API are JSON numbers", () => {
  it("lat null, \"\" and true are refused, not read as 0, 0 and 1", () => {
    for (const lat of [null, "", true, "35.2", NaN, Infinity]) {
      expect(paths(crossingSchema.safeParse({ ...crossing, lat })), String(lat)).toEqual(["lat"]);
    }
    expect(crossingSchema.parse(crossing).lat).toBe(35.2);
  });

  it("a feasibility location with lat null is refused", () => {
    const r = feasibilityRequestSchema.safeParse({ samples: [["2025-01-01T00:00:00Z", 1], ["2025-01-01T00:05:00Z", 2]], location: { lat: null, lon: 0 }, device: { minCurrentA: 1, maxCurrentA: 10, harvestW: "I", loadW: 1 } });
    expect(paths(r)).toEqual(["location.lat"]);
  });
});

describe("numbers in forms are read from text", () => {
  it("empty required fields are errors, not 0", () => {
    const r = safeParseForm(crossingSchema, { name: "X", lat: "", lon: " ", spanLengthValue: "", spanLengthUnit: "m", kind: "river" });
    expect(paths(r).sort()).toEqual(["lat", "lon", "spanLength.value"]);
  });

  it("decimal commas and plain numbers read; words do not", () => {
    const parsed = safeParseForm(circuitSchema, { name: "C", voltageKv: "138,5", phases: " 3 ", normalRatingA: "" });
    expect(parsed.data).toMatchObject({ voltageKv: 138.5, phases: 3 });
    expect(parsed.data!.normalRatingA).toBeUndefined();
    expect(paths(safeParseForm(circuitSchema, { name: "C", voltageKv: "abc", phases: "3" }))).toEqual(["voltageKv"]);
  });
});

describe("ids", () => {
  it("accept positive whole numbers (as numbers or digits) only", () => {
    const id = idField("Choose one.");
    expect(id.parse(7)).toBe(7);
    expect(id.parse("7")).toBe(7);
    for (const bad of ["abc", "1.5", "-3", "0", "", true, null, "1e3", "99999999999999999999"]) expect(id.safeParse(bad).success, String(bad)).toBe(false);
  });
});

describe("length limits", () => {
  it("a 100,000-character e-mail is refused before it reaches the database", () => {
    const r = signInSchema.safeParse({ email: `${"x".repeat(100_000)}@example.com`, password: "p" });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0].message).toContain("254");
  });
});

describe("period bounds", () => {
  it("refuse years outside 1900–2200, read year 0001 as year 1", () => {
    expect(paths(studyParamsSchema.safeParse({ periodStart: "0001-01-01T00:00:00Z" }))).toEqual(["periodStart"]);
    expect(paths(studyParamsSchema.safeParse({ periodEnd: "2201-01-01T00:00:00Z" }))).toEqual(["periodEnd"]);
    expect(studyParamsSchema.safeParse({ periodStart: "1900-01-01T00:00:00Z", periodEnd: "2200-12-31T00:00:00Z" }).success).toBe(true);
  });

  it("the documented range is the enforced one", () => {
    expect(TIMESTAMP_RANGE_DESCRIPTION).toContain(`${MIN_YEAR}–${MAX_YEAR}`);
    expect(TIMESTAMP_RANGE_DESCRIPTION).toContain(`${MAX_SPAN_YEARS} years`);
    const openApi = JSON.stringify(z.toJSONSchema(feasibilityRequestSchema, { io: "input", unrepresentable: "any" }));
    expect(openApi).toContain(`${MIN_YEAR}–${MAX_YEAR}`);
  });
});
