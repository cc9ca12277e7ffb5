// The one form-decoding path (shared/form-decode.ts): every page reads its numbers the same way.
// Expected values are worked by hand from the rule in numberFromText's comment.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { z } from "zod";
import { decodeForm, numberFromText, safeParseForm } from "../../shared/form-decode";
import { crossingSchema } from "../../shared/circuit-schemas";
import { lightingOptionFormSchema } from "../../shared/lighting-option-schemas";
import { studyRequestSchema, studyFormToRequest } from "../../shared/study-forms";

describe("numbers as people type them", () => {
  it.each([
    ["12", 12],
    [" 12.5 ", 12.5],
    ["12,5", 12.5],
    ["0,125", 0.125],
    ["-0,5", -0.5],
    ["−3", -3],
    ["1,000", 1000],
    ["1,250.75", 1250.75],
    ["12 500", 12500],
    ["1\u00a0000", 1000],
    [".5", 0.5],
    ["1e3", 1000],
  ])("%j → %d", (text, value) => expect(numberFromText(text)).toBe(value));

  it.each(["abc", "12,5,6", "1.2.3", "0x1f", "Infinity", "12 5", "5 A"])("%j is not a number", (text) => expect(numberFromText(text)).toBeNaN());

  it("empty text is not stated", () => {
    expect(numberFromText("")).toBeUndefined();
    expect(numberFromText("   ")).toBeUndefined();
  });

  it("reads back any number written with a point, and with a comma when it cannot be a thousands group", () => {
    fc.assert(
      fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), (x) => {
        const text = String(x);
        if (/e/i.test(text)) return; // tiny values print in exponent form, read above
        expect(numberFromText(text)! + 0).toBe(x + 0); // + 0: -0 reads as 0
        const comma = text.replace(".", ",");
        if (!/^-?[1-9]\d{0,2},\d{3}$/.test(comma)) expect(numberFromText(comma)! + 0).toBe(x + 0);
      }),
    );
  });
});

describe("decodeForm walks the schema", () => {
  const schema = z.object({
    count: z.number().int(),
    note: z.string().optional(),
    ticked: z.boolean().default(false),
    sizes: z.array(z.number()).optional(),
    choice: z.enum(["a", "b"]).optional(),
  });

  it("numbers, checkboxes, lists and empty optional fields", () => {
    expect(decodeForm(schema, { count: "1,000", note: "", ticked: "on", sizes: "0, 20 40", choice: "" })).toEqual({ count: 1000, ticked: true, sizes: [0, 20, 40] });
    expect(decodeForm(schema, { count: "" })).toEqual({ ticked: false });
    expect(safeParseForm(schema, { count: "many" }).error!.issues.map((i) => i.path.join("."))).toEqual(["count"]);
  });

  it("leaves JSON values alone", () => {
    expect(decodeForm(schema, { count: 3, ticked: true, sizes: [1] })).toEqual({ count: 3, ticked: true, sizes: [1] });
  });

  it("gathers a nested object from its flat names, so errors carry them", () => {
    const r = safeParseForm(crossingSchema, { name: "X", lat: "35,2", lon: "-97.4", spanLengthValue: "1,200", spanLengthUnit: "ft", kind: "river", ruleSet: "" });
    expect(r.data).toMatchObject({ lat: 35.2, spanLength: { value: 1200, unit: "ft" } });
    expect(r.data!.ruleSet).toBeUndefined();
    const missing = safeParseForm(crossingSchema, { name: "X", lat: "1", lon: "1", kind: "river" });
    expect(missing.error!.issues.map((i) => i.path.join("."))).toEqual(["spanLength.value", "spanLength.unit"]);
  });

  it("the same text means the same number on every form", () => {
    const option = safeParseForm(lightingOptionFormSchema, {
      name: "O", kind: "line-powered", unitPrice: "1,250", installationMethod: "helicopter", mobilisation: "0", ratePerHour: "12,5",
      minutesPerUnit: "30", annualMaintenance: "0", serviceLifeYears: "10", horizonYears: "20", discountRatePercent: "5",
    });
    expect(option.data).toMatchObject({ unitPrice: 1250, ratePerHour: 12.5, outageNeeded: false, outageCost: 0 });
    const study = safeParseForm(studyRequestSchema, studyFormToRequest({ crossingId: "1", profileId: "2", deviceProfileId: "3", scheduleKind: "night", sunAltitudeDeg: "−0,833", loadScale: "0,75", maxGapMinutes: "" }));
    expect(study.data).toMatchObject({ crossingId: 1, schedule: { kind: "night", sunAltitudeDeg: -0.833 }, params: { loadScale: 0.75 } });
    expect(study.data!.params.maxGapMinutes).toBeUndefined();
  });
});
