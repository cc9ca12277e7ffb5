// Column mapping and unit conversion for the streaming ingest: which column holds the time,
// which hold the phases' currents (in A, kA or a power unit converted to amperes), which holds
// a quality flag; and, per row, each phase's current or the reason it is not valid.
import type { DecimalSeparator, IngestOptions } from "../../shared/ingest-options";
import type { Phase } from "../series";
import { IngestError } from "./errors";
import { isBlankAt, parseDecimalAt, qualityJudge } from "./numbers";
import { ampsPerUnit, describePowerConversion, isPowerUnit, type PowerConversion } from "./power-units";
import type { InvalidReason } from "./quality";
import type { CsvRow } from "./rows";
import { columnNames, headerUnit } from "./sniff";

export interface MappedChannel {
  phase: Phase;
  column: string;
  index: number;
  /** Amperes per unit of the column: 1 for A, 1000 for kA, amperes per MW/MVA/kW/kVA for power. */
  factor: number;
  /** Power column: the current is the magnitude, |P| or √(P² + Q²), times the factor. */
  power: boolean;
  /** Column of reactive power (power with a reactive column), else −1. */
  reactiveIndex: number;
}

/** The power conversion the options ask for, or null for current units; a power unit needs a voltage. */
export function powerConversionOf(options: IngestOptions): PowerConversion | null {
  if (!isPowerUnit(options.unit)) return null;
  if (options.voltageKv === undefined) {
    const error = new IngestError(
      422,
      "Voltage needed for power",
      `Unit ${options.unit} is power: give voltageKv, the circuit's line-to-line voltage in kV, to convert it to current (I = S / (√3 · V_LL)).`,
    );
    error.option = "voltageKv";
    throw error;
  }
  return { unit: options.unit, voltageKv: options.voltageKv, powerFactor: options.powerFactor, withReactive: options.reactiveColumn !== undefined };
}

/** |P|, or √(P² + Q²) with Q read from its column; NaN when Q is missing or unreadable. */
function powerMagnitude(p: number, reactiveIndex: number, row: CsvRow, decimal: DecimalSeparator): number {
  if (reactiveIndex < 0) return Math.abs(p);
  if (reactiveIndex >= row.length) return NaN;
  const text = row.text(reactiveIndex);
  const from = row.from(reactiveIndex);
  const to = row.to(reactiveIndex);
  if (isBlankAt(text, from, to)) return NaN;
  return Math.hypot(p, parseDecimalAt(text, from, to, decimal));
}

/** The mapped columns of one file, and the reading of a row's currents. */
export class ChannelReader {
  readonly columns: string[];
  readonly timestampIndex: number;
  readonly channels: MappedChannel[] = [];
  /** How power was converted to current, in words (power units only). */
  conversion: string | null = null;
  /** Header units that overrule the unit option. */
  readonly warnings: string[] = [];
  /** The last row read: each phase's current (NaN when not valid) and the reason it is not. */
  readonly values = new Float32Array(3);
  readonly reasons: (InvalidReason | null)[] = [null, null, null];
  badQuality = false;
  unreadablePhases = 0;
  /** Column of air temperatures (cold derating), −1 when none is mapped. */
  readonly temperatureIndex: number = -1;
  private readonly qualityIndex: number = -1;
  private readonly isGoodQuality: (cell: string) => boolean = () => true;
  /** The last quality cell judged and its verdict: flags repeat, and comparing spares a string per row. */
  private lastQuality = "";
  private lastQualityGood = true;
  private readonly decimal: DecimalSeparator;
  private readonly cap: number;

  /** `headerRow` as the file has it; `example` names it in a "column not found" message. */
  constructor(headerRow: string[], options: IngestOptions, power: PowerConversion | null, example: { line: number; text: string }) {
    const columns = (this.columns = columnNames(headerRow));
    this.decimal = options.decimal;
    this.cap = options.plausibilityCapA;
    const find = (name: string): number => {
      let i = columns.indexOf(name);
      if (i === -1) i = columns.findIndex((c) => c.toLowerCase() === name.trim().toLowerCase());
      if (i === -1) {
        throw new IngestError(422, "Mapped column not found", `Column "${name}" is not in the header. Columns found: ${columns.join(", ")}`, [
          { line: example.line, text: example.text.slice(0, 500), problem: `no column "${name}"` },
        ]);
      }
      return i;
    };
    this.timestampIndex = find(options.timestampColumn);
    const mapping: [Phase, string | undefined][] = options.currentColumn
      ? [["A", options.currentColumn]]
      : [
          ["A", options.phaseA],
          ["B", options.phaseB],
          ["C", options.phaseC],
        ];
    for (const [phase, column] of mapping) {
      if (column === undefined) continue;
      const index = find(column);
      if (power) {
        const reactiveIndex = options.reactiveColumn !== undefined ? find(options.reactiveColumn) : -1;
        this.channels.push({ phase, column: columns[index], index, factor: ampsPerUnit(power), power: true, reactiveIndex });
        this.conversion = describePowerConversion(power, columns[index], reactiveIndex >= 0 ? columns[reactiveIndex] : undefined);
        continue;
      }
      const written = headerUnit(columns[index]);
      const unit = written ?? options.unit;
      if (written && written !== options.unit) {
        this.warnings.push(`Column "${columns[index]}" is in ${written} by its header; read as ${written} although the unit option says ${options.unit}.`);
      }
      this.channels.push({ phase, column: columns[index], index, factor: unit === "kA" ? 1000 : 1, power: false, reactiveIndex: -1 });
    }
    if (options.temperatureColumn !== undefined) this.temperatureIndex = find(options.temperatureColumn);
    if (options.qualityColumn !== undefined) {
      this.qualityIndex = find(options.qualityColumn);
      this.isGoodQuality = qualityJudge(options.goodQuality);
      this.lastQualityGood = this.isGoodQuality(this.lastQuality);
    }
  }

  /** Reads the row's currents into `values` and `reasons`; returns how many phases are valid. */
  read(row: CsvRow): number {
    const badQuality = (this.badQuality = this.qualityIndex >= 0 && !this.goodQuality(row));
    const { channels, values, reasons, decimal, cap } = this;
    let valid = 0;
    let unreadable = 0;
    for (let k = 0; k < channels.length; k++) {
      const channel = channels[k];
      const i = channel.index;
      let reason: InvalidReason | null = null;
      let value = NaN;
      if (i >= row.length || isBlankAt(row.text(i), row.from(i), row.to(i))) {
        reason = "missing";
        unreadable++;
      } else {
        value = parseDecimalAt(row.text(i), row.from(i), row.to(i), decimal);
        // Power: the magnitude |P| or √(P² + Q²) (NaN when the row's Q is missing or unreadable).
        if (channel.power && value === value) value = powerMagnitude(value, channel.reactiveIndex, row, decimal);
        if (value !== value) {
          reason = "not-a-number";
          unreadable++;
        } else {
          value *= channel.factor;
          if (value < 0) reason = "negative";
          else if (value > cap) reason = "above-cap";
          else if (badQuality) reason = "bad-quality";
        }
      }
      reasons[k] = reason;
      if (reason === null) {
        values[k] = value;
        valid++;
      } else values[k] = NaN;
    }
    this.unreadablePhases = unreadable;
    return valid;
  }

  /** Whether the row's quality flag means good (a missing cell carries no flag). */
  private goodQuality(row: CsvRow): boolean {
    const i = this.qualityIndex;
    const text = i < row.length ? row.text(i) : "";
    const from = i < row.length ? row.from(i) : 0;
    const to = i < row.length ? row.to(i) : 0;
    const last = this.lastQuality;
    if (to - from === last.length && text.startsWith(last, from)) return this.lastQualityGood;
    this.lastQuality = text.slice(from, to);
    return (this.lastQualityGood = this.isGoodQuality(this.lastQuality));
  }
}
