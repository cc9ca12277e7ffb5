import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import fc from "fast-check";
import { FORMULA_START, toCsv } from "../../shared/csv";

// The leading characters that make a spreadsheet run a cell as a formula: =, +, -, @, and tab /
// carriage return before one [common practice: the usual CSV-injection guidance].
const DANGEROUS = ["=cmd|' /C calc'!A0", "+1+1", "-2+3", "@SUM(A1:A2)", "\t=1+1", "\r=1+1", "=line one\nline two"];

const cellsOf = (csv: string) => Papa.parse<string[]>(csv, { header: false, newline: "\r\n" }).data;

describe("toCsv neutralises formula-like cells", () => {
  it.each(DANGEROUS)("writes %j as quoted text with a leading single quote", (value) => {
    const csv = toCsv([{ name: value, n: 1 }]);
    expect(cellsOf(csv)[1][0]).toBe(`'${value}`);
    // Quoted, so the quote and the value travel together through any reader.
    expect(csv.split("\r\n")[1].startsWith(`"'`)).toBe(true);
  });

  it("leaves ordinary text and numbers alone (a negative number is not a formula)", () => {
    const csv = toCsv([{ name: "Crossing A-12", n: -3.5, ok: true, empty: "" }]);
    expect(cellsOf(csv)[1]).toEqual(["Crossing A-12", "-3.5", "true", ""]);
  });

  it("no cell read back starts like a formula, and every cell reads back as written (quote added only when needed)", () => {
    fc.assert(
      fc.property(fc.array(fc.string({ unit: fc.constantFrom("=", "+", "-", "@", "\t", "\r", "\n", "a", "1", " ", ",", '"', "'") }), { minLength: 1, maxLength: 5 }), (values) => {
        const rows = [Object.fromEntries(values.map((v, i) => [`c${i}`, v]))];
        const back = cellsOf(toCsv(rows))[1];
        expect(back).toHaveLength(values.length);
        for (const [i, cell] of back.entries()) {
          expect(FORMULA_START.test(cell)).toBe(false);
          expect(cell).toBe(FORMULA_START.test(values[i]) ? `'${values[i]}` : values[i]);
        }
      }),
      { numRuns: 500 },
    );
  });
});
