import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { createIngester, ingestCsvStream, ingestCsvText, IngestError, type IngestResult } from "../../lib/ingest/ingest";
import { ingestOptionsSchema } from "../../shared/ingest-options";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/csv/${name}`, import.meta.url), "utf8");
const iso = (t: number) => new Date(t * 1000).toISOString();
const amps = (r: IngestResult, phase: "A" | "B" | "C" = "A") => Array.from(r.series.phases[phase]!);

function ingestError(run: () => unknown): IngestError {
  try {
    run();
  } catch (e) {
    if (e instanceof IngestError) return e;
    throw e;
  }
  throw new Error("expected an IngestError");
}

describe("ingest options schema", () => {
  it("fills defaults and coerces query-string numbers", () => {
    const o = ingestOptionsSchema.parse({ timestampColumn: "Time", currentColumn: "Amps", plausibilityCapA: "2500", unit: "" });
    expect(o).toMatchObject({ unit: "A", timezone: "UTC", timestampFormat: "auto", decimal: ".", delimiter: "auto", plausibilityCapA: 2500 });
    expect(ingestOptionsSchema.parse({ timestampColumn: "T", phaseA: "IA" }).plausibilityCapA).toBe(100_000);
  });

  it("names what is wrong", () => {
    const messages = (input: unknown) => {
      const r = ingestOptionsSchema.safeParse(input);
      return r.success ? [] : r.error.issues.map((i) => i.message);
    };
    expect(messages({ timestampColumn: "Time" })).toContain("Map a current column, or one column per phase (A, B, C).");
    expect(messages({ timestampColumn: "Time", currentColumn: "I", phaseA: "IA" })).toContain(
      "Map either one current column or one column per phase, not both.",
    );
    expect(messages({ timestampColumn: "Time", currentColumn: "I", timezone: "Mars/Olympus" })[0]).toMatch(/IANA time zone/);
    expect(messages({ timestampColumn: "Time", currentColumn: "I", delimiter: "tab" })).toEqual([]);
    expect(messages({ timestampColumn: "Time", currentColumn: "I", plausibilityCapA: "-5" })[0]).toMatch(/above zero/);
    expect(messages({ timestampColumn: "Time", currentColumn: "Time" })[0]).toMatch(/mapped twice/);
  });
});

describe("historian export with metadata, BOM, CRLF, quotes, kA and OPC quality", () => {
  const text = fixture("historian-3phase-kA.csv");
  const options = { timestampColumn: "Timestamp", phaseA: "IA [kA]", phaseB: "IB [kA]", phaseC: "IC [kA]", qualityColumn: "Quality" };

  it("reads all three phases in amperes and skips metadata, blank lines and the trailing delimiter", () => {
    const r = ingestCsvText(text, options);
    expect(r.phases).toEqual(["A", "B", "C"]);
    expect(r.detected.headerLineIndex).toBe(3);
    expect(r.quality.rowsRead).toBe(8);
    // OPC quality: 0xC0 Good, 0x40 Uncertain, 0x00 Bad; good = top two bits of the low
    // byte set. [published: OPC 10000-8, Annex A.3.2.3]
    // Rows with 64 (uncertain) and 0 (bad) are dropped; 0xC0 and 216 (0xD8) are good.
    expect(r.quality.invalid).toEqual({ "bad-quality": 2 });
    expect(r.series.t.length).toBe(6);
    expect(amps(r, "A")[0]).toBeCloseTo(312.5, 3);
    expect(amps(r, "B")[2]).toBeNaN(); // missing IB at 00:30
    expect(r.quality.perPhase?.B?.invalid).toMatchObject({ missing: 1, negative: 1 });
    expect(amps(r, "B")[4]).toBeNaN(); // -0.0010 kA is negative
    expect(r.start).toBe("2024-01-01T00:00:00.000Z");
    expect(r.end).toBe("2024-01-01T01:45:00.000Z");
  });

  it("the header's [kA] wins over a unit option of A, with a warning", () => {
    const r = ingestCsvText(text, { ...options, unit: "A" });
    expect(r.detected.unitFactor).toEqual({ A: 1000, B: 1000, C: 1000 });
    expect(r.warnings.some((w) => w.includes("kA by its header"))).toBe(true);
  });

  it("a custom good-quality list replaces the OPC rule", () => {
    const r = ingestCsvText(text, { ...options, goodQuality: "192, 64" });
    expect(r.quality.invalid).toEqual({ "bad-quality": 3 }); // 0, 0xC0 and 216 are not listed
  });

  it("gives the same result however the text is chunked", () => {
    const whole = ingestCsvText(text, options);
    for (const size of [1, 2, 3, 7, 64]) {
      const ingester = createIngester(options);
      for (let i = 0; i < text.length; i += size) ingester.write(text.slice(i, i + size));
      const r = ingester.end();
      expect(Array.from(r.series.t)).toEqual(Array.from(whole.series.t));
      expect(amps(r, "C")).toEqual(amps(whole, "C"));
    }
  });

  it("streams from an async iterable", async () => {
    async function* chunks() {
      for (let i = 0; i < text.length; i += 100) yield text.slice(i, i + 100);
    }
    const r = await ingestCsvStream(chunks(), options);
    expect(r.series.t.length).toBe(6);
  });
});

describe("dialects", () => {
  it("decimal comma with thousands dots, semicolons and day-first dates", () => {
    const r = ingestCsvText(fixture("decimal-comma-dmy.csv"), {
      timestampColumn: "Datum/Zeit",
      currentColumn: "Strom L1 (A)",
      decimal: ",",
      qualityColumn: "Status",
    });
    expect(r.detected).toMatchObject({ delimiter: ";", timestampFormat: "dmy" });
    expect(amps(r)).toEqual([1234.5, 987.25, 1001, 12]);
    expect(iso(r.series.t[0])).toBe("2024-03-13T00:00:00.000Z");
    expect(r.quality.invalid).toEqual({ "not-a-number": 1, missing: 1 });
  });

  it("thousands separators with a decimal point, quoted", () => {
    const r = ingestCsvText('Time,Amps\n2024-01-01 00:00,"1,234.5"\n2024-01-01 00:15,"2,000"\n2024-01-01 00:30,12.5\n', {
      timestampColumn: "Time",
      currentColumn: "Amps",
    });
    expect(amps(r)).toEqual([1234.5, 2000, 12.5]);
  });

  it("tab and pipe delimiters, chosen or detected", () => {
    const tab = "Time\tAmps\n2024-01-01 00:00\t10\n2024-01-01 00:15\t11\n";
    expect(amps(ingestCsvText(tab, { timestampColumn: "Time", currentColumn: "Amps" }))).toEqual([10, 11]);
    expect(amps(ingestCsvText(tab, { timestampColumn: "Time", currentColumn: "Amps", delimiter: "tab" }))).toEqual([10, 11]);
    const pipe = "Time|Amps\n2024-01-01 00:00|10\n2024-01-01 00:15|11\n";
    expect(amps(ingestCsvText(pipe, { timestampColumn: "Time", currentColumn: "Amps", delimiter: "|" }))).toEqual([10, 11]);
  });

  it("kA by option converts to amperes", () => {
    const r = ingestCsvText("Time,Load\n1704067200,0.25\n1704067260,1.5\n", { timestampColumn: "Time", currentColumn: "Load", unit: "kA" });
    expect(amps(r)).toEqual([250, 1500]);
    expect(r.detected.timestampFormat).toBe("epoch-s");
  });

  it("epoch milliseconds and serial days", () => {
    const ms = ingestCsvText("t,I\n1704067200000,5\n1704067500000,6\n", { timestampColumn: "t", currentColumn: "I" });
    expect(iso(ms.series.t[1])).toBe("2024-01-01T00:05:00.000Z");
    const serial = ingestCsvText("t,I\n45292,5\n45292.25,6\n", { timestampColumn: "t", currentColumn: "I", timestampFormat: "serial-days" });
    expect(iso(serial.series.t[1])).toBe("2024-01-01T06:00:00.000Z");
  });
});

describe("daylight-saving days in America/Chicago", () => {
  // US daylight saving 2024: 3 November has 25 hours (100 rows at 15 min).
  // [published: Energy Policy Act of 2005, §110]
  const options = { timestampColumn: "Time", currentColumn: "Amps", timezone: "America/Chicago" };

  it("3 November 2024 written in local time: 100 distinct samples over 25 hours", () => {
    const r = ingestCsvText(fixture("chicago-2024-11-03-local.csv"), { ...options, timestampFormat: "mdy" });
    expect(r.series.t.length).toBe(100);
    expect(r.quality.duplicates).toBe(0);
    expect(r.quality.outOfOrder).toBe(0);
    expect((r.series.t[99] - r.series.t[0] + 900) / 3600).toBe(25);
    expect(r.quality.gaps.count).toBe(0);
  });

  it("when every date fits both orders, auto asks instead of guessing", () => {
    const e = ingestError(() => ingestCsvText(fixture("chicago-2024-11-03-local.csv"), options));
    expect(e.status).toBe(400);
    expect(e.title).toBe("Day and month order is ambiguous");
    expect(e.detail).toMatch(/"dmy" or "mdy"/);
    expect(e.examples[0]).toMatchObject({ line: 2, text: "11/03/2024 00:00,200" });
  });

  it("auto settles day/month order from a later date in the file", () => {
    const rows = ["Time,Amps"];
    for (let d = 1; d <= 14; d++) rows.push(`${String(d).padStart(2, "0")}/03/2024 12:00,${d}`);
    const r = ingestCsvText(rows.join("\n"), { timestampColumn: "Time", currentColumn: "Amps" });
    expect(r.detected.timestampFormat).toBe("dmy");
    expect(r.series.t.length).toBe(14);
    expect(iso(r.series.t[1])).toBe("2024-03-02T12:00:00.000Z");
  });

  it("10 March 2024: times in the skipped hour are invalid with their reason", () => {
    const rows = ["Time,Amps"];
    for (let h = 0; h < 24; h++) for (const m of ["00", "15", "30", "45"]) rows.push(`2024-03-10 ${String(h).padStart(2, "0")}:${m},100`);
    const r = ingestCsvText(rows.join("\n"), options);
    expect(r.series.t.length).toBe(92);
    expect(r.quality.invalid).toEqual({ "nonexistent-local-time": 4 });
    expect((r.series.t[91] - r.series.t[0] + 900) / 3600).toBe(23);
  });
});

describe("invalid samples, duplicates and order", () => {
  it("drops and counts missing, non-numeric, negative and implausible values", () => {
    const text = "Time,I\n2024-01-01 00:00,1\n2024-01-01 00:01,\n2024-01-01 00:02,abc\n2024-01-01 00:03,-2\n2024-01-01 00:04,5000\n2024-01-01 00:05,3\n";
    const r = ingestCsvText(text, { timestampColumn: "Time", currentColumn: "I", plausibilityCapA: 4000 });
    expect(amps(r)).toEqual([1, 3]);
    expect(r.quality.invalid).toEqual({ missing: 1, "not-a-number": 1, negative: 1, "above-cap": 1 });
    expect(r.quality.rowsRead).toBe(6);
  });

  it("keeps the first of duplicate timestamps and sorts unsorted input, counting both", () => {
    const text = "Time,I\n2024-01-01 00:10,3\n2024-01-01 00:00,1\n2024-01-01 00:05,2\n2024-01-01 00:05,99\n";
    const r = ingestCsvText(text, { timestampColumn: "Time", currentColumn: "I" });
    expect(amps(r)).toEqual([1, 2, 3]);
    expect(r.quality.duplicates).toBe(1);
    expect(r.quality.outOfOrder).toBe(1);
    expect(r.quality.rowsRead).toBe(r.quality.validSamples + r.quality.duplicates);
  });

  it("keeps a timestamp when at least one phase is valid; the others are NaN", () => {
    const text = "T,A,B,C\n2024-01-01 00:00,1,,3\n2024-01-01 00:01,,,\n2024-01-01 00:02,x,-1,y\n";
    const r = ingestCsvText(text, { timestampColumn: "T", phaseA: "A", phaseB: "B", phaseC: "C" });
    expect(r.series.t.length).toBe(1);
    expect(amps(r, "B")[0]).toBeNaN();
    expect(r.quality.invalid).toEqual({ missing: 1, "not-a-number": 1 });
  });

  it("a single current column is phase A", () => {
    const r = ingestCsvText("Time,I\n2024-01-01 00:00,1\n", { timestampColumn: "Time", currentColumn: "I" });
    expect(r.phases).toEqual(["A"]);
    expect(r.quality.perPhase).toBeUndefined();
  });
});

describe("bad input gives a status and names the problem", () => {
  const options = { timestampColumn: "Time", currentColumn: "Amps" };

  it("empty file → 422 naming it", () => {
    for (const text of ["", "  \n\n"]) {
      const e = ingestError(() => ingestCsvText(text, options));
      expect(e.status).toBe(422);
      expect(e.title).toBe("Empty file");
    }
  });

  it("a PDF → 422 saying it is a PDF, not CSV", () => {
    const e = ingestError(() => ingestCsvText("%PDF-1.4\n%\u00e2\u00e3\n1 0 obj\n<< /Type /Catalog >>\n", options));
    expect(e).toMatchObject({ status: 422, title: "Not a CSV file" });
    expect(e.detail).toContain("a PDF document");
  });

  it("no header → 400", () => {
    const e = ingestError(() => ingestCsvText(fixture("no-header.csv"), options));
    expect(e).toMatchObject({ status: 400, title: "No header row" });
    expect(e.examples[0]).toMatchObject({ line: 1, text: "2024-01-01 00:00:00,100" });
  });

  it("header but no data → 400", () => {
    expect(ingestError(() => ingestCsvText("Time,Amps\n", options))).toMatchObject({ status: 400, title: "No data rows" });
  });

  it("a mapped column that does not exist → 422 listing the columns found", () => {
    const e = ingestError(() => ingestCsvText("Time,IA,IB\n2024-01-01 00:00,1,2\n", options));
    expect(e.status).toBe(422);
    expect(e.detail).toBe('Column "Amps" is not in the header. Columns found: Time, IA, IB');
  });

  it("binary bytes → 415", () => {
    const bytes = new Uint8Array(2000).map((_, i) => (i * 37) % 256);
    const e = ingestError(() => ingestCsvText(new TextDecoder().decode(bytes), options));
    expect(e.status).toBe(415);
    const nul = ingestError(() => ingestCsvText("Time,Amps\n2024-01-01 00:00,1\u0000\n", options));
    expect(nul.status).toBe(415);
  });

  it("more than half the rows unreadable → 400 with example rows and their line numbers", () => {
    const e = ingestError(() => ingestCsvText(fixture("mostly-unreadable.csv"), options));
    expect(e.status).toBe(400);
    expect(e.detail).toMatch(/^7 of 10 data rows could not be read/);
    expect(e.examples).toHaveLength(7);
    expect(e.examples[0]).toEqual({ line: 5, text: "sometime,103", problem: "timestamp not readable" });
    expect(e.examples[6].line).toBe(11);
  });

  it("line numbers count metadata, blank lines and quoted line breaks", () => {
    const text = '# meta\n\nTime,Amps,Note\n2024-01-01 00:00,1,"two\nlines"\nnever,2,x\nnot yet,3,y\n';
    const e = ingestError(() => ingestCsvText(text, options));
    expect(e.examples.map((x) => x.line)).toEqual([6, 7]);
    expect(e.examples[0]).toEqual({ line: 6, text: "never,2,x", problem: "timestamp not readable" });
  });

  it("over the size limit → 413 with the limit", () => {
    const ingester = createIngester(options, { maxBytes: 1024 });
    const e = ingestError(() => {
      for (let i = 0; i < 100; i++) ingester.write("2024-01-01 00:00,1\n");
    });
    expect(e.status).toBe(413);
    expect(e.detail).toBe("The file is larger than the limit of 1 KB.");
    expect(() => ingester.end()).toThrow(IngestError);
  });
});
