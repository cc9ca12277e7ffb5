// Reading current values and quality flags from CSV cells. Browser-safe.
import type { DecimalSeparator } from "../../shared/ingest-options";

/** Thousands groups after a decimal point: 1,234.5 · 1 234.5 · 1'234.5 */
const GROUPED_POINT = /^[+-]?\d{1,3}(?:[, '\u00a0\u202f]\d{3})+(?:\.\d*)?$/;
/** Thousands groups before a decimal comma: 1.234,5 · 1 234,5 */
const GROUPED_COMMA = /^[+-]?\d{1,3}(?:[. '\u00a0\u202f]\d{3})+(?:,\d*)?$/;
const PLAIN_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const THOUSANDS = /[., '\u00a0\u202f]/g;

/**
 * A decimal number in the file's convention, or NaN. Empty cells are NaN too; callers
 * tell "missing" from "not a number" by checking for blank text first.
 * With a decimal comma, "1.234" is one thousand two hundred and thirty-four.
 */
export function parseDecimal(text: string, decimal: DecimalSeparator): number {
  const quick = parseSimpleDecimal(text, 0, text.length, decimal === "." ? 46 : 44);
  if (quick === quick) return quick;
  return parseGeneralDecimal(text, decimal);
}

/** `parseDecimal` of `text.slice(from, to)`, reading the usual cell straight from the text. */
export function parseDecimalAt(text: string, from: number, to: number, decimal: DecimalSeparator): number {
  const quick = parseSimpleDecimal(text, from, to, decimal === "." ? 46 : 44);
  if (quick === quick) return quick;
  return parseGeneralDecimal(text.slice(from, to), decimal);
}

function parseGeneralDecimal(text: string, decimal: DecimalSeparator): number {
  if (decimal === ".") {
    const n = +text;
    if (n === n && n !== Infinity && n !== -Infinity) {
      // Number() also reads "" and blanks as 0, and accepts "0x1f", "0b1", "0o7": none is a reading.
      if (n === 0 && text.trim() === "") return NaN;
      const c1 = text.charCodeAt(1) | 32;
      const c2 = text.charCodeAt(2) | 32;
      if ((c1 === 120 || c1 === 98 || c1 === 111 || c2 === 120 || c2 === 98 || c2 === 111) && /[xbo]/i.test(text)) {
        return NaN;
      }
      return n;
    }
    const t = text.trim();
    if (GROUPED_POINT.test(t)) return Number(t.replace(/[, '\u00a0\u202f]/g, ""));
    return NaN;
  }
  const t = text.trim();
  if (t === "") return NaN;
  if (PLAIN_COMMA.test(t)) return Number(t.replace(",", "."));
  if (GROUPED_COMMA.test(t)) {
    const comma = t.lastIndexOf(",");
    const whole = (comma === -1 ? t : t.slice(0, comma)).replace(THOUSANDS, "");
    return Number(comma === -1 ? whole : `${whole}.${t.slice(comma + 1)}`);
  }
  return NaN;
}

const POWERS_OF_TEN = Array.from({ length: 16 }, (_, k) => 10 ** k);

/**
 * Fast path for the usual cell (`text` from `from` to `to`), "123" or "-123.4": digits with at most one separator and
 * at most 15 significant digits. N / 10^k with both exact is correctly rounded, so this
 * equals Number(text). NaN for anything else (the caller then takes the general path).
 */
function parseSimpleDecimal(text: string, from: number, to: number, separator: number): number {
  if (to === from || to - from > 17) return NaN;
  let i = from;
  let sign = 1;
  let c = text.charCodeAt(from);
  if (c === 45) {
    sign = -1;
    i++;
  }
  let value = 0;
  let digits = 0;
  let scale = -1;
  for (; i < to; i++) {
    c = text.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      value = value * 10 + (c - 48);
      digits++;
    } else if (c === separator && scale === -1) scale = i;
    else return NaN;
  }
  if (digits === 0 || digits > 15) return NaN;
  const decimals = scale === -1 ? 0 : to - 1 - scale;
  return (sign * value) / POWERS_OF_TEN[decimals];
}

/** `isBlank` of `text.slice(from, to)`, without the slice for the usual cell. */
export function isBlankAt(text: string, from: number, to: number): boolean {
  if (from >= to) return true;
  const first = text.charCodeAt(from);
  const last = text.charCodeAt(to - 1);
  if (first > 32 && first < 127 && last > 32 && last < 127) return false;
  return text.slice(from, to).trim() === "";
}

export function isBlank(text: string | undefined): boolean {
  if (text === undefined || text.length === 0) return true;
  // Usual cell: printable ASCII at both ends, so not blank; spares trim() on every cell.
  const first = text.charCodeAt(0);
  const last = text.charCodeAt(text.length - 1);
  if (first > 32 && first < 127 && last > 32 && last < 127) return false;
  return text.trim() === "";
}

/**
 * Decides whether a quality-flag cell means good.
 * With an explicit list ("GOOD,OK,192"): the cell must equal one entry (case-insensitive).
 * Without: a numeric OPC-style code is good when the top two bits of its low byte are 11
 * (0xC0…0xFF; OPC 10000-8 Annex A.3.2.3: 0xC0 Good, 0x40 Uncertain, 0x00 Bad), and the
 * words GOOD and OK are good. An empty cell carries no flag and counts as good.
 */
export function qualityJudge(goodQuality: string | undefined): (cell: string) => boolean {
  if (goodQuality !== undefined && goodQuality.trim() !== "") {
    const good = new Set(
      goodQuality
        .split(",")
        .map((v) => v.trim().toUpperCase())
        .filter((v) => v !== ""),
    );
    return memoise((cell) => {
      const v = cell.trim().toUpperCase();
      return v === "" || good.has(v);
    });
  }
  return memoise((cell) => {
    const v = cell.trim();
    if (v === "") return true;
    const code = /^0x[0-9a-f]+$/i.test(v) ? parseInt(v.slice(2), 16) : /^\d+$/.test(v) ? Number(v) : NaN;
    if (code === code) return (code & 0xc0) === 0xc0;
    const word = v.toUpperCase();
    return word === "GOOD" || word === "OK";
  });
}

/** Quality columns repeat a handful of values: remember the verdicts (bounded). */
function memoise(judge: (cell: string) => boolean): (cell: string) => boolean {
  const seen = new Map<string, boolean>();
  let lastCell = "";
  let lastVerdict = true;
  return (cell) => {
    if (cell === lastCell) return lastVerdict;
    let verdict = seen.get(cell);
    if (verdict === undefined) {
      verdict = judge(cell);
      if (seen.size < 1024) seen.set(cell, verdict);
    }
    lastCell = cell;
    lastVerdict = verdict;
    return verdict;
  };
}
