// Three-phase column names (lib/ingest/sniff.ts): which column holds which phase, and the
// sniffer maps all three. Naming conventions: A/B/C, R/S/T and R/Y/B letters, L1/L2/L3 and
// Ph1… numbers, with I/Amps/Current before or after [common practice in SCADA and historian exports].
import { describe, expect, it } from "vitest";
import { nonCsvKind, phaseColumns, sniffCsv } from "../../lib/ingest/sniff";

const cases: [string[], Record<string, string>][] = [
  [["I_L1", "I_L2", "I_L3"], { A: "I_L1", B: "I_L2", C: "I_L3" }],
  [["IL1 [A]", "IL2 [A]", "IL3 [A]"], { A: "IL1 [A]", B: "IL2 [A]", C: "IL3 [A]" }],
  [["L1", "L2", "L3"], { A: "L1", B: "L2", C: "L3" }],
  [["L1 Amps", "L2 Amps", "L3 Amps"], { A: "L1 Amps", B: "L2 Amps", C: "L3 Amps" }],
  [["Current L1", "Current L2", "Current L3"], { A: "Current L1", B: "Current L2", C: "Current L3" }],
  [["Ph1", "Ph2", "Ph3"], { A: "Ph1", B: "Ph2", C: "Ph3" }],
  [["Phase 1 (A)", "Phase 2 (A)", "Phase 3 (A)"], { A: "Phase 1 (A)", B: "Phase 2 (A)", C: "Phase 3 (A)" }],
  [["I1", "I2", "I3"], { A: "I1", B: "I2", C: "I3" }],
  [["IA", "IB", "IC"], { A: "IA", B: "IB", C: "IC" }],
  [["I_a [kA]", "I_b [kA]", "I_c [kA]"], { A: "I_a [kA]", B: "I_b [kA]", C: "I_c [kA]" }],
  [["Amps A", "Amps B", "Amps C"], { A: "Amps A", B: "Amps B", C: "Amps C" }],
  [["A phase", "B phase", "C phase"], { A: "A phase", B: "B phase", C: "C phase" }],
  [["Phase A", "Phase B", "Phase C"], { A: "Phase A", B: "Phase B", C: "Phase C" }],
  [["A_Current", "B_Current", "C_Current"], { A: "A_Current", B: "B_Current", C: "C_Current" }],
  [["IR", "IS", "IT"], { A: "IR", B: "IS", C: "IT" }],
  [["R", "S", "T"], { A: "R", B: "S", C: "T" }],
  [["I_R", "I_Y", "I_B"], { A: "I_R", B: "I_Y", C: "I_B" }], // R/Y/B: B is blue, the third phase
  [["R Amps", "Y Amps", "B Amps"], { A: "R Amps", B: "Y Amps", C: "B Amps" }],
  [["IA", "IB"], { A: "IA", B: "IB" }], // two phases named: mapped as found
  // Not phases: one name alone, or words that merely end in a phase letter.
  [["Amps"], {}],
  [["Current", "Status", "Temperature", "Load MW"], {}],
  [["IA"], {}],
  [["Time", "Amps", "Quality"], {}],
];

describe("phase column names", () => {
  it.each(cases)("%j", (names, expected) => {
    const found = phaseColumns(names);
    expect(Object.fromEntries(Object.entries(found).map(([phase, i]) => [phase, names[i!]]))).toEqual(expected);
  });
});

describe("the sniffer maps all three phases", () => {
  it("I_L1/I_L2/I_L3 with a time column and a quality flag", () => {
    const csv = "Timestamp;I_L1 [A];I_L2 [A];I_L3 [A];Quality\n2025-03-01 00:00;101,5;99,0;100,2;GOOD\n2025-03-01 00:01;102,0;98,5;100,9;GOOD\n";
    const s = sniffCsv(csv, { complete: true });
    expect(s.suggestions).toMatchObject({ timestampColumn: "Timestamp", phaseA: "I_L1 [A]", phaseB: "I_L2 [A]", phaseC: "I_L3 [A]", qualityColumn: "Quality" });
    expect(s.suggestions.currentColumn).toBeUndefined();
  });
});

describe("files that are not CSV", () => {
  it("names what they are", () => {
    expect(nonCsvKind("%PDF-1.4\n%âãÏÓ\n1 0 obj")).toBe("a PDF document");
    expect(nonCsvKind("PK\u0003\u0004\u0014\u0000")).toMatch(/ZIP archive/);
    expect(nonCsvKind("\ufffd\ufffd\u0011\ufffd\ufffd")).toMatch(/Office document/);
    expect(nonCsvKind("<!DOCTYPE html><html>")).toMatch(/HTML/);
    expect(nonCsvKind("Time,Amps\n2025-01-01T00:00Z,5")).toBeNull();
  });
});
