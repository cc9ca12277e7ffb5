import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { headerUnit, phaseOfColumn, sniffCsv } from "../../lib/ingest/sniff";
import { parseDecimal, qualityJudge } from "../../lib/ingest/numbers";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/csv/${name}`, import.meta.url), "utf8");

describe("sniffCsv", () => {
  it("finds BOM, delimiter, metadata lines, header, phases, unit and quality column", () => {
    const s = sniffCsv(fixture("historian-3phase-kA.csv"));
    expect(s).toMatchObject({ bom: true, delimiter: ",", newline: "\r\n", headerLineIndex: 3, decimal: ".", dayMonthAmbiguous: false });
    expect(s.columns).toEqual(["Timestamp", "IA [kA]", "IB [kA]", "IC [kA]", "Quality", "Column 6"]);
    expect(s.metadataLines[0]).toMatch(/^# Historian export/);
    expect(s.previewRows[0].slice(0, 2)).toEqual(["2024-01-01 00:00:00", "0.3125"]);
    expect(s.suggestions).toEqual({
      timestampColumn: "Timestamp",
      phaseA: "IA [kA]",
      phaseB: "IB [kA]",
      phaseC: "IC [kA]",
      unit: "kA",
      timestampFormat: "iso",
      qualityColumn: "Quality",
    });
  });

  it("semicolons with a decimal comma; day-first settled by a day above 12", () => {
    const s = sniffCsv(fixture("decimal-comma-dmy.csv"), { complete: true });
    expect(s).toMatchObject({ delimiter: ";", decimal: ",", detectedTimestampFormat: "dmy", dayMonthAmbiguous: false });
    expect(s.suggestions).toMatchObject({ timestampColumn: "Datum/Zeit", currentColumn: "Strom L1 (A)", qualityColumn: "Status", timestampFormat: "dmy" });
  });

  it("flags day/month ambiguity so the form asks", () => {
    const s = sniffCsv(fixture("chicago-2024-11-03-local.csv"));
    expect(s.dayMonthAmbiguous).toBe(true);
    expect(s.suggestions.timestampFormat).toBe("auto");
  });

  it("month-first when the second field goes above 12", () => {
    const s = sniffCsv("Time,Amps\n03/09/2024 00:00,1\n03/13/2024 00:00,2\n", { complete: true });
    expect(s).toMatchObject({ detectedTimestampFormat: "mdy", dayMonthAmbiguous: false });
  });

  it("tab-separated epoch seconds with a status column", () => {
    const s = sniffCsv("Time\tAmps\tStatus\n1704067200\t100\tGOOD\n1704067260\t101\tGOOD\n", { complete: true });
    expect(s.delimiter).toBe("tab");
    expect(s.suggestions).toMatchObject({ timestampColumn: "Time", currentColumn: "Amps", qualityColumn: "Status", timestampFormat: "epoch-s" });
  });

  it("reports no header when the first row is data, and binary content", () => {
    expect(sniffCsv(fixture("no-header.csv")).headerLineIndex).toBe(-1);
    expect(sniffCsv("a\u0000b\u0001c").looksBinary).toBe(true);
  });

  it("notices explicit offsets in timestamps", () => {
    expect(sniffCsv("t,I\n2024-01-01T00:00:00Z,1\n2024-01-01T00:01:00Z,1\n", { complete: true }).hasExplicitOffset).toBe(true);
    expect(sniffCsv("t,I\n2024-01-01 00:00,1\n", { complete: true }).hasExplicitOffset).toBe(false);
  });

  it("drops a line cut off at the end of the head", () => {
    const s = sniffCsv("Time,Amps\n2024-01-01 00:00,1\n2024-01-01 00:01,2\n2024-01-01 0");
    expect(s.previewRows).toHaveLength(2);
  });
});

describe("column names", () => {
  it("reads units and phases from headers", () => {
    expect(headerUnit("IA [kA]")).toBe("kA");
    expect(headerUnit("Current (A)")).toBe("A");
    expect(headerUnit("Line current kA")).toBe("kA");
    expect(headerUnit("Amps")).toBeNull();
    expect(["IA", "I_b [A]", "Phase C", "c phase", "L1", "Amps A", "Amps"].map(phaseOfColumn)).toEqual(["A", "B", "C", "C", "A", "A", null]);
  });
});

describe("cell values", () => {
  it("reads decimals in either convention, with thousands separators", () => {
    expect(parseDecimal("123.4", ".")).toBe(123.4);
    expect(parseDecimal("-0.5", ".")).toBe(-0.5);
    expect(parseDecimal("1,234.5", ".")).toBe(1234.5);
    expect(parseDecimal("1 234.5", ".")).toBe(1234.5);
    expect(parseDecimal("1e3", ".")).toBe(1000);
    expect(parseDecimal("12,5", ",")).toBe(12.5);
    expect(parseDecimal("1.234,5", ",")).toBe(1234.5);
    expect(parseDecimal("1.234", ",")).toBe(1234);
    for (const bad of ["", " ", "0x1f", "abc", "12,5", "Infinity", "1.2.3"]) expect(parseDecimal(bad, "."), bad).toBeNaN();
    expect(parseDecimal("12.5", ",")).toBeNaN();
  });

  it("judges OPC-style quality codes and words", () => {
    // OPC quality low byte QQSSSSLL: 0xC0 Good, 0x40 Uncertain, 0x00 Bad.
    // [published: OPC 10000-8, Annex A.3.2.3]
    const good = qualityJudge(undefined);
    expect(good("192")).toBe(true); // 0xC0
    expect(good("0xC0")).toBe(true);
    expect(good("216")).toBe(true); // 0xD8: good, local override
    expect(good("64")).toBe(false); // 0x40 uncertain
    expect(good("0")).toBe(false); // 0x00 bad
    expect(good("GOOD")).toBe(true);
    expect(good("ok")).toBe(true);
    expect(good("BAD")).toBe(false);
    expect(good("")).toBe(true); // no flag
    const listed = qualityJudge("GOOD, OK,192");
    expect(["good", "OK", "192", "193", "BAD"].map(listed)).toEqual([true, true, true, false, false]);
  });
});
