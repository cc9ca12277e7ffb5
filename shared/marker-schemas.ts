// Request and response shapes for marker layout (API body, form, OpenAPI).
// Rule-dependent checks (a maximum spacing looser than the rule, a sphere smaller than the
// rule's minimum) need the rule tables and live in lib/markers (`markerLayoutRequestRulesSchema`).
import { z } from "zod";
import { ruleSourceSchema } from "./rule-book";
import { DIAMETER_UNITS, DISTANCE_UNITS } from "./units";

export const RULE_SETS = ["faa", "icao"] as const;
export type RuleSet = (typeof RULE_SETS)[number];

export const MARKER_COLOURS = ["orange", "white", "yellow", "red"] as const;
export type MarkerColour = (typeof MARKER_COLOURS)[number];

export const ICAO_MARKER_COLOURS = ["red", "orange"] as const;
export type IcaoMarkerColour = (typeof ICAO_MARKER_COLOURS)[number];

export { RULE_STATUSES, type RuleStatus } from "./rule-book";

/** Longest span accepted, in the span's own unit: guards against absurd marker counts. */
const MAX_SPAN_VALUE = 100_000;

export const distanceSchema = z.object({
  value: z.number().finite().positive("Must be greater than zero"),
  unit: z.enum(DISTANCE_UNITS),
});
export type Distance = z.infer<typeof distanceSchema>;

export const nonNegativeDistanceSchema = z.object({
  value: z.number().finite().nonnegative("Must not be negative"),
  unit: z.enum(DISTANCE_UNITS),
});

export const diameterSchema = z.object({
  value: z.number().finite().positive("Must be greater than zero"),
  unit: z.enum(DIAMETER_UNITS),
});
export type Diameter = z.infer<typeof diameterSchema>;

/** A rule a result relied on: its rule-book source, and `section` = the citation in one string. */
export const ruleReferenceSchema = ruleSourceSchema.extend({ section: z.string() });
export type RuleReference = z.infer<typeof ruleReferenceSchema>;

/** What lit-marker suitability needs to know about the wires at the crossing. */
export const litConditionsSchema = z.object({
  highestWireEnergized: z.boolean(),
  /** Vertical distance from the highest wire down to the energized conductor that would carry lit markers. */
  verticalSeparation: nonNegativeDistanceSchema.optional(),
  voltageKv: z.number().finite().positive().optional(),
});
export type LitConditions = z.infer<typeof litConditionsSchema>;

export const litMarkerSuitabilityInputSchema = litConditionsSchema.extend({
  ruleSet: z.enum(RULE_SETS),
});
export type LitMarkerSuitabilityInput = z.infer<typeof litMarkerSuitabilityInputSchema>;

export const litMarkerSuitabilitySchema = z.object({
  suitable: z.boolean(),
  reasons: z.array(z.string()),
  references: z.array(ruleReferenceSchema),
});
export type LitMarkerSuitability = z.infer<typeof litMarkerSuitabilitySchema>;

export const markerLayoutRequestSchema = z.object({
  ruleSet: z.enum(RULE_SETS),
  spanLength: distanceSchema.refine((d) => d.value <= MAX_SPAN_VALUE, {
    message: `Span length must be at most ${MAX_SPAN_VALUE.toLocaleString("en-US")} in its unit`,
  }),
  /** Omitted: the rule's standard sphere (FAA 36 in, ICAO 60 cm). */
  markerDiameter: diameterSchema.optional(),
  /** FAA runway-end critical area: spacing at most 50 ft. */
  runwayEndCriticalArea: z.boolean().default(false),
  /** Distance to the nearest runway end; under FAA, within the rule book's critical area it sets the reduced spacing by itself. */
  runwayEndDistance: nonNegativeDistanceSchema.optional(),
  /** Whether the crossing is extensive (a canyon, lake or river crossing); omitted: not known, so smaller FAA spheres are only noted. */
  extensive: z.boolean().optional(),
  /** Height of the highest wire above the ground or water, for the smaller FAA sphere's low-line condition. */
  highestWireHeight: nonNegativeDistanceSchema.optional(),
  /** A user limit; may only be tighter than the rule's maximum. */
  maxSpacing: distanceSchema.optional(),
  /** ICAO only: the colour alternating with white (default red). */
  icaoColour: z.enum(ICAO_MARKER_COLOURS).optional(),
  /** Lighting requested (line-powered lit markers). */
  lit: z.boolean().optional(),
  /** Wire arrangement for the lit-marker suitability check; omitted: not checked (noted). */
  litConditions: litConditionsSchema.optional(),
  /** Several wires at the highest point: how many, and how far apart side by side; omitted: one. */
  wiresAtTop: z
    .object({
      count: z.number({ error: "Give the number of wires at the highest point." }).int("A whole number of wires.").min(1, "At least one wire.").max(12, "At most 12 wires at the highest point."),
      separation: nonNegativeDistanceSchema.optional(),
    })
    .optional(),
});
/** Parsed request (defaults applied). */
export type MarkerLayoutRequest = z.infer<typeof markerLayoutRequestSchema>;
/** Request as a caller may write it (defaults optional). */
export type MarkerLayoutRequestInput = z.input<typeof markerLayoutRequestSchema>;

export const markerPositionSchema = z.object({
  /** 1 = nearest support A. */
  index: z.number().int().positive(),
  distanceFromSupportA: distanceSchema,
  colour: z.enum(MARKER_COLOURS),
  lit: z.boolean(),
  /** Which of the wires at the highest point carries it, 1 = the first (always 1 with one wire at the top). */
  wire: z.number().int().positive(),
});
export type MarkerPosition = z.infer<typeof markerPositionSchema>;

export const markerLayoutResponseSchema = z.object({
  ruleSet: z.enum(RULE_SETS),
  spanLength: distanceSchema,
  /** Markers in all (on every wire at the top). */
  count: z.number().int().positive(),
  /** Equal intervals support–marker and marker–marker: count + 1. */
  intervals: z.number().int().positive(),
  /** The maximum spacing applied, in the span's unit. */
  maxSpacing: distanceSchema,
  /** The rule's own maximum before any user tightening, in the span's unit. */
  ruleMaxSpacing: distanceSchema,
  maxSpacingSource: z.enum(["rule", "user"]),
  /** True when the rule's maximum was interpolated between tabulated diameters (ICAO). */
  maxSpacingInterpolated: z.boolean(),
  spacing: distanceSchema,
  markerDiameter: diameterSchema,
  wire: z.string(),
  /** The wires at the highest point and how the markers share them. */
  wiresAtTop: z.object({ count: z.number().int().positive(), method: z.enum(["single", "each", "alternate"]), markersPerWire: z.array(z.number().int().nonnegative()) }),
  positions: z.array(markerPositionSchema),
  litSuitability: litMarkerSuitabilitySchema.nullable(),
  references: z.array(ruleReferenceSchema),
  notes: z.array(z.string()),
});
export type MarkerLayout = z.infer<typeof markerLayoutResponseSchema>;

/** How the conductor's sag is given: vertical sag at mid-span below the chord, or the lowest clearance above ground/water. */
export const sagSpecSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("midspan-sag"), value: z.number().finite().positive("Sag must be greater than zero") }),
  z.object({
    kind: z.literal("lowest-clearance"),
    value: z.number().finite().positive("Clearance must be greater than zero"),
  }),
]);
export type SagSpec = z.infer<typeof sagSpecSchema>;

/**
 * One span for the elevation drawing. Heights are attachment heights above the ground or water
 * surface under the span, taken as level (height 0); all lengths in `unit`.
 */
export const spanGeometryInputSchema = z
  .object({
    unit: z.enum(DISTANCE_UNITS),
    spanLength: z.number().finite().positive(),
    attachmentHeightA: z.number().finite().positive(),
    attachmentHeightB: z.number().finite().positive(),
    sag: sagSpecSchema,
  })
  .superRefine((span, ctx) => {
    if (span.sag.kind === "lowest-clearance" && span.sag.value >= Math.min(span.attachmentHeightA, span.attachmentHeightB)) {
      ctx.addIssue({
        code: "custom",
        path: ["sag", "value"],
        message: "The lowest clearance must be below the lower attachment height (a conductor always sags).",
      });
    }
    if (span.sag.kind === "midspan-sag" && span.sag.value > span.spanLength) {
      ctx.addIssue({ code: "custom", path: ["sag", "value"], message: "Mid-span sag larger than the span is not a plausible conductor." });
    }
  });
export type SpanGeometryInput = z.infer<typeof spanGeometryInputSchema>;
