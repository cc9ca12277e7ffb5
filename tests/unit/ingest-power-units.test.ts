// Power units (lib/ingest/power-units.ts and the ingest): three-phase power on a line of
// line-to-line voltage V_LL carries I = S / (√3 · V_LL), S = √(P² + Q²) or |P| / pf
// (the three-phase power relation, closed form; docs/computation.md "Power units").
import { describe, expect, it } from "vitest";
import { ampsPerUnit, currentFromPower, describePowerConversion } from "../../lib/ingest/power-units";
import { ingestCsvText, IngestError } from "../../lib/ingest/ingest";
import { ingestOptionsSchema } from "../../shared/ingest-options";

describe("conversion from the formula, with worked numbers", () => {
  it("100 MW at 230 kV, pf 1 → 251.0 A (100·10⁶ / (1.7320508 × 230·10³) = 251.02 A)", () => {
    expect(currentFromPower({ unit: "MW", voltageKv: 230 }, 100)).toBeCloseTo(251.02, 2);
    expect(currentFromPower({ unit: "MVA", voltageKv: 230 }, 100)).toBeCloseTo(251.02, 2);
  });

  it("pf 0.9 raises the current by 1/0.9: 100 MW at 230 kV → 278.9 A", () => {
    expect(currentFromPower({ unit: "MW", voltageKv: 230, powerFactor: 0.9 }, 100)).toBeCloseTo(278.91, 2);
  });

  it("80 MW with 60 MVAr is 100 MVA (3-4-5): 251.0 A at 230 kV; the power factor is then not used", () => {
    expect(currentFromPower({ unit: "MW", voltageKv: 230, powerFactor: 0.5 }, 80, 60)).toBeCloseTo(251.02, 2);
  });

  it("kW and kVA: 1000 kW at 13.8 kV → 41.84 A (10⁶ / (1.7320508 × 13 800))", () => {
    expect(currentFromPower({ unit: "kW", voltageKv: 13.8 }, 1000)).toBeCloseTo(41.837, 3);
    expect(ampsPerUnit({ unit: "kVA", voltageKv: 13.8 })).toBeCloseTo(0.041837, 6);
  });

  it("reverse power flow gives the same current (the magnitude)", () => {
    expect(currentFromPower({ unit: "MW", voltageKv: 230 }, -100)).toBeCloseTo(251.02, 2);
    expect(currentFromPower({ unit: "MW", voltageKv: 230 }, -80, -60)).toBeCloseTo(251.02, 2);
  });

  it("states the conversion in words", () => {
    const text = describePowerConversion({ unit: "MW", voltageKv: 230, powerFactor: 0.95 }, "P_MW");
    expect(text).toContain("230 kV line-to-line");
    expect(text).toContain("pf = 0.95");
  });
});

const csv = ["Time,P_MW,Q_MVAr", "2025-01-01T00:00:00Z,100,0", "2025-01-01T00:05:00Z,80,60", "2025-01-01T00:10:00Z,-100,", "2025-01-01T00:15:00Z,50,0"].join("\n");

describe("ingest of a power export", () => {
  it("converts MW with the given voltage and states it in the quality report", () => {
    const r = ingestCsvText(csv, { timestampColumn: "Time", currentColumn: "P_MW", unit: "MW", voltageKv: "230" });
    const a = Array.from(r.series.phases.A!);
    expect(a[0]).toBeCloseTo(251.02, 2);
    expect(a[1]).toBeCloseTo(200.82, 2); // 80 MW at pf 1
    expect(a[2]).toBeCloseTo(251.02, 2); // −100 MW: reverse flow, same current
    expect(r.quality.conversion).toMatch(/I = S \/ \(√3 · V_LL\) at 230 kV line-to-line/);
    expect(r.detected.conversion).toBe(r.quality.conversion);
  });

  it("uses the reactive column: S = √(P² + Q²); a row without Q is counted, not guessed", () => {
    const r = ingestCsvText(csv, { timestampColumn: "Time", currentColumn: "P_MW", unit: "MW", voltageKv: 230, reactiveColumn: "Q_MVAr" });
    const a = Array.from(r.series.phases.A!);
    expect(a).toHaveLength(3);
    expect(a[1]).toBeCloseTo(251.02, 2); // 80 MW + 60 MVAr
    expect(r.quality.invalid["not-a-number"]).toBe(1);
    expect(r.quality.conversion).toContain('Q = "Q_MVAr" in MVAr');
  });

  it("a power unit without a voltage is a 422 naming voltageKv", () => {
    let error: unknown;
    try {
      ingestCsvText(csv, { timestampColumn: "Time", currentColumn: "P_MW", unit: "MVA" });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(IngestError);
    expect((error as IngestError).status).toBe(422);
    expect((error as IngestError).detail).toContain("voltageKv");
  });

  it("the options name misuse: phases in power, a reactive column or power factor with apparent power", () => {
    const issues = (input: Record<string, unknown>) => ingestOptionsSchema.safeParse({ timestampColumn: "Time", ...input }).error?.issues.map((i) => i.path.join(".")) ?? [];
    expect(issues({ phaseA: "P1", phaseB: "P2", unit: "MW" })).toContain("unit");
    expect(issues({ currentColumn: "S", unit: "MVA", reactiveColumn: "Q" })).toContain("reactiveColumn");
    expect(issues({ currentColumn: "S", unit: "kVA", powerFactor: "0.9" })).toContain("powerFactor");
    expect(issues({ currentColumn: "P", unit: "MW", powerFactor: "1.2" })).toContain("powerFactor");
    expect(issues({ currentColumn: "P", unit: "MW", voltageKv: "0" })).toContain("voltageKv");
    expect(issues({ currentColumn: "P", unit: "MW", voltageKv: "230", powerFactor: "0.95" })).toEqual([]);
  });
});
