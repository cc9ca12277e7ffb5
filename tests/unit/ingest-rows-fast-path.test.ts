// Property tests for the row reader's own tokenizer (lib/ingest/rows.ts): text without quotes
// is split there, text with quotes by papaparse. On random CSV (preamble, blank and # lines,
// every delimiter and newline, quoted fields holding delimiters, quotes and line breaks), fed
// in random chunks, the reader must hand on exactly the rows, cells and line numbers that
// papaparse alone gives, or fail with the same error.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { IngestError } from "../../lib/ingest/errors";
import { CsvRowReader } from "../../lib/ingest/rows";
import { createIngester } from "../../lib/ingest/ingest";
import type { DelimiterChoice } from "../../shared/ingest-options";

const DELIMITERS = [",", ";", "\t", "|"] as const;
const CHOICE: Record<(typeof DELIMITERS)[number], Exclude<DelimiterChoice, "auto">> = { ",": ",", ";": ";", "\t": "tab", "|": "|" };
const NEWLINES = ["\n", "\r\n", "\r"] as const;

type Read = { rows: { line: number; cells: string[] }[]; error?: string };

function read(chunks: string[], delimiter: DelimiterChoice, fastPath: boolean): Read {
  const rows: Read["rows"] = [];
  const reader = new CsvRowReader(
    delimiter,
    1e9,
    {
      header: (row, line) => rows.push({ line, cells: [...row] }),
      row: (row, line) => rows.push({ line, cells: [...row.cells()] }),
    },
    fastPath,
  );
  try {
    for (const c of chunks) reader.write(c);
    reader.end();
    return { rows };
  } catch (error) {
    if (!(error instanceof IngestError)) throw error;
    return { rows, error: `${error.status} ${error.message}` };
  }
}

/** `text` cut at random places. */
function cut(text: string, cuts: number[]): string[] {
  const at = [...new Set(cuts.map((c) => Math.floor(c * text.length)))].sort((a, b) => a - b);
  const out: string[] = [];
  let from = 0;
  for (const a of at) {
    out.push(text.slice(from, a));
    from = a;
  }
  out.push(text.slice(from));
  return out;
}

// Plain cells: digits, letters, spaces, # and the characters that are a delimiter in another dialect.
const plainCell = fc.stringMatching(/^[0-9A-Za-z .#:,;|\t-]{0,12}$/);
// Quoted cells: the delimiter, quotes (doubled) and line breaks inside.
const quotedCell = fc.stringMatching(/^[0-9a-z ,;|\t"\r\n]{0,10}$/).map((s) => `"${s.replace(/"/g, '""')}"`);

const csvText = (quotes: boolean) =>
  fc
    .record({
      delimiter: fc.constantFrom(...DELIMITERS),
      newline: fc.constantFrom(...NEWLINES),
      preamble: fc.array(fc.stringMatching(/^[#A-Za-z :]{0,30}$/), { maxLength: 3 }),
      width: fc.integer({ min: 2, max: 6 }),
      rows: fc.array(
        fc.oneof(
          { weight: 8, arbitrary: fc.array(quotes ? fc.oneof({ weight: 4, arbitrary: plainCell }, { weight: 1, arbitrary: quotedCell }) : plainCell, { minLength: 1, maxLength: 7 }) },
          { weight: 1, arbitrary: fc.constantFrom([""], ["   "], ["# a comment"]) },
        ),
        { maxLength: 40 },
      ),
      // Past the 64 KB head the reader holds for sniffing, so later chunks are split as they come.
      repeat: fc.oneof(fc.integer({ min: 0, max: 50 }), fc.integer({ min: 3000, max: 5000 })),
      trailingNewline: fc.boolean(),
      bom: fc.boolean(),
      cuts: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { maxLength: 30 }),
    })
    .map((d) => {
      const header = Array.from({ length: d.width }, (_, i) => (i === 0 ? "Timestamp" : `I${i} [A]`)).join(d.delimiter);
      const data = d.rows.map((cells) => cells.join(d.delimiter));
      const bulk = Array.from({ length: d.repeat }, (_, i) => `2024-01-01 00:${String(i % 60).padStart(2, "0")}:00${d.delimiter}${i}.5`);
      const lines = [...d.preamble, header, "2024-01-01 00:00:00" + d.delimiter + "1", ...data.slice(0, 20), ...bulk, ...data.slice(20)];
      const text = (d.bom ? "\ufeff" : "") + lines.join(d.newline) + (d.trailingNewline ? d.newline : "");
      return { text, delimiter: d.delimiter, cuts: d.cuts };
    });

describe("the row reader's tokenizer for text without quotes", () => {
  it("gives papaparse's rows, cells and line numbers on random unquoted CSV in random chunks", () => {
    fc.assert(
      fc.property(csvText(false), ({ text, delimiter, cuts }) => {
        const chunks = cut(text, cuts);
        expect(read(chunks, CHOICE[delimiter], true)).toEqual(read([text], CHOICE[delimiter], false));
        expect(read(chunks, "auto", true)).toEqual(read(chunks, "auto", false));
      }),
      { numRuns: 100 },
    );
  });

  it("gives papaparse's rows when quoted fields (delimiters, quotes, line breaks) come and go between chunks", () => {
    fc.assert(
      fc.property(csvText(true), ({ text, delimiter, cuts }) => {
        const chunks = cut(text, cuts);
        expect(read(chunks, CHOICE[delimiter], true)).toEqual(read(chunks, CHOICE[delimiter], false));
      }),
      { numRuns: 100 },
    );
  });

  it("names the true line of a bad row after quoted line breaks and a preamble (worked example)", () => {
    // Lines: 1 preamble, 2 header, 3–4 one row whose quoted note spans two lines, 5 a good row,
    // 6 a time in 1800 (refused at once, naming its line), 7 a good row.
    const text = ["Exported by the historian", "Timestamp,IA [A],Note", '2024-01-01 00:00:00,10,"two', 'lines"', "2024-01-01 00:01:00,11,ok", "1800-01-01 00:02:00,12,ok", "2024-01-01 00:03:00,13,ok"].join("\n");
    const ingester = createIngester({ timestampColumn: "Timestamp", currentColumn: "IA [A]", timezone: "UTC" });
    ingester.write(text);
    let error: unknown;
    try {
      ingester.end();
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(IngestError);
    expect((error as IngestError).status).toBe(422);
    expect((error as IngestError).examples.map((e) => e.line)).toEqual([6]);
  });

  it("sizing the sample arrays from the file's expected length (right, too short, far too long) changes no sample", () => {
    const lines = ["Timestamp;IA [A];IB [A]"];
    for (let i = 0; i < 6000; i++) lines.push(`2024-03-${String(1 + Math.floor(i / 1440)).padStart(2, "0")} ${String(Math.floor((i % 1440) / 60)).padStart(2, "0")}:${String(i % 60).padStart(2, "0")}:00;${(100 + (i % 37)).toFixed(1)};${i % 11 === 0 ? "" : (90 + (i % 13)).toFixed(1)}`);
    const text = lines.join("\n");
    const options = { timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", timezone: "UTC" };
    const read = (expectedBytes?: number) => {
      const ingester = createIngester(options, { expectedBytes });
      for (let i = 0; i < text.length; i += 4096) ingester.write(text.slice(i, i + 4096));
      const { series, quality } = ingester.end();
      return { t: Array.from(series.t), a: Array.from(series.phases.A!), b: Array.from(series.phases.B!), quality };
    };
    const plain = read();
    expect(plain.t.length).toBe(6000);
    for (const expected of [text.length, 1000, text.length * 50]) expect(read(expected)).toEqual(plain);
  });
});
