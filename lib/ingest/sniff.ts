// Looks at the head of a CSV (the first ~64 KB) and suggests how to read it. Runs in the
// browser on the upload page and on the server before streaming: no Node APIs.
import Papa from "papaparse";
import type { DecimalSeparator, DelimiterChoice, TimestampFormat, CurrentUnit } from "../../shared/ingest-options";
import { delimiterCharacter } from "../../shared/ingest-options";
import type { Phase } from "../series";
import { isBlank, parseDecimal } from "./numbers";
import { detectTimestampFormat, type ConcreteTimestampFormat } from "./timestamps";

export const SNIFF_BYTES = 64 * 1024;
const PREVIEW_ROWS = 10;
const DETECTION_ROWS = 500;

export type Newline = "\n" | "\r\n" | "\r";

export interface CsvSuggestions {
  timestampColumn?: string;
  currentColumn?: string;
  phaseA?: string;
  phaseB?: string;
  phaseC?: string;
  unit: CurrentUnit;
  timestampFormat: TimestampFormat;
  qualityColumn?: string;
}

export interface CsvSniff {
  bom: boolean;
  /** NUL bytes or many control/replacement characters: not a text file. */
  looksBinary: boolean;
  delimiter: Exclude<DelimiterChoice, "auto">;
  newline: Newline;
  /** 0-based row index of the header; rows before it are metadata or comments. −1: no header found. */
  headerLineIndex: number;
  /** Metadata lines before the header, as text. */
  metadataLines: string[];
  columns: string[];
  previewRows: string[][];
  decimal: DecimalSeparator;
  /** Concrete format detected from the timestamp column's values (null when none). */
  detectedTimestampFormat: ConcreteTimestampFormat | null;
  /** The dates seen fit both d/m/y and m/d/y: the user must choose. */
  dayMonthAmbiguous: boolean;
  /** Timestamps carry their own offset (Z, +02:00), which wins over the chosen zone. */
  hasExplicitOffset: boolean;
  suggestions: CsvSuggestions;
}

const DELIMITER_CANDIDATES: Exclude<DelimiterChoice, "auto">[] = [",", ";", "tab", "|"];

/** True when text has NUL characters or more than 1 % control/replacement characters. */
export function looksBinary(text: string): boolean {
  if (text.indexOf("\u0000") !== -1) return true;
  const sample = text.length > SNIFF_BYTES ? text.slice(0, SNIFF_BYTES) : text;
  const odd = sample.match(/[\u0001-\u0008\u000e-\u001f\u007f\ufffd]/g)?.length ?? 0;
  return sample.length > 0 && odd / sample.length > 0.01;
}

export function detectNewline(text: string): Newline {
  const n = text.indexOf("\n");
  const r = text.indexOf("\r");
  if (r !== -1 && (n === -1 || r < n)) return text[r + 1] === "\n" ? "\r\n" : "\r";
  return "\n";
}

/** Column names as the ingester and the form both use them: trimmed, blanks named by position. */
export function columnNames(headerRow: readonly string[]): string[] {
  return headerRow.map((name, i) => name.replace(/^\uFEFF/, "").trim() || `Column ${i + 1}`);
}

/** Unit written in a column header: "IA [kA]", "Current (kA)", "IA kA". */
export function headerUnit(name: string): CurrentUnit | null {
  const m = /(?:[[(]\s*(k?A)\s*[\])]|\s(k?A)\s*$)/i.exec(name);
  if (!m) return null;
  const unit = (m[1] ?? m[2]).toLowerCase();
  return unit === "ka" ? "kA" : unit === "a" ? "A" : null;
}

const isComment = (row: readonly string[]) => row.length > 0 && /^\s*#/.test(row[0]);
const isBlankRow = (row: readonly string[]) => row.every((f) => f.trim() === "");

export function parseRows(text: string, delimiter: string, newline: Newline): string[][] {
  const parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' });
  return parser.parse(text, 0, false).data as string[][];
}

/**
 * Words historians write where a reading is missing ("NaN", "null", "#N/A"): a value, not a
 * column name, so a first data row that holds one is still data, not the header.
 */
const MISSING_VALUE = /^\s*(nan|null|none|n\/?a|#n\/a|#value!|-{1,2}|\?)\s*$/i;
export const isMissingValueWord = (cell: string) => MISSING_VALUE.test(cell);

const isNumberCell = (f: string) =>
  !isBlank(f) && (parseDecimal(f, ".") === parseDecimal(f, ".") || parseDecimal(f, ",") === parseDecimal(f, ","));

/** A row that reads as data: one field is a timestamp and another a number (or a missing-value word). */
function looksLikeData(row: readonly string[]): boolean {
  let timestamp = -1;
  for (let i = 0; i < row.length; i++) {
    const d = detectTimestampFormat([row[i]]);
    if (d.format && d.format !== "serial-days" && d.format !== "epoch-s" && d.format !== "epoch-ms") {
      timestamp = i;
      break;
    }
  }
  if (timestamp === -1) {
    // Numeric time formats: a row of numbers only, with a time-sized first number.
    const numeric = row.filter((f) => !isBlank(f) && (parseDecimal(f, ".") === parseDecimal(f, ".") || parseDecimal(f, ",") === parseDecimal(f, ",")));
    return numeric.length >= 2 && numeric.length === row.filter((f) => !isBlank(f)).length && detectTimestampFormat([numeric[0]]).format !== null;
  }
  return row.some((f, i) => i !== timestamp && (isNumberCell(f) || isMissingValueWord(f)));
}

/** A cell that could be a column name: not blank, not a number, not a timestamp. */
function isName(cell: string): boolean {
  if (isBlank(cell) || isMissingValueWord(cell)) return false;
  if (parseDecimal(cell, ".") === parseDecimal(cell, ".") || parseDecimal(cell, ",") === parseDecimal(cell, ",")) return false;
  return detectTimestampFormat([cell]).format === null;
}

interface DelimiterScore {
  delimiter: Exclude<DelimiterChoice, "auto">;
  rows: string[][];
  score: number;
  width: number;
}

function scoreDelimiter(text: string, delimiter: Exclude<DelimiterChoice, "auto">, newline: Newline): DelimiterScore {
  const rows = parseRows(text, delimiterCharacter(delimiter), newline);
  const counts = new Map<number, number>();
  for (const row of rows) {
    if (isBlankRow(row) || isComment(row)) continue;
    counts.set(row.length, (counts.get(row.length) ?? 0) + 1);
  }
  let width = 1;
  let best = 0;
  for (const [w, c] of counts) if (w > 1 && (c > best || (c === best && w > width))) [width, best] = [w, c];
  // Rows that read as data decide first: with decimal commas, splitting "t;12,5;13,1" at
  // commas is as regular as splitting it at semicolons, but only the latter yields a time.
  let dataRows = 0;
  let seen = 0;
  for (const row of rows) {
    if (seen >= 50) break;
    if (isBlankRow(row) || isComment(row)) continue;
    seen++;
    if (row.length > 1 && looksLikeData(row)) dataRows++;
  }
  return { delimiter, rows, score: dataRows * 1e6 + best, width };
}

export function sniffCsv(head: string, options: { complete?: boolean } = {}): CsvSniff {
  const bom = head.charCodeAt(0) === 0xfeff;
  let text = bom ? head.slice(1) : head;
  const newline = detectNewline(text);
  if (!options.complete && !text.endsWith("\n") && !text.endsWith("\r")) {
    // The head was cut mid-line: drop the partial last line.
    const cut = text.lastIndexOf(newline);
    if (cut > 0) text = text.slice(0, cut);
  }
  const empty: CsvSniff = {
    bom,
    looksBinary: looksBinary(text),
    delimiter: ",",
    newline,
    headerLineIndex: -1,
    metadataLines: [],
    columns: [],
    previewRows: [],
    decimal: ".",
    detectedTimestampFormat: null,
    dayMonthAmbiguous: false,
    hasExplicitOffset: false,
    suggestions: { unit: "A", timestampFormat: "auto" },
  };
  if (empty.looksBinary || text.trim() === "") return empty;

  const scores = DELIMITER_CANDIDATES.map((d) => scoreDelimiter(text, d, newline));
  const chosen = scores.reduce((a, b) => (b.score > a.score ? b : a));
  const rows = chosen.rows;

  // The header is the last non-blank row before the first row that reads as data, so
  // metadata lines (even padded with delimiters) are skipped.
  let firstData = -1;
  for (let i = 0; i < rows.length; i++) {
    if (isBlankRow(rows[i]) || isComment(rows[i])) continue;
    if (looksLikeData(rows[i])) {
      firstData = i;
      break;
    }
  }
  let headerLineIndex = -1;
  if (firstData === -1) {
    // No data in the head: take the first row of the modal width as the header.
    headerLineIndex = rows.findIndex((r) => r.length === chosen.width && !isBlankRow(r) && !isComment(r));
  } else {
    for (let i = firstData - 1; i >= 0; i--) {
      if (isBlankRow(rows[i]) || isComment(rows[i])) continue;
      if (rows[i].length >= 2) headerLineIndex = i;
      break;
    }
  }
  // A header names its columns: a row of numbers and dates is data, not a header.
  if (headerLineIndex !== -1 && !rows[headerLineIndex].some(isName)) headerLineIndex = -1;
  const sniff: CsvSniff = { ...empty, delimiter: chosen.delimiter };
  if (headerLineIndex === -1) {
    sniff.previewRows = rows.filter((r) => !isBlankRow(r) && !isComment(r)).slice(0, PREVIEW_ROWS);
    return sniff;
  }
  sniff.headerLineIndex = headerLineIndex;
  sniff.metadataLines = rows.slice(0, headerLineIndex).map((r) => r.join(delimiterCharacter(chosen.delimiter)));
  const columns = columnNames(rows[headerLineIndex]);
  sniff.columns = columns;
  const dataRows = rows.slice(headerLineIndex + 1).filter((r) => !isBlankRow(r) && !isComment(r));
  sniff.previewRows = dataRows.slice(0, PREVIEW_ROWS);
  const sample = dataRows.slice(0, DETECTION_ROWS);
  const columnValues = (i: number) => sample.map((r) => r[i] ?? "");

  // Timestamp column: parses as dates; named like one wins ties; date-like formats beat numbers.
  const timeName = /time|date|stamp|zeit|datum|fecha|hora|heure/i;
  let best: { index: number; rank: number; detection: ReturnType<typeof detectTimestampFormat> } | null = null;
  columns.forEach((name, i) => {
    const detection = detectTimestampFormat(columnValues(i));
    if (!detection.format || detection.parsedShare < 0.8) return;
    const numericFormat = detection.format.startsWith("epoch") || detection.format === "serial-days";
    const rank = (timeName.test(name) ? 2 : 0) + (numericFormat ? 0 : 1);
    if (!best || rank > best.rank) best = { index: i, rank, detection };
  });
  const timestamp = best as { index: number; detection: ReturnType<typeof detectTimestampFormat> } | null;
  if (timestamp) {
    sniff.suggestions.timestampColumn = columns[timestamp.index];
    sniff.detectedTimestampFormat = timestamp.detection.format;
    sniff.dayMonthAmbiguous = timestamp.detection.dayMonthAmbiguous;
    sniff.suggestions.timestampFormat = timestamp.detection.dayMonthAmbiguous ? "auto" : (timestamp.detection.format ?? "auto");
    sniff.hasExplicitOffset = columnValues(timestamp.index).some((v) => /\d(?:\s*(?:Z|UTC|GMT)|[+-]\d{2}:?\d{2})\s*$/i.test(v.trim()));
  }

  // Decimal separator: a comma delimiter rules out decimal commas in unquoted cells.
  const otherColumns = columns.map((_, i) => i).filter((i) => i !== timestamp?.index);
  let commaDecimals = 0;
  let pointDecimals = 0;
  for (const i of otherColumns) {
    for (const v of columnValues(i)) {
      const t = v.trim();
      if (/^[+-]?(\d{1,3}(\.\d{3})+|\d+),\d+$/.test(t)) commaDecimals++;
      else if (/^[+-]?\d+\.\d+$/.test(t) && !/^[+-]?\d{1,3}\.\d{3}$/.test(t)) pointDecimals++;
    }
  }
  sniff.decimal = commaDecimals > pointDecimals ? "," : ".";

  // Quality, then current columns among the numeric ones.
  const qualityName = /qual|status|flag|^q$/i;
  const qualityIndex = otherColumns.find((i) => qualityName.test(columns[i]));
  if (qualityIndex !== undefined) sniff.suggestions.qualityColumn = columns[qualityIndex];
  const numericColumns = otherColumns.filter((i) => {
    if (i === qualityIndex) return false;
    const values = columnValues(i).filter((v) => !isBlank(v));
    if (values.length === 0) return false;
    const ok = values.filter((v) => parseDecimal(v, sniff.decimal) === parseDecimal(v, sniff.decimal)).length;
    return ok / values.length >= 0.8;
  });
  const named = phaseColumns(numericColumns.map((i) => columns[i]));
  const byPhase = new Map<Phase, number>(Object.entries(named).map(([phase, k]) => [phase as Phase, numericColumns[k]]));
  let currentColumns: number[];
  if (byPhase.size >= 2) {
    currentColumns = [...byPhase.values()];
    if (byPhase.has("A")) sniff.suggestions.phaseA = columns[byPhase.get("A")!];
    if (byPhase.has("B")) sniff.suggestions.phaseB = columns[byPhase.get("B")!];
    if (byPhase.has("C")) sniff.suggestions.phaseC = columns[byPhase.get("C")!];
  } else {
    const namedCurrent = numericColumns.find((i) => /amp|current|strom|corriente|load|^i\b|^i[\s_[(]/i.test(columns[i]));
    const pick = namedCurrent ?? numericColumns.find((i) => phaseOfColumn(columns[i]) !== null) ?? numericColumns[0];
    currentColumns = pick === undefined ? [] : [pick];
    if (pick !== undefined) sniff.suggestions.currentColumn = columns[pick];
  }
  sniff.suggestions.unit = currentColumns.some((i) => headerUnit(columns[i]) === "kA") ? "kA" : "A";
  return sniff;
}

// Phase column names (docs/computation.md "Phase columns"): a phase designator — a letter of
// A/B/C, R/S/T or R/Y/B, or a number 1–3 after L, Ph, Phase or Line — with an optional
// I/Amps/Current prefix or suffix; units in brackets are ignored ("I_L1 [A]", "IR", "Ph2 Amps").
const SEP = String.raw`[\s_.\-/:]`;
const WORD = String.raw`(?:amps?|current|curr|phase|ph|line)`;
const PREFIX = String.raw`(?:(?:i|${WORD})${SEP}+|i)`;
const SUFFIX = String.raw`(?:${SEP}+(?:i|a|${WORD})|${SEP}*(?:amps?|current))`;
const LETTER_NAME = new RegExp(String.raw`^${PREFIX}?([abcrsty])${SUFFIX}?$`, "i");
const NUMBER_NAME = new RegExp(String.raw`^${PREFIX}?(?:l|ph|phase|line|p)${SEP}*([123])${SUFFIX}?$`, "i");
const ONLY_NUMBER_NAME = new RegExp(String.raw`^(?:i|${WORD})${SEP}*([123])${SUFFIX}?$`, "i");

type Designator = { kind: "letter"; letter: string } | { kind: "number"; n: 1 | 2 | 3 };

function designatorOf(name: string): Designator | null {
  const bare = name.replace(/[[(][^\])]*[\])]/g, "").trim();
  const number = NUMBER_NAME.exec(bare) ?? ONLY_NUMBER_NAME.exec(bare);
  if (number) return { kind: "number", n: Number(number[1]) as 1 | 2 | 3 };
  const letter = LETTER_NAME.exec(bare);
  return letter ? { kind: "letter", letter: letter[1].toLowerCase() } : null;
}

/** The letter schemes in use, first match wins: R/Y/B needs its Y, R/S/T its S or T. */
const SCHEMES: { name: string; letters: string; fits: (seen: Set<string>) => boolean }[] = [
  { name: "R/Y/B", letters: "ryb", fits: (seen) => seen.has("y") && (seen.has("r") || seen.has("b")) },
  { name: "R/S/T", letters: "rst", fits: (seen) => (seen.has("s") || seen.has("t")) && [..."rst"].filter((l) => seen.has(l)).length >= 2 },
  { name: "A/B/C", letters: "abc", fits: () => true },
];

/**
 * The columns holding phases A, B and C, from their names (index into `names`); empty when
 * fewer than two phases are named. Numbered names (L1/L2/L3) win over letters.
 */
export function phaseColumns(names: readonly string[]): Partial<Record<Phase, number>> {
  const found = names.map(designatorOf);
  const byNumber: Partial<Record<Phase, number>> = {};
  found.forEach((d, i) => {
    if (d?.kind !== "number") return;
    const phase = (["A", "B", "C"] as const)[d.n - 1];
    if (byNumber[phase] === undefined) byNumber[phase] = i;
  });
  if (Object.keys(byNumber).length >= 2) return byNumber;
  const seen = new Set(found.flatMap((d) => (d?.kind === "letter" ? [d.letter] : [])));
  const scheme = SCHEMES.find((x) => x.fits(seen))!;
  const byLetter: Partial<Record<Phase, number>> = {};
  found.forEach((d, i) => {
    if (d?.kind !== "letter") return;
    const k = scheme.letters.indexOf(d.letter);
    if (k === -1) return;
    const phase = (["A", "B", "C"] as const)[k];
    if (byLetter[phase] === undefined) byLetter[phase] = i;
  });
  return Object.keys(byLetter).length >= 2 ? byLetter : {};
}

/** Phase named in one column header, read as A/B/C or a number: "IA", "I_b [A]", "Phase C", "I_L1". */
export function phaseOfColumn(name: string): Phase | null {
  const d = designatorOf(name);
  if (!d) return null;
  if (d.kind === "number") return (["A", "B", "C"] as const)[d.n - 1];
  const k = "abc".indexOf(d.letter);
  return k === -1 ? null : (["A", "B", "C"] as const)[k];
}

/** A file that is plainly not CSV text, by its first bytes (decoded as UTF-8): what it is, or null. */
export function nonCsvKind(head: string): string | null {
  const start = head.replace(/^\uFEFF/, "").slice(0, 64);
  if (/^%PDF-/.test(start)) return "a PDF document";
  if (/^PK\u0003\u0004/.test(start)) return "a ZIP archive (an .xlsx or .docx file is one)";
  if (/^\ufffd\ufffd\u0011\ufffd/.test(start)) return "an Office document (.xls or .doc)";
  if (/^\u001f\ufffd/.test(start)) return "a gzip archive";
  if (/^\ufffdPNG/.test(start) || /^\ufffd\ufffd\ufffd/.test(start) || /^GIF8/.test(start)) return "an image";
  if (/^\s*<(?:!doctype html|html)/i.test(start)) return "a web page (HTML)";
  if (/^\s*<\?xml/i.test(start)) return "an XML document";
  if (/^\{\\rtf/.test(start)) return "an RTF document";
  return null;
}
