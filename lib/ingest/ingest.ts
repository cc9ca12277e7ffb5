// Streaming CSV ingest of SCADA/historian current history (issue 3, docs/computation.md "Samples").
// Text arrives in chunks and goes through papaparse's low-level parser chunk by chunk;
// samples land in growing typed arrays, so the file is never held as one string and no
// row objects are kept. Pure: no Node APIs, no I/O. The parts, each with its own state:
// row reading (rows.ts), column mapping and unit conversion (channels.ts), timestamp decoding
// (format-settler.ts, timestamps.ts), quality accumulation (QualityTally in quality.ts) and
// storage (sample-buffer.ts); createIngester wires them row by row.
import { ingestOptionsSchema, type DecimalSeparator, type DelimiterChoice, type IngestOptions, type IngestOptionsInput } from "../../shared/ingest-options";
import type { Phase, ProfileSeries } from "../series";
import { ChannelReader, powerConversionOf } from "./channels";
import { IngestError, MAX_EXAMPLES } from "./errors";
import { TimestampFormatSettler, type HeldRow } from "./format-settler";
import { isBlankAt } from "./numbers";
import { buildQualityReport, QualityTally, type QualityOptions, type QualityReport } from "./quality";
import { ArrayRow, CsvRowReader, type CsvRow } from "./rows";
import { SampleBuffer } from "./sample-buffer";
import { createTemperatureAccumulator, TEMPERATURE_RANGE_C, type RecordedTemperatures, type TemperatureProblem } from "./temperatures";
import { outOfRangeText, spanProblem } from "./time-range";
import { zoneResolver, type ConcreteTimestampFormat, type TimestampParser } from "./timestamps";

export { IngestError, type IngestErrorStatus, type IngestExample } from "./errors";

export const DEFAULT_MAX_BYTES = 500 * 1024 * 1024;

export interface IngestLimits {
  /** Largest accepted input, in bytes of UTF-8; default 500 MB. */
  maxBytes?: number;
  /** Passed on to the quality report (maxGap etc.). */
  quality?: QualityOptions;
  /** The circuit's IANA zone: the temperature column's monthly means are of its calendar months (default UTC). */
  monthsTimeZone?: string;
  /**
   * The file's size in bytes when known ahead (a request's Content-Length): once the first rows
   * give the bytes per row, the sample arrays are allocated for the whole file at once instead
   * of doubling (each doubling copies them and leaves garbage for the collector).
   */
  expectedBytes?: number;
}

/** Rows read before the bytes per row are trusted for sizing the sample arrays. */
const SIZING_ROWS = 2000;
/** A bound on the estimate (a 500 MB file of 10-byte rows), so a wild Content-Length cannot ask for gigabytes. */
const MAX_RESERVED_SAMPLES = 50_000_000;

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

/**
 * A streaming ingester: `write` text chunks in file order, then `end`. Both throw
 * `IngestError` for problems with the file as a whole (and again on any later call).
 */
export function createIngester(optionsInput: IngestOptionsInput | IngestOptions, limits: IngestLimits = {}): Ingester {
  const options: IngestOptions = ingestOptionsSchema.parse(optionsInput);
  const power = powerConversionOf(options);
  let failure: IngestError | null = null;
  let finished = false;

  // Set up when the header row arrives.
  let channels: ChannelReader;
  let settler: TimestampFormatSettler;
  let samples: SampleBuffer;
  let temperatures: ReturnType<typeof createTemperatureAccumulator> | null = null;

  const reader = new CsvRowReader(options.delimiter, limits.maxBytes ?? DEFAULT_MAX_BYTES, {
    header(row, line) {
      channels = new ChannelReader(row, options, power, { line, text: reader.rowText(row) });
      samples = new SampleBuffer(channels.channels.map((c) => c.phase));
      if (channels.temperatureIndex >= 0) temperatures = createTemperatureAccumulator(channels.columns[channels.temperatureIndex], options.temperatureUnit, options.decimal, monthOffset(limits.monthsTimeZone));
      settler = new TimestampFormatSettler(options, reader.sniff, channels.columns[channels.timestampIndex], channels.timestampIndex, rowText);
    },
    row(row, line) {
      if (settler.parser !== null) return processRow(row, line, settler.parser);
      const released = settler.hold(row.cells(), line);
      if (released) processHeld(released);
    },
  });
  const rowText = (row: string[]) => reader.rowText(row);
  const tally = new QualityTally(rowText);

  const heldRow = new ArrayRow();
  /** Rows held while the timestamp format settled, in file order. */
  function processHeld(held: readonly HeldRow[]) {
    for (const h of held) processRow(heldRow.set(h.row), h.line, settler.parser!);
  }

  /** One data row once the timestamp format is known: a kept sample or a dropped row. */
  function processRow(row: CsvRow, line: number, timestamps: TimestampParser) {
    tally.rowsRead++;
    const ti = channels.timestampIndex;
    if (ti >= row.length || isBlankAt(row.text(ti), row.from(ti), row.to(ti))) return tally.dropped("missing-timestamp", row.cells(), line, true);
    const time = timestamps.parseAt(row.text(ti), row.from(ti), row.to(ti));
    if (time !== time) {
      const problem = timestamps.problem;
      if (problem === "out-of-range-timestamp") throw outOfRangeError(row.cells(), line, row.cell(ti)!, timestamps);
      return tally.dropped(problem, row.cells(), line, problem === "bad-timestamp");
    }
    if (temperatures) {
      const problem = temperatures.add(time, row.cell(channels.temperatureIndex));
      if (problem) throw temperatureError(row.cells(), line, problem);
    }
    const valid = channels.read(row);
    const mapped = channels.channels;
    if (mapped.length > 1) {
      for (let k = 0; k < mapped.length; k++) {
        const reason = channels.reasons[k];
        if (reason !== null) tally.phaseInvalid(mapped[k].phase, reason);
      }
    }
    if (valid === 0) {
      const badQuality = channels.badQuality;
      return tally.dropped(badQuality ? "bad-quality" : channels.reasons[0]!, row.cells(), line, !badQuality && channels.unreadablePhases === mapped.length);
    }
    samples.push(time, channels.values);
    tally.kept(time);
  }

  /** A time outside the accepted years stops the file: such a history is misread, not merely noisy. */
  function outOfRangeError(row: string[], line: number, timeText: string, timestamps: TimestampParser): IngestError {
    const why = outOfRangeText(timestamps.lastOutOfRange);
    return new IngestError(
      422,
      "Timestamp out of range",
      `Line ${line}: "${timeText.slice(0, 60)}" read as ${settler.format} ${why}. Check the timestamp format.`,
      [{ line, text: rowText(row).slice(0, 500), problem: `timestamp ${why}` }],
    );
  }

  /** A temperature that is not a number or not plausible stops the file: a misread column would change every cold month. */
  function temperatureError(row: string[], line: number, problem: TemperatureProblem): IngestError {
    const cell = (row[channels.temperatureIndex] ?? "").slice(0, 60);
    const column = channels.columns[channels.temperatureIndex];
    const why =
      problem === "not-a-number"
        ? `"${cell}" in temperature column "${column}" is not a number`
        : `${cell} °${options.temperatureUnit} in temperature column "${column}" is outside ${TEMPERATURE_RANGE_C.min} to ${TEMPERATURE_RANGE_C.max} °C`;
    return new IngestError(422, "Temperature not readable", `Line ${line}: ${why}. Leave a missing reading blank; check the temperature unit (C or F) and the decimal separator.`, [
      { line, text: rowText(row).slice(0, 500), problem: problem === "not-a-number" ? "temperature is not a number" : "temperature is not plausible" },
    ]);
  }

  /** Runs a step; an IngestError is kept and thrown again by every later call. */
  function guarded<T>(step: () => T): T {
    if (failure) throw failure;
    if (finished) throw new Error("Ingester already ended.");
    try {
      return step();
    } catch (error) {
      if (error instanceof IngestError) failure = error;
      throw error;
    }
  }

  function finish(): IngestResult {
    reader.end();
    finished = true;
    processHeld(settler.finish());
    const { rowsRead, unreadable } = tally;
    if (rowsRead === 0) throw new IngestError(400, "No data rows", "The file has a header but no data rows.");
    if (unreadable > rowsRead / 2) {
      throw new IngestError(
        400,
        "Most rows are unreadable",
        `${unreadable} of ${rowsRead} data rows could not be read (timestamp or current not readable). ` +
          `Check the timestamp format, decimal separator (${options.decimal === "." ? "point" : "comma"} chosen) and column mapping.`,
        tally.unreadableExamples,
      );
    }
    const { series, duplicates } = samples.finish(tally.outOfOrder > 0, tally.repeats);
    const n = series.t.length;
    const tooLong = n ? spanProblem(series.t[0], series.t[n - 1]) : null;
    if (tooLong) {
      const at = (t: number) => new Date(t * 1000).toISOString();
      throw new IngestError(422, "Period too long", `${tooLong} First sample ${at(series.t[0])}, last ${at(series.t[n - 1])}. Split the history into shorter files.`);
    }
    if (n === 0) {
      throw new IngestError(400, "No valid samples", `None of the ${rowsRead} data rows holds a valid sample.`, [...tally.unreadableExamples, ...tally.invalidExamples].slice(0, MAX_EXAMPLES));
    }
    const quality = buildQualityReport(series, tally.counts(duplicates), limits.quality);
    if (channels.conversion) quality.conversion = channels.conversion;
    const temperature = temperatures?.result() ?? null;
    const temperatureWarnings = temperatures && !temperature ? [`Temperature column "${channels.columns[channels.temperatureIndex]}" holds no readings; no recorded temperatures are kept.`] : [];
    return {
      series,
      quality,
      phases: channels.channels.map((c) => c.phase),
      start: new Date(series.t[0] * 1000).toISOString(),
      end: new Date(series.t[n - 1] * 1000).toISOString(),
      detected: {
        delimiter: options.delimiter === "auto" ? reader.sniff.delimiter : options.delimiter,
        decimal: options.decimal,
        timestampFormat: settler.format,
        headerLineIndex: reader.sniff.headerLineIndex,
        columns: channels.columns,
        unitFactor: Object.fromEntries(channels.channels.map((c) => [c.phase, c.factor])),
        conversion: channels.conversion,
      },
      temperature,
      warnings: [...channels.warnings, ...settler.warnings, ...endWarnings(settler.parser!, rowsRead), ...temperatureWarnings],
    };
  }

  /** What the user should know about the times read. */
  function endWarnings(timestamps: TimestampParser, rowsRead: number): string[] {
    const warnings: string[] = [];
    if (timestamps.explicitOffsets > 0 && options.timezone !== "UTC" && timestamps.explicitOffsets < rowsRead) {
      warnings.push(`${timestamps.explicitOffsets} timestamps carry their own offset, which wins over the time zone ${options.timezone}.`);
    }
    if (timestamps.ambiguousLocalTimes > 0) {
      warnings.push(`${timestamps.ambiguousLocalTimes} local times fell in a repeated daylight-saving hour and were placed by file order.`);
    }
    const nonexistent = tally.invalid["nonexistent-local-time"];
    if (nonexistent) warnings.push(`${nonexistent} local times do not exist in ${options.timezone} (skipped spring-forward hour) and were dropped.`);
    return warnings;
  }

  let sized = !limits.expectedBytes;
  /** Sizes the sample arrays for the whole file (3 % over the estimate; they still grow if short). */
  function sizeSamples() {
    if (tally.rowsRead < SIZING_ROWS || !samples) return;
    sized = true;
    const estimate = Math.ceil(((limits.expectedBytes! / reader.bytesRead) * tally.rowsRead * 1.03) / 1024) * 1024;
    samples.reserve(Math.min(estimate, MAX_RESERVED_SAMPLES));
  }

  return {
    write: (chunk, utf8Bytes) =>
      guarded(() => {
        reader.write(chunk, utf8Bytes);
        if (!sized) sizeSamples();
      }),
    end: () => guarded(finish),
    get bytesRead() {
      return reader.bytesRead;
    },
  };
}

/** The offset (seconds) that turns a UTC second into the zone's wall clock, for calendar months. */
function monthOffset(zone: string | undefined): ((t: number) => number) | undefined {
  if (!zone) return undefined;
  const resolver = zoneResolver(zone);
  return (t) => resolver.offsetAt(t);
}

const TEXT_SLICE = 1 << 20;

/** Ingest CSV text already in memory (the feasibility API, tests); fed in 1 MB slices. */
export function ingestCsvText(text: string, options: IngestOptionsInput | IngestOptions, limits?: IngestLimits): IngestResult {
  const ingester = createIngester(options, { expectedBytes: text.length, ...limits });
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
