// Streaming CSV ingest of SCADA/historian current history (issue 3, docs/computation.md "Samples").
// Text arrives in chunks and goes through papaparse's low-level parser chunk by chunk;
// samples land in growing typed arrays, so the file is never held as one string and no
// row objects are kept. Pure: no Node APIs, no I/O.
import { formatBytes } from "../../shared/format";
import Papa from "papaparse";
import {
  delimiterCharacter,
  ingestOptionsSchema,
  type DecimalSeparator,
  type DelimiterChoice,
  type IngestOptions,
  type IngestOptionsInput,
} from "../../shared/ingest-options";
import type { Phase, ProfileSeries } from "../series";
import { isBlank, parseDecimal, qualityJudge } from "./numbers";
import { buildQualityReport, type InvalidReason, type QualityOptions, type QualityReport } from "./quality";
import { columnNames, headerUnit, looksBinary, nonCsvKind, sniffCsv, SNIFF_BYTES, type CsvSniff, type Newline } from "./sniff";
import { outOfRangeText, spanProblem } from "./time-range";
import { dayMonthEvidence, detectTimestampFormat, TimestampParser, type ConcreteTimestampFormat } from "./timestamps";
import { ampsPerUnit, describePowerConversion, isPowerUnit, type PowerConversion } from "./power-units";
import { createTemperatureAccumulator, TEMPERATURE_RANGE_C, type RecordedTemperatures } from "./temperatures";

export const DEFAULT_MAX_BYTES = 500 * 1024 * 1024;
const MAX_EXAMPLES = 10;
/** Rows held while the day/month order is still open (auto format, ambiguous head). */
const MAX_UNDECIDED_ROWS = 50_000;
const INITIAL_CAPACITY = 1 << 14;
/** Rows of a column the sniffer did not pick, used to detect its format. */
const DETECTION_ROWS = 200;

export interface IngestLimits {
  /** Largest accepted input, in bytes of UTF-8; default 500 MB. */
  maxBytes?: number;
  /** Passed on to the quality report (maxGap etc.). */
  quality?: QualityOptions;
}

export interface IngestExample {
  /** 1-based line number in the file. */
  line: number;
  text: string;
  problem: string;
}

export type IngestErrorStatus = 400 | 413 | 415 | 422;

/** A problem with the file as a whole; maps onto an RFC 9457 problem+json response. */
export class IngestError extends Error {
  readonly status: IngestErrorStatus;
  readonly title: string;
  readonly detail: string;
  readonly examples: IngestExample[];
  /** The request field the problem is in ("samples.3.0", "csv"), when the caller knows it. */
  path?: string;

  constructor(status: IngestErrorStatus, title: string, detail: string, examples: IngestExample[] = [], path?: string) {
    super(`${title}: ${detail}`);
    this.name = "IngestError";
    this.status = status;
    this.title = title;
    this.detail = detail;
    this.examples = examples;
    this.path = path;
  }
}

export interface IngestResult {
  series: ProfileSeries;
  quality: QualityReport;
  phases: Phase[];
  /** ISO time of the first and last kept sample. */
  start: string;
  end: string;
  /** How the file was read, after detection. */
  detected: {
    delimiter: Exclude<DelimiterChoice, "auto">;
    decimal: DecimalSeparator;
    timestampFormat: ConcreteTimestampFormat;
    headerLineIndex: number;
    columns: string[];
    /** Unit factor applied per phase (1 for A, 1000 for kA, amperes per MW/MVA/kW/kVA for power). */
    unitFactor: Partial<Record<Phase, number>>;
    /** How power was converted to current, in words (power units only). */
    conversion: string | null;
  };
  /** Monthly means of the temperature column, when one is mapped and holds readings. */
  temperature: RecordedTemperatures | null;
  /** Things the user should know that did not stop the ingest. */
  warnings: string[];
}

export interface Ingester {
  /**
   * Next text chunk in file order. `utf8Bytes`: the chunk's size in UTF-8 bytes when the
   * caller knows it (it decoded a byte stream), which spares counting it here.
   */
  write(chunk: string, utf8Bytes?: number): void;
  end(): IngestResult;
  /** UTF-8 bytes received so far. */
  readonly bytesRead: number;
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

const PROBLEM_TEXT: Record<InvalidReason, string> = {
  missing: "no current value",
  "not-a-number": "current is not a number",
  negative: "current is negative",
  "above-cap": "current is above the plausibility cap",
  "bad-quality": "quality flag is not good",
  "missing-timestamp": "no timestamp",
  "bad-timestamp": "timestamp not readable",
  "nonexistent-local-time": "local time does not exist (skipped by the daylight-saving change)",
};

interface MappedChannel {
  phase: Phase;
  column: string;
  index: number;
  factor: number;
  /** Power column: the current is the magnitude, |P| or √(P² + Q²), times the factor. */
  power: boolean;
  /** Column of reactive power (power with a reactive column), else −1. */
  reactiveIndex: number;
}

/**
 * A streaming ingester: `write` text chunks in file order, then `end`. Both throw
 * `IngestError` for problems with the file as a whole.
 */
export function createIngester(optionsInput: IngestOptionsInput | IngestOptions, limits: IngestLimits = {}): Ingester {
  const options: IngestOptions = ingestOptionsSchema.parse(optionsInput);
  const maxBytes = limits.maxBytes ?? DEFAULT_MAX_BYTES;
  const power = powerConversionOf(options);

  let bytesRead = 0;
  let failure: IngestError | null = null;
  let finished = false;
  const headChunks: string[] = [];
  let headLength = 0;

  // Set up once the head has been sniffed.
  let started = false;
  let sniff: CsvSniff;
  let delimiter: string;
  let newline: Newline;
  let parser: Papa.Parser;
  let carry = "";
  let rowsToSkip = 0; // metadata rows before the header
  let headerSeen = false;
  let headerLine = 0;
  let line = 1; // 1-based line of the next row
  let columns: string[] = [];
  let timestampIndex = -1;
  let qualityIndex = -1;
  let temperatureIndex = -1;
  let temperatures: ReturnType<typeof createTemperatureAccumulator> | null = null;
  let channels: MappedChannel[] = [];
  let conversion: string | null = null;
  let isGoodQuality: (cell: string) => boolean = () => true;
  let timestamps: TimestampParser | null = null;
  let timestampFormat: ConcreteTimestampFormat = "iso";
  /** Rows held while the timestamp format is open (auto, and a column the sniffer did not pick or d/m vs m/d). */
  const undecided: { row: string[]; line: number }[] = [];
  let pending: "format" | "day-month" | null = null;
  let dayFirstSeen = 0;
  let monthFirstSeen = 0;
  const warnings: string[] = [];
  const cap = options.plausibilityCapA;
  const decimal = options.decimal;

  // Samples in growing typed arrays.
  let capacity = INITIAL_CAPACITY;
  let count = 0;
  let times = new Float64Array(capacity);
  let amps: Float32Array[] = [];

  // Counters.
  let rowsRead = 0;
  let unreadable = 0;
  let outOfOrder = 0;
  let previousTime = -Infinity;
  let sameTimeAsPrevious = false; // a duplicate next to its twin
  const invalid: Partial<Record<InvalidReason, number>> = {};
  const perPhaseInvalid: Partial<Record<Phase, Partial<Record<InvalidReason, number>>>> = {};
  const unreadableExamples: IngestExample[] = [];
  const invalidExamples: IngestExample[] = [];

  const fail = (error: IngestError): never => {
    failure = error;
    throw error;
  };
  const rowText = (row: string[]) => row.join(delimiter);

  function start(complete: boolean) {
    started = true;
    let head = headChunks.join("");
    headChunks.length = 0;
    const kind = nonCsvKind(head);
    if (kind) fail(new IngestError(422, "Not a CSV file", `The file is ${kind}, not CSV text. Export the current history as CSV (comma- or semicolon-separated text).`));
    if (looksBinary(head)) {
      fail(
        new IngestError(415, "Not a text file", "The file holds binary data (NUL or control bytes). Export the history as CSV text."),
      );
    }
    if (head.charCodeAt(0) === 0xfeff) head = head.slice(1);
    if (head.trim() === "" && complete) fail(new IngestError(422, "Empty file", "The file has no content (0 bytes or only blank lines): choose the exported CSV file."));
    sniff = sniffCsv(head, { complete });
    delimiter = delimiterCharacter(options.delimiter === "auto" ? sniff.delimiter : options.delimiter);
    newline = sniff.newline;
    if (sniff.headerLineIndex === -1) {
      const first = head.split(/\r\n|\n|\r/).find((l) => l.trim() !== "") ?? "";
      fail(
        new IngestError(
          400,
          "No header row",
          "The file has no header row naming its columns. The first row must name the columns, e.g. Timestamp,IA [A].",
          [{ line: 1 + head.split(/\r\n|\n|\r/).findIndex((l) => l.trim() !== ""), text: first.slice(0, 200), problem: "data where the header should be" }],
        ),
      );
    }
    rowsToSkip = sniff.headerLineIndex;
    parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' });
    feed(head, false);
  }

  function resolveHeader(row: string[]) {
    headerSeen = true;
    columns = columnNames(row);
    const find = (name: string): number => {
      let i = columns.indexOf(name);
      if (i === -1) i = columns.findIndex((c) => c.toLowerCase() === name.trim().toLowerCase());
      if (i === -1) {
        fail(
          new IngestError(422, "Mapped column not found", `Column "${name}" is not in the header. Columns found: ${columns.join(", ")}`, [
            { line: headerLine, text: rowText(row).slice(0, 500), problem: `no column "${name}"` },
          ]),
        );
      }
      return i;
    };
    timestampIndex = find(options.timestampColumn);
    const mapping: [Phase, string | undefined][] = options.currentColumn
      ? [["A", options.currentColumn]]
      : [
          ["A", options.phaseA],
          ["B", options.phaseB],
          ["C", options.phaseC],
        ];
    channels = [];
    for (const [phase, column] of mapping) {
      if (column === undefined) continue;
      const index = find(column);
      if (power) {
        const reactiveIndex = options.reactiveColumn !== undefined ? find(options.reactiveColumn) : -1;
        channels.push({ phase, column: columns[index], index, factor: ampsPerUnit(power), power: true, reactiveIndex });
        conversion = describePowerConversion(power, columns[index], reactiveIndex >= 0 ? columns[reactiveIndex] : undefined);
        continue;
      }
      const written = headerUnit(columns[index]);
      const unit = written ?? options.unit;
      if (written && written !== options.unit) {
        warnings.push(`Column "${columns[index]}" is in ${written} by its header; read as ${written} although the unit option says ${options.unit}.`);
      }
      channels.push({ phase, column: columns[index], index, factor: unit === "kA" ? 1000 : 1, power: false, reactiveIndex: -1 });
    }
    amps = channels.map(() => new Float32Array(capacity));
    if (options.temperatureColumn !== undefined) {
      temperatureIndex = find(options.temperatureColumn);
      temperatures = createTemperatureAccumulator(columns[temperatureIndex], options.temperatureUnit, decimal);
    }
    if (options.qualityColumn !== undefined) {
      qualityIndex = find(options.qualityColumn);
      isGoodQuality = qualityJudge(options.goodQuality);
    }
    chooseTimestampFormat();
  }

  function chooseTimestampFormat() {
    if (options.timestampFormat !== "auto") return useFormat(options.timestampFormat);
    if (sniff.suggestions.timestampColumn === columns[timestampIndex] && sniff.detectedTimestampFormat) {
      if (sniff.dayMonthAmbiguous) pending = "day-month"; // settled by a later date, or asked
      else useFormat(sniff.detectedTimestampFormat);
      return;
    }
    // The user mapped another column than the one sniffed: detect from its first rows.
    pending = "format";
  }

  function useFormat(format: ConcreteTimestampFormat) {
    timestampFormat = format;
    timestamps = new TimestampParser(format, options.timezone);
    pending = null;
  }

  /** Try to settle the format from the rows held so far; `final` at the end of the file. */
  function settleFormat(final: boolean) {
    if (pending === "format" && (final || undecided.length >= DETECTION_ROWS)) {
      const detection = detectTimestampFormat(undecided.map((h) => h.row[timestampIndex] ?? ""));
      if (!detection.format) {
        fail(
          new IngestError(
            400,
            "Timestamps not recognised",
            `Column "${columns[timestampIndex]}" does not hold timestamps in a known format. Choose the timestamp format explicitly.`,
            undecided.slice(0, MAX_EXAMPLES).map((h) => ({ line: h.line, text: rowText(h.row).slice(0, 500), problem: "timestamp not recognised" })),
          ),
        );
      }
      if (detection.dayMonthAmbiguous) {
        pending = "day-month";
        const e = dayMonthEvidence(undecided.map((h) => h.row[timestampIndex] ?? ""));
        dayFirstSeen = e.dayFirst;
        monthFirstSeen = e.monthFirst;
      } else useFormat(detection.format!);
    }
    if (pending === "day-month") {
      if (dayFirstSeen > 0 && monthFirstSeen === 0) useFormat("dmy");
      else if (monthFirstSeen > 0 && dayFirstSeen === 0) useFormat("mdy");
      else if (final || undecided.length > MAX_UNDECIDED_ROWS || (dayFirstSeen > 0 && monthFirstSeen > 0)) fail(ambiguousError());
      if (timestamps) {
        warnings.push(`Day and month order read as ${timestampFormat === "dmy" ? "day first (d/m/y)" : "month first (m/d/y)"} from the dates in the file.`);
      }
    }
    if (timestamps) {
      const held = undecided.splice(0);
      for (const h of held) processRow(h.row, h.line);
    }
  }

  function grow() {
    capacity *= 2;
    const t = new Float64Array(capacity);
    t.set(times);
    times = t;
    amps = amps.map((a) => {
      const b = new Float32Array(capacity);
      b.set(a);
      return b;
    });
  }

  function countInvalid(reason: InvalidReason, row: string[], rowLine: number, isUnreadable: boolean) {
    invalid[reason] = (invalid[reason] ?? 0) + 1;
    const example = { line: rowLine, text: rowText(row).slice(0, 500), problem: PROBLEM_TEXT[reason] };
    if (isUnreadable) {
      unreadable++;
      if (unreadableExamples.length < MAX_EXAMPLES) unreadableExamples.push(example);
    } else if (invalidExamples.length < MAX_EXAMPLES) invalidExamples.push(example);
  }

  const sampleValues = new Float32Array(3);
  const sampleReasons: (InvalidReason | null)[] = [null, null, null];

  function processRow(row: string[], rowLine: number) {
    if (timestamps === null) {
      undecided.push({ row, line: rowLine });
      if (pending === "day-month") {
        // One date with a field above 12 settles the order.
        const e = dayMonthEvidence([row[timestampIndex] ?? ""]);
        dayFirstSeen += e.dayFirst;
        monthFirstSeen += e.monthFirst;
        if (e.dayFirst + e.monthFirst === 0 && undecided.length <= MAX_UNDECIDED_ROWS) return;
      }
      settleFormat(false);
      return;
    }
    rowsRead++;
    const timeText = row[timestampIndex];
    if (timeText === undefined || isBlank(timeText)) return countInvalid("missing-timestamp", row, rowLine, true);
    const time = timestamps!.parse(timeText);
    if (time !== time) {
      const problem = timestamps!.problem;
      if (problem === "out-of-range-timestamp") fail(outOfRangeError(row, rowLine, timeText));
      else return countInvalid(problem, row, rowLine, problem === "bad-timestamp");
    }

    if (temperatures) {
      const problem = temperatures.add(time, row[temperatureIndex]);
      if (problem) fail(temperatureError(row, rowLine, problem));
    }
    const badQuality = qualityIndex >= 0 && !isGoodQuality(row[qualityIndex] ?? "");
    let validPhases = 0;
    let unreadablePhases = 0;
    for (let k = 0; k < channels.length; k++) {
      const channel = channels[k];
      const cell = row[channel.index];
      let reason: InvalidReason | null = null;
      let value = NaN;
      if (cell === undefined || isBlank(cell)) {
        reason = "missing";
        unreadablePhases++;
      } else {
        value = parseDecimal(cell, decimal);
        // Power: the magnitude |P| or √(P² + Q²) (NaN when the row's Q is missing or unreadable).
        if (channel.power && value === value) value = powerMagnitude(value, channel.reactiveIndex, row, decimal);
        if (value !== value) {
          reason = "not-a-number";
          unreadablePhases++;
        } else {
          value *= channel.factor;
          if (value < 0) reason = "negative";
          else if (value > cap) reason = "above-cap";
          else if (badQuality) reason = "bad-quality";
        }
      }
      sampleReasons[k] = reason;
      if (reason === null) {
        sampleValues[k] = value;
        validPhases++;
      } else sampleValues[k] = NaN;
    }
    // Per-phase tallies (rows with a readable time).
    if (channels.length > 1) {
      for (let k = 0; k < channels.length; k++) {
        const reason = sampleReasons[k];
        if (reason === null) continue;
        const tally = (perPhaseInvalid[channels[k].phase] ??= {});
        tally[reason] = (tally[reason] ?? 0) + 1;
      }
    }
    if (validPhases === 0) {
      const reason = badQuality ? "bad-quality" : sampleReasons[0]!;
      return countInvalid(reason, row, rowLine, !badQuality && unreadablePhases === channels.length);
    }
    if (count === capacity) grow();
    times[count] = time;
    for (let k = 0; k < channels.length; k++) amps[k][count] = sampleValues[k];
    count++;
    if (time <= previousTime) {
      if (time < previousTime) outOfOrder++;
      else sameTimeAsPrevious = true;
    }
    previousTime = time;
  }

  /** Parse `text` (the carried partial row plus new text) and process its complete rows. */
  function feed(text: string, last: boolean) {
    const input = carry + text;
    const result = parser.parse(input, 0, !last);
    const rows = result.data as string[][];
    carry = last ? "" : input.slice(result.meta.cursor as number);
    const quoted = input.indexOf('"') !== -1;
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r];
      const rowLine = line;
      // A quoted field may span lines; count them so line numbers stay true.
      line += 1;
      if (quoted) for (const f of row) if (f.length && (f.includes("\n") || f.includes("\r"))) line += f.split(/\r\n|\n|\r/).length - 1;
      if (rowsToSkip > 0) {
        rowsToSkip--;
        continue;
      }
      if (row.length === 1 && isBlank(row[0])) continue;
      if (row[0].charCodeAt(0) === 35 /* # */ && /^\s*#/.test(row[0])) continue;
      if (!headerSeen) {
        headerLine = rowLine;
        resolveHeader(row);
        continue;
      }
      processRow(row, rowLine);
    }
  }

  /** A time outside the accepted years stops the file: such a history is misread, not merely noisy. */
  function outOfRangeError(row: string[], rowLine: number, timeText: string): IngestError {
    const why = outOfRangeText(timestamps!.lastOutOfRange);
    return new IngestError(
      422,
      "Timestamp out of range",
      `Line ${rowLine}: "${timeText.slice(0, 60)}" read as ${timestampFormat} ${why}. Check the timestamp format.`,
      [{ line: rowLine, text: rowText(row).slice(0, 500), problem: `timestamp ${why}` }],
    );
  }

  function temperatureError(row: string[], rowLine: number, problem: "not-a-number" | "out-of-range"): IngestError {
    const cell = (row[temperatureIndex] ?? "").slice(0, 60);
    const column = columns[temperatureIndex];
    const why =
      problem === "not-a-number"
        ? `"${cell}" in temperature column "${column}" is not a number`
        : `${cell} °${options.temperatureUnit} in temperature column "${column}" is outside ${TEMPERATURE_RANGE_C.min} to ${TEMPERATURE_RANGE_C.max} °C`;
    return new IngestError(422, "Temperature not readable", `Line ${rowLine}: ${why}. Leave a missing reading blank; check the temperature unit (C or F) and the decimal separator.`, [
      { line: rowLine, text: rowText(row).slice(0, 500), problem: problem === "not-a-number" ? "temperature is not a number" : "temperature is not plausible" },
    ]);
  }

  function ambiguousError(): IngestError {
    return new IngestError(
      400,
      "Day and month order is ambiguous",
      `The dates in column "${columns[timestampIndex]}" fit both day-first and month-first order. Choose timestamp format "dmy" or "mdy".`,
      undecided.slice(0, MAX_EXAMPLES).map((h) => ({ line: h.line, text: rowText(h.row).slice(0, 500), problem: "day and month could be either way round" })),
    );
  }

  function write(chunk: string, utf8Bytes?: number) {
    if (failure) throw failure;
    if (finished) throw new Error("Ingester already ended.");
    bytesRead += utf8Bytes ?? utf8Length(chunk);
    if (bytesRead > maxBytes) {
      fail(new IngestError(413, "File too large", `The file is larger than the limit of ${formatBytes(maxBytes)}.`));
    }
    if (!started) {
      headChunks.push(chunk);
      headLength += chunk.length;
      if (headLength >= SNIFF_BYTES) start(false);
      return;
    }
    if (chunk.indexOf("\u0000") !== -1) {
      fail(new IngestError(415, "Not a text file", "The file holds binary data (NUL bytes) after its first lines."));
    }
    feed(chunk, false);
  }

  function end(): IngestResult {
    if (failure) throw failure;
    if (finished) throw new Error("Ingester already ended.");
    if (!started) start(true);
    feed("", true);
    finished = true;
    if (!headerSeen) fail(new IngestError(400, "No header row", "The file has no header row naming its columns."));
    if (timestamps === null && undecided.length > 0) settleFormat(true);
    if (rowsRead === 0) fail(new IngestError(400, "No data rows", "The file has a header but no data rows."));
    if (unreadable > rowsRead / 2) {
      fail(
        new IngestError(
          400,
          "Most rows are unreadable",
          `${unreadable} of ${rowsRead} data rows could not be read (timestamp or current not readable). ` +
            `Check the timestamp format, decimal separator (${decimal === "." ? "point" : "comma"} chosen) and column mapping.`,
          unreadableExamples,
        ),
      );
    }
    const { series, duplicates } = finishSeries();
    const n0 = series.t.length;
    const tooLong = n0 ? spanProblem(series.t[0], series.t[n0 - 1]) : null;
    if (tooLong) {
      const at = (t: number) => new Date(t * 1000).toISOString();
      fail(new IngestError(422, "Period too long", `${tooLong} First sample ${at(series.t[0])}, last ${at(series.t[n0 - 1])}. Split the history into shorter files.`));
    }
    if (series.t.length === 0) {
      fail(
        new IngestError(400, "No valid samples", `None of the ${rowsRead} data rows holds a valid sample.`, [
          ...unreadableExamples,
          ...invalidExamples,
        ].slice(0, MAX_EXAMPLES)),
      );
    }
    if (timestamps!.explicitOffsets > 0 && options.timezone !== "UTC" && timestamps!.explicitOffsets < rowsRead) {
      warnings.push(`${timestamps!.explicitOffsets} timestamps carry their own offset, which wins over the time zone ${options.timezone}.`);
    }
    if (timestamps!.ambiguousLocalTimes > 0) {
      warnings.push(`${timestamps!.ambiguousLocalTimes} local times fell in a repeated daylight-saving hour and were placed by file order.`);
    }
    if (invalid["nonexistent-local-time"]) {
      warnings.push(`${invalid["nonexistent-local-time"]} local times do not exist in ${options.timezone} (skipped spring-forward hour) and were dropped.`);
    }
    const temperature = temperatures?.result() ?? null;
    if (temperatures && !temperature) warnings.push(`Temperature column "${columns[temperatureIndex]}" holds no readings; no recorded temperatures are kept.`);
    const quality = buildQualityReport(series, { rowsRead, invalid, duplicates, outOfOrder, perPhaseInvalid }, limits.quality);
    if (conversion) quality.conversion = conversion;
    const n = series.t.length;
    return {
      series,
      quality,
      phases: channels.map((c) => c.phase),
      start: new Date(series.t[0] * 1000).toISOString(),
      end: new Date(series.t[n - 1] * 1000).toISOString(),
      detected: {
        delimiter: options.delimiter === "auto" ? sniff.delimiter : options.delimiter,
        decimal,
        timestampFormat,
        headerLineIndex: sniff.headerLineIndex,
        columns,
        unitFactor: Object.fromEntries(channels.map((c) => [c.phase, c.factor])),
        conversion,
      },
      temperature,
      warnings,
    };
  }

  /** Sort if needed (stable, so the first of equal times is the first in the file), drop duplicates, trim. */
  function finishSeries(): { series: ProfileSeries; duplicates: number } {
    if (outOfOrder === 0 && !sameTimeAsPrevious) {
      // Already sorted and unique: exact-size copies release the growth capacity.
      const phases: Partial<Record<Phase, Float32Array>> = {};
      channels.forEach((c, k) => (phases[c.phase] = amps[k].slice(0, count)));
      const series = { t: times.slice(0, count), phases };
      times = new Float64Array(0);
      amps = [];
      return { series, duplicates: 0 };
    }
    let order: Uint32Array | null = null;
    if (outOfOrder > 0) {
      order = new Uint32Array(count);
      for (let i = 0; i < count; i++) order[i] = i;
      const t = times;
      order.sort((a, b) => t[a] - t[b] || a - b);
    }
    // Count kept samples first so the output arrays are allocated once, exactly sized.
    let kept = 0;
    let last = NaN;
    for (let j = 0; j < count; j++) {
      const v = times[order ? order[j] : j];
      if (v !== last) kept++;
      last = v;
    }
    const t = new Float64Array(kept);
    const phases: Partial<Record<Phase, Float32Array>> = {};
    const out = channels.map((c) => (phases[c.phase] = new Float32Array(kept)));
    let k = 0;
    last = NaN;
    for (let j = 0; j < count; j++) {
      const i = order ? order[j] : j;
      const v = times[i];
      if (v === last) continue;
      last = v;
      t[k] = v;
      for (let c = 0; c < out.length; c++) out[c][k] = amps[c][i];
      k++;
    }
    // Release the growth buffers.
    times = new Float64Array(0);
    amps = [];
    return { series: { t, phases }, duplicates: count - kept };
  }

  return {
    write: (chunk, utf8Bytes) => write(chunk, utf8Bytes),
    end: () => end(),
    get bytesRead() {
      return bytesRead;
    },
  };
}

/** The power conversion the options ask for, or null for current units; a power unit needs a voltage. */
function powerConversionOf(options: IngestOptions): PowerConversion | null {
  if (!isPowerUnit(options.unit)) return null;
  if (options.voltageKv === undefined) {
    throw new IngestError(
      422,
      "Voltage needed for power",
      `Unit ${options.unit} is power: give voltageKv, the circuit's line-to-line voltage in kV, to convert it to current (I = S / (√3 · V_LL)).`,
    );
  }
  return { unit: options.unit, voltageKv: options.voltageKv, powerFactor: options.powerFactor, withReactive: options.reactiveColumn !== undefined };
}

/** |P|, or √(P² + Q²) with Q read from its column; NaN when Q is missing or unreadable. */
function powerMagnitude(p: number, reactiveIndex: number, row: readonly string[], decimal: DecimalSeparator): number {
  if (reactiveIndex < 0) return Math.abs(p);
  const cell = row[reactiveIndex];
  if (cell === undefined || isBlank(cell)) return NaN;
  return Math.hypot(p, parseDecimal(cell, decimal));
}

const TEXT_SLICE = 1 << 20;

/** Ingest CSV text already in memory (the feasibility API, tests); fed in 1 MB slices. */
export function ingestCsvText(text: string, options: IngestOptionsInput | IngestOptions, limits?: IngestLimits): IngestResult {
  const ingester = createIngester(options, limits);
  for (let i = 0; i < text.length; i += TEXT_SLICE) ingester.write(text.slice(i, i + TEXT_SLICE));
  return ingester.end();
}

/** Ingest text chunks as they arrive, e.g. a request body through a TextDecoderStream. */
export async function ingestCsvStream(
  chunks: AsyncIterable<string>,
  options: IngestOptionsInput | IngestOptions,
  limits?: IngestLimits,
): Promise<IngestResult> {
  const ingester = createIngester(options, limits);
  for await (const chunk of chunks) ingester.write(chunk);
  return ingester.end();
}
