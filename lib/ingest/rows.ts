// Row reading for the streaming ingest: counts the bytes against the limit, holds the head of
// the file until it can be sniffed (delimiter, newline, preamble), then parses chunk by chunk,
// keeping the true line number of every row (quoted fields may span lines) and skipping the
// preamble, blank lines and # comments.
//
// Why a tokenizer of our own beside papaparse (issue 9; docs/performance.md, "Fourth round"):
// papaparse builds an array of strings for every row, and for a year of minutes those 2.6
// million short strings and their garbage cost about as much as the rest of the upload. A chunk
// without a quote character is split here instead, by the rule papaparse applies to such text
// (split at the newline, then at the delimiter), into field bounds over the chunk: cells are
// read straight from the text (times, numbers, flags), with no string per cell. A chunk holding
// a quote goes through papaparse as before. The maintained alternative looked at, udsv, also
// slices a string per cell and an array per row, and gives no line numbers for messages.
import Papa from "papaparse";
import { formatBytes } from "../../shared/format";
import { delimiterCharacter, type DelimiterChoice } from "../../shared/ingest-options";
import { IngestError } from "./errors";
import { isBlank } from "./numbers";
import { looksBinary, nonCsvKind, sniffCsv, SNIFF_BYTES, type CsvSniff } from "./sniff";

/**
 * The cells of one data row, each as a span of a string: `text(i)` from `from(i)` to `to(i)`
 * (exclusive). A row split by the fast path spans the chunk's text; a row from papaparse spans
 * its own cell strings. Valid only during the sink's `row` call: keep `cells()` to hold it.
 */
export interface CsvRow {
  readonly length: number;
  text(i: number): string;
  from(i: number): number;
  to(i: number): number;
  /** Cell `i` as a string (undefined past the row's end). */
  cell(i: number): string | undefined;
  /** A copy of the cells, for rows that are held or quoted in messages. */
  cells(): string[];
}

/** A row parsed into strings (papaparse, or held rows released later). */
export class ArrayRow implements CsvRow {
  length = 0;
  private values: string[] = [];

  set(values: string[]): this {
    this.values = values;
    this.length = values.length;
    return this;
  }
  text(i: number): string {
    return this.values[i];
  }
  from(): number {
    return 0;
  }
  to(i: number): number {
    return this.values[i].length;
  }
  cell(i: number): string | undefined {
    return this.values[i];
  }
  cells(): string[] {
    return this.values;
  }
}

/** A row of an unquoted chunk: field bounds over the chunk's text, reused row after row. */
class SpanRow implements CsvRow {
  length = 0;
  source = "";
  /** Field i spans starts[i] … starts[i + 1] − 1 (the delimiter, or the line's end, follows it). */
  starts: Int32Array<ArrayBuffer> = new Int32Array(64);

  text(): string {
    return this.source;
  }
  from(i: number): number {
    return this.starts[i];
  }
  to(i: number): number {
    return this.starts[i + 1] - 1;
  }
  cell(i: number): string | undefined {
    return i < this.length ? this.source.slice(this.starts[i], this.starts[i + 1] - 1) : undefined;
  }
  cells(): string[] {
    const out: string[] = new Array(this.length);
    for (let i = 0; i < this.length; i++) out[i] = this.source.slice(this.starts[i], this.starts[i + 1] - 1);
    return out;
  }
}

/** Where the rows go: the header once, then every data row with its 1-based line number. */
export interface RowSink {
  header(row: string[], line: number): void;
  row(row: CsvRow, line: number): void;
}

function utf8Length(text: string): number {
  // ASCII is by far the usual case: one byte per character.
  // eslint-disable-next-line no-control-regex
  if (!/[^\u0000-\u007f]/.test(text)) return text.length;
  let bytes = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x80) bytes += 1;
    else if (c < 0x800) bytes += 2;
    else if (c >= 0xd800 && c <= 0xdbff) {
      bytes += 4;
      i++;
    } else bytes += 3;
  }
  return bytes;
}

export class CsvRowReader {
  bytesRead = 0;
  headerSeen = false;
  /** Set once the head is sniffed. */
  sniff!: CsvSniff;
  delimiter = ",";
  private headChunks: string[] = [];
  private headLength = 0;
  private started = false;
  private parser!: Papa.Parser;
  private newline = "\n";
  private readonly spanRow = new SpanRow();
  private readonly arrayRow = new ArrayRow();
  private carry = "";
  private rowsToSkip = 0; // preamble rows before the header
  private line = 1; // 1-based line of the next row

  /**
   * `unquotedFastPath`: split text without quotes here (the default); false sends all text
   * through papaparse, which the property tests compare the fast path against.
   */
  constructor(
    private readonly delimiterChoice: DelimiterChoice,
    private readonly maxBytes: number,
    private readonly sink: RowSink,
    private readonly unquotedFastPath = true,
  ) {}

  /** A row as the file wrote it, for examples in messages. */
  rowText(row: string[]): string {
    return row.join(this.delimiter);
  }

  write(chunk: string, utf8Bytes?: number): void {
    this.bytesRead += utf8Bytes ?? utf8Length(chunk);
    if (this.bytesRead > this.maxBytes) throw new IngestError(413, "File too large", `The file is larger than the limit of ${formatBytes(this.maxBytes)}.`);
    if (!this.started) {
      this.headChunks.push(chunk);
      this.headLength += chunk.length;
      if (this.headLength >= SNIFF_BYTES) this.start(false);
      return;
    }
    if (chunk.indexOf("\u0000") !== -1) throw new IngestError(415, "Not a text file", "The file holds binary data (NUL bytes) after its first lines.");
    this.feed(chunk, false);
  }

  /** The end of the file: parse what is left. */
  end(): void {
    if (!this.started) this.start(true);
    this.feed("", true);
    if (!this.headerSeen) throw new IngestError(400, "No header row", "The file has no header row naming its columns.");
  }

  private start(complete: boolean) {
    this.started = true;
    let head = this.headChunks.join("");
    this.headChunks.length = 0;
    const kind = nonCsvKind(head);
    if (kind) throw new IngestError(422, "Not a CSV file", `The file is ${kind}, not CSV text. Export the current history as CSV (comma- or semicolon-separated text).`);
    if (looksBinary(head)) throw new IngestError(415, "Not a text file", "The file holds binary data (NUL or control bytes). Export the history as CSV text.");
    if (head.charCodeAt(0) === 0xfeff) head = head.slice(1);
    if (head.trim() === "" && complete) throw new IngestError(422, "Empty file", "The file has no content (0 bytes or only blank lines): choose the exported CSV file.");
    const sniff = (this.sniff = sniffCsv(head, { complete }));
    this.delimiter = delimiterCharacter(this.delimiterChoice === "auto" ? sniff.delimiter : this.delimiterChoice);
    if (sniff.headerLineIndex === -1) {
      const lines = head.split(/\r\n|\n|\r/);
      const first = lines.find((l) => l.trim() !== "") ?? "";
      throw new IngestError(400, "No header row", "The file has no header row naming its columns. The first row must name the columns, e.g. Timestamp,IA [A].", [
        { line: 1 + lines.findIndex((l) => l.trim() !== ""), text: first.slice(0, 200), problem: "data where the header should be" },
      ]);
    }
    this.rowsToSkip = sniff.headerLineIndex;
    this.parser = new Papa.Parser({ delimiter: this.delimiter, newline: sniff.newline, quoteChar: '"' });
    // The newline papaparse would use (it takes \n for anything else); the fast path splits on the same.
    this.newline = sniff.newline === "\r\n" || sniff.newline === "\r" ? sniff.newline : "\n";
    this.feed(head, false);
  }

  /** Parse `text` (the carried partial row plus new text) and hand on its complete rows. */
  private feed(text: string, last: boolean) {
    const carry = this.carry;
    if (!this.unquotedFastPath || text.indexOf('"') !== -1 || carry.indexOf('"') !== -1) return this.feedQuoted(carry + text, last);
    // The carried partial line is finished on its own, so that the chunk itself is scanned as it
    // came: a concatenation is read through one more indirection per character.
    const end = carry === "" ? -1 : text.indexOf(this.newline);
    if (end === -1) {
      this.carry = this.feedUnquoted(carry + text, 0, last);
      return;
    }
    const rest = end + this.newline.length;
    this.feedUnquoted(carry + text.slice(0, rest), 0, false);
    this.carry = this.feedUnquoted(text, rest, last);
  }

  /** Text with quotes: papaparse, then its rows one by one. */
  private feedQuoted(input: string, last: boolean) {
    const result = this.parser.parse(input, 0, !last);
    const rows = result.data as string[][];
    this.carry = last ? "" : input.slice(result.meta.cursor as number);
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r];
      const rowLine = this.line;
      // A quoted field may span lines; count them so line numbers stay true.
      this.line += 1;
      for (const f of row) if (f.length && (f.includes("\n") || f.includes("\r"))) this.line += f.split(/\r\n|\n|\r/).length - 1;
      if (this.rowsToSkip > 0) {
        this.rowsToSkip--;
        continue;
      }
      if (row.length === 1 && isBlank(row[0])) continue;
      if (row[0].charCodeAt(0) === 35 /* # */) continue;
      if (!this.headerSeen) {
        this.headerSeen = true;
        this.sink.header(row, rowLine);
        continue;
      }
      this.sink.row(this.arrayRow.set(row), rowLine);
    }
  }

  /**
   * Text without quotes, from `start`: each line split at the delimiter into field bounds, as
   * papaparse splits such text, but with no string per cell. Returns the partial last line
   * (nothing when `last`: the last line is then complete).
   */
  private feedUnquoted(input: string, start: number, last: boolean): string {
    const { newline, delimiter, spanRow: row } = this;
    const n = input.length;
    row.source = input;
    let pos = start;
    // The next delimiter at or after `pos` (n: none left), kept across lines so that lines
    // without a delimiter do not each search to the end of the text.
    let next = -1;
    while (pos < n) {
      let eol = input.indexOf(newline, pos);
      if (eol === -1) {
        if (!last) break;
        eol = n;
      }
      const rowLine = this.line++;
      if (this.rowsToSkip > 0) this.rowsToSkip--;
      else if (input.charCodeAt(pos) !== 35 /* # */) {
        // Field bounds: starts[i] is where field i begins; one past the line's end closes the last.
        // indexOf finds the delimiters faster than a loop over the characters.
        let starts = row.starts;
        let fields = 0;
        starts[0] = pos;
        if (next < pos) next = nextIndex(input, delimiter, pos);
        while (next < eol) {
          if (++fields + 1 >= starts.length) starts = row.starts = grow(starts);
          starts[fields] = next + 1;
          next = nextIndex(input, delimiter, next + 1);
        }
        row.length = ++fields;
        starts[fields] = eol + 1;
        if (fields > 1 || !isBlank(input.slice(pos, eol))) {
          if (!this.headerSeen) {
            this.headerSeen = true;
            this.sink.header(row.cells(), rowLine);
          } else this.sink.row(row, rowLine);
        }
      }
      pos = eol + newline.length;
    }
    return pos < n ? input.slice(pos) : "";
  }
}

/** Where `search` next occurs in `text` from `from`, or the text's length when it does not. */
function nextIndex(text: string, search: string, from: number): number {
  const i = text.indexOf(search, from);
  return i === -1 ? text.length : i;
}

function grow(starts: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> {
  const bigger = new Int32Array(starts.length * 2);
  bigger.set(starts);
  return bigger;
}
