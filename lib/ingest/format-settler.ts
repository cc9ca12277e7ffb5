// Timestamp decoding for the streaming ingest: the format is given, sniffed from the head, or
// settled from the rows themselves (a column the sniffer did not pick, or dates that fit both
// day/month orders until one has a field above 12). Rows wait here while it is open.
import type { IngestOptions } from "../../shared/ingest-options";
import { IngestError, MAX_EXAMPLES } from "./errors";
import type { CsvSniff } from "./sniff";
import { dayMonthEvidence, detectTimestampFormat, TimestampParser, type ConcreteTimestampFormat } from "./timestamps";

/** Rows held while the day/month order is still open (auto format, ambiguous head). */
const MAX_UNDECIDED_ROWS = 50_000;
/** Rows of a column the sniffer did not pick, used to detect its format. */
const DETECTION_ROWS = 200;

export interface HeldRow {
  row: string[];
  line: number;
}

export class TimestampFormatSettler {
  /** The parser once the format is known; null while rows are held. */
  parser: TimestampParser | null = null;
  format: ConcreteTimestampFormat = "iso";
  readonly warnings: string[] = [];
  private pending: "format" | "day-month" | null = null;
  private held: HeldRow[] = [];
  private dayFirstSeen = 0;
  private monthFirstSeen = 0;

  constructor(
    private readonly options: Pick<IngestOptions, "timestampFormat" | "timezone">,
    sniff: CsvSniff,
    private readonly column: string,
    private readonly index: number,
    private readonly rowText: (row: string[]) => string,
  ) {
    if (options.timestampFormat !== "auto") this.use(options.timestampFormat);
    else if (sniff.suggestions.timestampColumn === column && sniff.detectedTimestampFormat) {
      if (sniff.dayMonthAmbiguous) this.pending = "day-month"; // settled by a later date, or asked
      else this.use(sniff.detectedTimestampFormat);
    } else this.pending = "format"; // the user mapped another column than the one sniffed: detect from its first rows
  }

  /** Holds a row while the format is open; returns the held rows (in file order) once it settles, else null. */
  hold(row: string[], line: number): HeldRow[] | null {
    this.held.push({ row, line });
    if (this.pending === "day-month") {
      // One date with a field above 12 settles the order.
      const e = dayMonthEvidence([row[this.index] ?? ""]);
      this.dayFirstSeen += e.dayFirst;
      this.monthFirstSeen += e.monthFirst;
      if (e.dayFirst + e.monthFirst === 0 && this.held.length <= MAX_UNDECIDED_ROWS) return null;
    }
    return this.settle(false);
  }

  /** The end of the file: the format must settle now; returns the rows still held. */
  finish(): HeldRow[] {
    if (this.parser !== null || this.held.length === 0) return [];
    return this.settle(true) ?? [];
  }

  private use(format: ConcreteTimestampFormat) {
    this.format = format;
    this.parser = new TimestampParser(format, this.options.timezone);
    this.pending = null;
  }

  private settle(final: boolean): HeldRow[] | null {
    const held = this.held;
    if (this.pending === "format" && (final || held.length >= DETECTION_ROWS)) {
      const detection = detectTimestampFormat(held.map((h) => h.row[this.index] ?? ""));
      if (!detection.format) {
        throw new IngestError(
          400,
          "Timestamps not recognised",
          `Column "${this.column}" does not hold timestamps in a known format. Choose the timestamp format explicitly.`,
          held.slice(0, MAX_EXAMPLES).map((h) => ({ line: h.line, text: this.rowText(h.row).slice(0, 500), problem: "timestamp not recognised" })),
        );
      }
      if (detection.dayMonthAmbiguous) {
        this.pending = "day-month";
        const e = dayMonthEvidence(held.map((h) => h.row[this.index] ?? ""));
        this.dayFirstSeen = e.dayFirst;
        this.monthFirstSeen = e.monthFirst;
      } else this.use(detection.format);
    }
    if (this.pending === "day-month") {
      if (this.dayFirstSeen > 0 && this.monthFirstSeen === 0) this.use("dmy");
      else if (this.monthFirstSeen > 0 && this.dayFirstSeen === 0) this.use("mdy");
      else if (final || held.length > MAX_UNDECIDED_ROWS || (this.dayFirstSeen > 0 && this.monthFirstSeen > 0)) throw this.ambiguousError();
      if (this.parser) this.warnings.push(`Day and month order read as ${this.format === "dmy" ? "day first (d/m/y)" : "month first (m/d/y)"} from the dates in the file.`);
    }
    if (!this.parser) return null;
    this.held = [];
    return held;
  }

  private ambiguousError(): IngestError {
    return new IngestError(
      400,
      "Day and month order is ambiguous",
      `The dates in column "${this.column}" fit both day-first and month-first order. Choose timestamp format "dmy" or "mdy".`,
      this.held.slice(0, MAX_EXAMPLES).map((h) => ({ line: h.line, text: this.rowText(h.row).slice(0, 500), problem: "day and month could be either way round" })),
    );
  }
}
