// Length units used by marker layout and span geometry, and how they print.
// Conversion factors are exact by definition (international foot and inch, 1959).

export const LENGTH_UNITS = ["ft", "m", "in", "cm"] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

/** Units used for span lengths, spacings, heights. */
export const DISTANCE_UNITS = ["ft", "m"] as const;
export type DistanceUnit = (typeof DISTANCE_UNITS)[number];

/** Units used for sphere diameters. */
export const DIAMETER_UNITS = ["in", "cm"] as const;
export type DiameterUnit = (typeof DIAMETER_UNITS)[number];

export interface Length<U extends LengthUnit = LengthUnit> {
  value: number;
  unit: U;
}

export const METRES_PER_UNIT: Readonly<Record<LengthUnit, number>> = {
  ft: 0.3048,
  m: 1,
  in: 0.0254,
  cm: 0.01,
};

export function toMetres(length: Length): number {
  return length.value * METRES_PER_UNIT[length.unit];
}

export function fromMetres<U extends LengthUnit>(metres: number, unit: U): Length<U> {
  return { value: metres / METRES_PER_UNIT[unit], unit };
}

export function convertLength<U extends LengthUnit>(length: Length, unit: U): Length<U> {
  if (length.unit === unit) return { value: length.value, unit };
  return fromMetres(toMetres(length), unit);
}

/** The same quantity's unit in the other system: ft ↔ m, in ↔ cm. */
export function companionUnit(unit: LengthUnit): LengthUnit {
  switch (unit) {
    case "ft":
      return "m";
    case "m":
      return "ft";
    case "in":
      return "cm";
    case "cm":
      return "in";
  }
}

/** Sphere diameters are stated in inches alongside feet and in centimetres alongside metres. */
export function diameterUnitFor(distanceUnit: DistanceUnit): DiameterUnit {
  return distanceUnit === "ft" ? "in" : "cm";
}

export interface FormatLengthOptions {
  /** Digits after the decimal point at most (default 1). */
  maximumFractionDigits?: number;
  locale?: string;
}

/** "1,000 ft", "304.8 m". Trailing zeros are dropped. */
export function formatLength(length: Length, options: FormatLengthOptions = {}): string {
  const formatter = new Intl.NumberFormat(options.locale ?? "en-US", {
    maximumFractionDigits: options.maximumFractionDigits ?? 1,
  });
  return `${formatter.format(length.value)} ${length.unit}`;
}

/** "1,000 ft (304.8 m)": the value plus its companion-unit equivalent. */
export function formatLengthWithCompanion(length: Length, options: FormatLengthOptions = {}): string {
  const other = convertLength(length, companionUnit(length.unit));
  return `${formatLength(length, options)} (${formatLength(other, options)})`;
}
