// Rule tables for marker layout, read from data/rules/*.json and checked once on load.
// Every value carries the section of the standard it comes from and how sure we are of it.
import { z } from "zod";
import faaJson from "../../data/rules/faa.json";
import icaoJson from "../../data/rules/icao.json";
import { ruleReferenceSchema, type RuleReference } from "../../shared/marker-schemas";
import { DIAMETER_UNITS, DISTANCE_UNITS, toMetres } from "../../shared/units";

const sourced = ruleReferenceSchema.shape;
const distance = z.object({ value: z.number().positive(), unit: z.enum(DISTANCE_UNITS) });
const diameter = z.object({ value: z.number().positive(), unit: z.enum(DIAMETER_UNITS) });
const sourcedDistance = distance.extend(sourced);
const sourcedDiameter = diameter.extend(sourced);

const faaRulesSchema = z.object({
  ruleSet: z.literal("faa"),
  title: z.string(),
  markerDiameter: z.object({ standard: sourcedDiameter, reduced: sourcedDiameter }),
  maxSpacing: z.object({ standard: sourcedDistance, runwayEndCriticalArea: sourcedDistance }),
  placement: z.object({ wire: z.string(), ...sourced }),
  colours: z.object({ palette: z.array(z.string()), ...sourced }),
  colourSequence: z.object({
    cycle: z.array(z.enum(["orange", "white", "yellow"])).min(2),
    endColour: z.literal("orange"),
    allEndColourBelowCount: z.number().int().positive(),
    ...sourced,
  }),
  litMarkers: z.object({
    minVoltageKv: z.number().positive(),
    steadyRedMinCandela: z.number().positive(),
    maxSeparationFromHighestWire: distance,
    ...sourced,
  }),
});

const icaoRulesSchema = z.object({
  ruleSet: z.literal("icao"),
  title: z.string(),
  markerDiameter: z.object({ minimum: sourcedDiameter }),
  maxSpacingByDiameter: z
    .array(z.object({ diameter, maxSpacing: distance, ...sourced }))
    .min(1)
    .refine(
      (rows) => rows.every((row, i) => i === 0 || toMetres(row.diameter) > toMetres(rows[i - 1].diameter)),
      "maxSpacingByDiameter must be sorted by increasing diameter",
    ),
  interpolation: z.object(sourced),
  colours: z.object({
    alternateWith: z.literal("white"),
    choices: z.array(z.enum(["red", "orange"])).min(1),
    ...sourced,
  }),
});

export type FaaRules = z.infer<typeof faaRulesSchema>;
export type IcaoRules = z.infer<typeof icaoRulesSchema>;

export const FAA_RULES: FaaRules = faaRulesSchema.parse(faaJson);
export const ICAO_RULES: IcaoRules = icaoRulesSchema.parse(icaoJson);

/** The reference part (rule, section, status) of a sourced table entry. */
export function referenceOf(entry: RuleReference): RuleReference {
  return { rule: entry.rule, section: entry.section, status: entry.status };
}

export interface RuleSpacing {
  metres: number;
  interpolated: boolean;
  references: RuleReference[];
}

/** FAA maximum spacing: 200 ft, or 50 ft in a runway-end critical area. */
export function faaMaxSpacing(runwayEndCriticalArea: boolean): RuleSpacing {
  const entry = runwayEndCriticalArea ? FAA_RULES.maxSpacing.runwayEndCriticalArea : FAA_RULES.maxSpacing.standard;
  return { metres: toMetres(entry), interpolated: false, references: [referenceOf(entry)] };
}

/**
 * ICAO maximum spacing for a sphere diameter: the tabulated value at a tabulated diameter,
 * linear interpolation between two (flagged), the last value at and above the largest.
 * Diameters below the smallest tabulated one are refused by validation before this is called.
 */
export function icaoMaxSpacing(diameterMetres: number): RuleSpacing {
  const rows = ICAO_RULES.maxSpacingByDiameter;
  const closeTo = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(a, b);
  const exact = rows.find((row) => closeTo(toMetres(row.diameter), diameterMetres));
  if (exact) return { metres: toMetres(exact.maxSpacing), interpolated: false, references: [referenceOf(exact)] };

  const last = rows[rows.length - 1];
  if (diameterMetres >= toMetres(last.diameter)) {
    return { metres: toMetres(last.maxSpacing), interpolated: false, references: [referenceOf(last)] };
  }
  const upperIndex = rows.findIndex((row) => toMetres(row.diameter) > diameterMetres);
  if (upperIndex <= 0) {
    throw new RangeError(`Diameter ${diameterMetres} m is below the smallest tabulated ICAO sphere`);
  }
  const lower = rows[upperIndex - 1];
  const upper = rows[upperIndex];
  const d0 = toMetres(lower.diameter);
  const d1 = toMetres(upper.diameter);
  const s0 = toMetres(lower.maxSpacing);
  const s1 = toMetres(upper.maxSpacing);
  const metres = s0 + ((diameterMetres - d0) / (d1 - d0)) * (s1 - s0);
  return {
    metres,
    interpolated: true,
    references: [referenceOf(lower), referenceOf(upper), referenceOf(ICAO_RULES.interpolation)],
  };
}
