// How an uploaded current-history CSV maps onto samples (issue 3). One schema serves the
// upload form, the upload route's query string and the feasibility API's `csvOptions`,
// so numbers are coerced and empty strings count as "not given".
import { z } from "zod";
import { nameField } from "./fields";

/**
 * The accepted years, as the API documents them; lib/ingest/time-range.ts enforces the same
 * bounds (a unit test keeps the two in step).
 */
export const TIMESTAMP_RANGE_DESCRIPTION =
  "Every timestamp, in any format, must fall in the years 1900–2200 (UTC), and the first and last may be at most 50 years apart; otherwise the request is refused with 422 naming the row.";

export const TIMESTAMP_FORMATS = ["auto", "iso", "ymd", "dmy", "mdy", "epoch-s", "epoch-ms", "serial-days"] as const;
export type TimestampFormat = (typeof TIMESTAMP_FORMATS)[number];

/** "tab" is a word so the choice travels safely in a query string. */
export const DELIMITER_CHOICES = ["auto", ",", ";", "tab", "|"] as const;
export type DelimiterChoice = (typeof DELIMITER_CHOICES)[number];

export const DECIMAL_SEPARATORS = [".", ","] as const;
export type DecimalSeparator = (typeof DECIMAL_SEPARATORS)[number];

/** The unit of an optional temperature column (stored and used in °C). */
export const TEMPERATURE_UNITS = ["C", "F"] as const;
export type TemperatureUnit = (typeof TEMPERATURE_UNITS)[number];

export const CURRENT_UNITS = ["A", "kA"] as const;
export type CurrentUnit = (typeof CURRENT_UNITS)[number];
/** Three-phase power, converted to line current with the line-to-line voltage (lib/ingest/power-units.ts). */
export const POWER_UNITS = ["MW", "MVA", "kW", "kVA"] as const;
export type PowerUnit = (typeof POWER_UNITS)[number];
export const INPUT_UNITS = [...CURRENT_UNITS, ...POWER_UNITS] as const;
export type InputUnit = (typeof INPUT_UNITS)[number];

/** At ingest there is no device yet; the engine applies its own 10 × max-current cap later. */
export const DEFAULT_PLAUSIBILITY_CAP_A = 100_000;

export function delimiterCharacter(choice: Exclude<DelimiterChoice, "auto">): string {
  return choice === "tab" ? "\t" : choice;
}

export function isValidTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** An IANA time zone name (America/Chicago, Europe/Berlin, UTC), checked against Intl. */
export const timeZoneSchema = z
  .string({ error: "Enter an IANA time zone (for example America/Chicago or UTC)." })
  .trim()
  .max(64, "Keep the time zone under 64 characters.")
  .refine(isValidTimeZone, { message: "Not a known IANA time zone (for example America/Chicago or UTC)." });

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

const optionalColumn = z.preprocess(blankToUndefined, z.string().trim().min(1).max(200).optional());

export const ingestOptionsSchema = z
  .object({
    timestampColumn: z
      .string({ error: "Choose the timestamp column." })
      .trim()
      .min(1, "Choose the timestamp column.")
      .max(200),
    currentColumn: optionalColumn,
    phaseA: optionalColumn,
    phaseB: optionalColumn,
    phaseC: optionalColumn,
    unit: z.preprocess(blankToUndefined, z.enum(INPUT_UNITS, { error: "Unit must be A, kA, MW, MVA, kW or kVA." }).default("A")),
    /** Line-to-line voltage for power units; the upload route fills in the circuit's. */
    voltageKv: z.preprocess(
      blankToUndefined,
      z.coerce.number({ error: "voltageKv must be the line-to-line voltage in kV." }).finite().positive("voltageKv must be above 0 kV.").max(1200, "voltageKv above 1,200 kV is not plausible.").optional(),
    ),
    /** For MW or kW without a reactive column: S = P / powerFactor (default 1). */
    powerFactor: z.preprocess(
      blankToUndefined,
      z.coerce.number({ error: "powerFactor must be a number between 0 and 1." }).finite().gt(0, "powerFactor must be above 0.").max(1, "powerFactor cannot exceed 1.").optional(),
    ),
    /** For MW (kW): the column of reactive power in MVAr (kVAr); S = √(P² + Q²). */
    reactiveColumn: optionalColumn,
    timezone: z.preprocess(
      blankToUndefined,
      z
        .string()
        .trim()
        .refine(isValidTimeZone, { message: "Not a known IANA time zone (for example America/Chicago or UTC)." })
        .default("UTC"),
    ),
    timestampFormat: z.preprocess(
      blankToUndefined,
      z
        .enum(TIMESTAMP_FORMATS, { error: `Timestamp format must be one of ${TIMESTAMP_FORMATS.join(", ")}.` })
        .default("auto")
        .describe(TIMESTAMP_RANGE_DESCRIPTION),
    ),
    decimal: z.preprocess(
      blankToUndefined,
      z.enum(DECIMAL_SEPARATORS, { error: 'Decimal separator must be "." or ",".' }).default("."),
    ),
    delimiter: z.preprocess(
      blankToUndefined,
      z.enum(DELIMITER_CHOICES, { error: 'Delimiter must be auto, ",", ";", tab or "|".' }).default("auto"),
    ),
    qualityColumn: optionalColumn,
    /** Air temperature at the crossing, for cold-weather storage: its monthly means are kept with the profile. */
    temperatureColumn: optionalColumn,
    temperatureUnit: z.preprocess(blankToUndefined, z.enum(TEMPERATURE_UNITS, { error: 'Temperature unit must be "C" or "F".' }).default("C")),
    /** Comma-separated values that mean good, e.g. "GOOD,OK,192". Absent: OPC-style codes and GOOD/OK. */
    goodQuality: z.preprocess(blankToUndefined, z.string().max(500).optional()),
    name: z.preprocess(blankToUndefined, nameField("Enter a name.", 200, "Keep the name under 200 characters.").optional()),
    plausibilityCapA: z.preprocess(
      (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : Number(v.trim())) : v), // query text or a JSON number
      z
        .number({ error: "Plausibility cap must be a number of amperes." })
        .positive("Plausibility cap must be above zero.")
        .finite()
        .default(DEFAULT_PLAUSIBILITY_CAP_A),
    ),
  })
  .superRefine((v, ctx) => {
    const phaseColumns = [v.phaseA, v.phaseB, v.phaseC].filter((c) => c !== undefined);
    if (v.currentColumn === undefined && phaseColumns.length === 0) {
      ctx.addIssue({
        code: "custom",
        path: ["currentColumn"],
        message: "Map a current column, or one column per phase (A, B, C).",
      });
    }
    if (v.currentColumn !== undefined && phaseColumns.length > 0) {
      ctx.addIssue({
        code: "custom",
        path: ["currentColumn"],
        message: "Map either one current column or one column per phase, not both.",
      });
    }
    const power = (POWER_UNITS as readonly string[]).includes(v.unit);
    if (power && phaseColumns.length > 0) {
      ctx.addIssue({ code: "custom", path: ["unit"], message: `${v.unit} is three-phase power: map it as one current column (currentColumn), not one column per phase.` });
    }
    if (v.reactiveColumn !== undefined && v.unit !== "MW" && v.unit !== "kW") {
      ctx.addIssue({ code: "custom", path: ["reactiveColumn"], message: "reactiveColumn goes with active power (unit MW or kW)." });
    }
    if (v.powerFactor !== undefined && v.unit !== "MW" && v.unit !== "kW") {
      ctx.addIssue({ code: "custom", path: ["powerFactor"], message: "powerFactor goes with active power (unit MW or kW)." });
    }
    if (v.powerFactor !== undefined && v.reactiveColumn !== undefined) {
      ctx.addIssue({ code: "custom", path: ["powerFactor"], message: "Give either powerFactor or reactiveColumn, not both." });
    }
    const mapped = [v.timestampColumn, v.currentColumn, ...phaseColumns, v.qualityColumn, v.reactiveColumn, v.temperatureColumn].filter(
      (c): c is string => c !== undefined,
    );
    const seen = new Set<string>();
    for (const column of mapped) {
      if (seen.has(column)) {
        ctx.addIssue({ code: "custom", path: ["timestampColumn"], message: `Column "${column}" is mapped twice.` });
      }
      seen.add(column);
    }
  });

export type IngestOptions = z.output<typeof ingestOptionsSchema>;
export type IngestOptionsInput = z.input<typeof ingestOptionsSchema>;

/** The upload's own query parameters besides the mapping: the profile's name and the file's name. */
export const profileUploadSchema = z.object({
  name: z.preprocess(blankToUndefined, nameField("Enter a name.", 200, "Keep the name under 200 characters.").optional()),
  file: z.preprocess(blankToUndefined, nameField("Name the file.", 255, "Keep the file name under 255 characters.").optional()),
});
