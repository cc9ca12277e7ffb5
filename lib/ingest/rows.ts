// Row reading for the streaming ingest: counts the bytes against the limit, holds the head of
// the file until it can be sniffed (delimiter, newline, preamble), then parses chunk by chunk
// with papaparse's low-level parser, keeping the true line number of every row (quoted fields
// may span lines) and skipping the preamble, blank lines and # comments.
import Papa from "papaparse";
import { formatBytes } from "../../shared/format";
import { delimiterCharacter, type DelimiterChoice } from "../../shared/ingest-options";
import { IngestError } from "./errors";
import { isBlank } from "./numbers";
import { looksBinary, nonCsvKind, sniffCsv, SNIFF_BYTES, type CsvSniff } from "./sniff";

/** Where the rows go: the header once, then every data row with its 1-based line number. */
export interface RowSink {
  header(row: string[], line: number): void;
  row(row: string[], line: number): void;
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
  private carry = "";
  private rowsToSkip = 0; // preamble rows before the header
  private line = 1; // 1-based line of the next row

  constructor(
    private readonly delimiterChoice: DelimiterChoice,
    private readonly maxBytes: number,
    private readonly sink: RowSink,
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
    this.feed(head, false);
  }

  /** Parse `text` (the carried partial row plus new text) and hand on its complete rows. */
  private feed(text: string, last: boolean) {
    const input = this.carry + text;
    const result = this.parser.parse(input, 0, !last);
    const rows = result.data as string[][];
    this.carry = last ? "" : input.slice(result.meta.cursor as number);
    const quoted = input.indexOf('"') !== -1;
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r];
      const rowLine = this.line;
      // A quoted field may span lines; count them so line numbers stay true.
      this.line += 1;
      if (quoted) for (const f of row) if (f.length && (f.includes("\n") || f.includes("\r"))) this.line += f.split(/\r\n|\n|\r/).length - 1;
      if (this.rowsToSkip > 0) {
        this.rowsToSkip--;
        continue;
      }
      if (row.length === 1 && isBlank(row[0])) continue;
      if (row[0].charCodeAt(0) === 35 /* # */ && /^\s*#/.test(row[0])) continue;
      if (!this.headerSeen) {
        this.headerSeen = true;
        this.sink.header(row, rowLine);
        continue;
      }
      this.sink.row(row, rowLine);
    }
  }
}
