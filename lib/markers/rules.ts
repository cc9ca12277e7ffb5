// Rule tables for marker layout. The shipped defaults are data/rules/*.json; an organisation's
// rule book (lib/rulebook, app/services/rule-book.server.ts) overlays its confirmed or
// overridden values, and every function here takes the tables to use (defaults when omitted).
// Every entry carries its source and status (shared/rule-book.ts).
import { z } from "zod";
import faaJson from "../../data/rules/faa.json";
import icaoJson from "../../data/rules/icao.json";
import type { RuleReference } from "../../shared/marker-schemas";
import { citation, ruleSourceSchema, RULE_SOURCE_FIELDS, type RuleSource } from "../../shared/rule-book";
import { DIAMETER_UNITS, DISTANCE_UNITS, toMetres } from "../../shared/units";

const sourced = ruleSourceSchema.shape;
const distance = z.object({ value: z.number().positive(), unit: z.enum(DISTANCE_UNITS) });
const diameter = z.object({ value: z.number().positive(), unit: z.enum(DIAMETER_UNITS) });
const sourcedDistance = distance.extend(sourced);
const sourcedDiameter = diameter.extend(sourced);

export const SUPPORT_LIGHT_LEVELS = ["top", "middle", "bottom"] as const;
export type SupportLightLevel = (typeof SUPPORT_LIGHT_LEVELS)[number];
/** The flash order of the three levels: each level once. */
const supportLightSequence = z
  .array(z.enum(SUPPORT_LIGHT_LEVELS))
  .length(3)
  .refine((levels) => new Set(levels).size === 3, "Each level flashes once in the sequence");

/** Where several wires share the highest point: markers on each wire, or alternately from one to the next. */
export const TOP_WIRE_METHODS = ["each", "alternate"] as const;
export type TopWireMethod = (typeof TOP_WIRE_METHODS)[number];
const topWires = z.object({ method: z.enum(TOP_WIRE_METHODS), ...sourced });
/** How many levels a support carries and lights per level (older stored books lack it: defaults apply). */
const supportLightLevels = z.object({ lightsPerLevel: z.number().int().positive(), maxLevelGap: distance, ...sourced });

const faaRulesSchema = z.object({
  ruleSet: z.literal("faa"),
  title: z.string(),
  markerDiameter: z.object({
    standard: sourcedDiameter,
    // The smaller sphere's conditions: a less extensive line, or a line below maxHeightAgl within runwayEndWithin of a runway end.
    reduced: sourcedDiameter.extend({ maxHeightAgl: distance, runwayEndWithin: distance }),
  }),
  maxSpacing: z.object({ standard: sourcedDistance, runwayEndCriticalArea: sourcedDistance }),
  placement: z.object({ wire: z.string(), ...sourced }),
  topWires,
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
  runwayEndArea: z.object({ distance, ...sourced }),
  supportLights: z.object({ sequence: supportLightSequence, flashesPerMinute: z.number().positive(), ...sourced }),
  supportLightType: z.object({ lightType: z.string(), ...sourced }),
  supportLightLevels,
  outageReporting: z.object({ reportAfter: z.string(), ...sourced }),
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
  litMarkers: z.object({ maxSpacing: distance, ...sourced }),
  supportLights: z.object({ sequence: supportLightSequence, flashesPerMinute: z.number().positive(), ...sourced }),
  supportLightType: z.object({ lightType: z.string(), ...sourced }),
  supportLightLevels,
  placement: z.object({ wire: z.string(), ...sourced }),
  topWires,
  colours: z.object({
    alternateWith: z.literal("white"),
    choices: z.array(z.enum(["red", "orange"])).min(1),
    ...sourced,
  }),
});

/** Both rule sets' tables, as the shipped defaults or as an organisation's rule book has them. */
export const ruleTablesSchema = z.object({ faa: faaRulesSchema, icao: icaoRulesSchema });
export type FaaRules = z.infer<typeof faaRulesSchema>;
export type IcaoRules = z.infer<typeof icaoRulesSchema>;
export type RuleTables = z.infer<typeof ruleTablesSchema>;

/** The shipped defaults (data/rules/*.json). */
export const DEFAULT_RULES: RuleTables = ruleTablesSchema.parse({ faa: faaJson, icao: icaoJson });
export const FAA_RULES: FaaRules = DEFAULT_RULES.faa;
export const ICAO_RULES: IcaoRules = DEFAULT_RULES.icao;

/** The source part of a table entry, with its citation as `section`. */
export function referenceOf(entry: RuleSource): RuleReference {
  const source = Object.fromEntries(RULE_SOURCE_FIELDS.map((f) => [f, entry[f] ?? null])) as RuleSource;
  return { ...source, section: citation(source) };
}

export interface RuleSpacing {
  metres: number;
  interpolated: boolean;
  references: RuleReference[];
}

/** FAA maximum spacing: 200 ft, or 50 ft in a runway-end critical area (as the rule book has them). */
export function faaMaxSpacing(runwayEndCriticalArea: boolean, rules: RuleTables = DEFAULT_RULES): RuleSpacing {
  const entry = runwayEndCriticalArea ? rules.faa.maxSpacing.runwayEndCriticalArea : rules.faa.maxSpacing.standard;
  return { metres: toMetres(entry), interpolated: false, references: [referenceOf(entry)] };
}

/**
 * ICAO maximum spacing for a sphere diameter: the tabulated value at a tabulated diameter,
 * linear interpolation between two (flagged), the last value at and above the largest.
 * Diameters below the smallest tabulated one are refused by validation before this is called.
 */
export function icaoMaxSpacing(diameterMetres: number, rules: RuleTables = DEFAULT_RULES): RuleSpacing {
  const rows = rules.icao.maxSpacingByDiameter;
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
    references: [referenceOf(lower), referenceOf(upper), referenceOf(rules.icao.interpolation)],
  };
}
