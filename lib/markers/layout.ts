// Marker layout on one span: diameter, maximum spacing, count, positions, colours, lit flags.
import { z } from "zod";
import {
  markerLayoutRequestSchema,
  type Diameter,
  type Distance,
  type MarkerLayout,
  type MarkerLayoutRequest,
  type MarkerLayoutRequestInput,
  type RuleReference,
} from "../../shared/marker-schemas";
import {
  convertLength,
  diameterUnitFor,
  formatLength,
  formatLengthWithCompanion,
  toMetres,
  type DistanceUnit,
} from "../../shared/units";
import { faaColourSequence, icaoColourSequence } from "./colours";
import { litMarkerSuitability } from "./lit";
import { DEFAULT_RULES, faaMaxSpacing, icaoMaxSpacing, referenceOf, type RuleSpacing, type RuleTables } from "./rules";

/** Relative slack for comparisons of lengths that went through unit conversion. */
const RELATIVE_TOLERANCE = 1e-9;

/**
 * Fewest markers such that the count + 1 equal intervals (support–marker and marker–marker)
 * are each at most `maxSpacing`; at least one marker. Both lengths in the same unit.
 */
export function minimumMarkerCount(spanLength: number, maxSpacing: number): number {
  const ratio = spanLength / maxSpacing;
  const intervals = Math.ceil(ratio - RELATIVE_TOLERANCE * Math.max(1, ratio));
  return Math.max(1, intervals - 1);
}

function standardDiameter(request: Pick<MarkerLayoutRequest, "ruleSet">, rules: RuleTables): Diameter {
  const entry = request.ruleSet === "faa" ? rules.faa.markerDiameter.standard : rules.icao.markerDiameter.minimum;
  return { value: entry.value, unit: entry.unit };
}

function smallestDiameter(ruleSet: MarkerLayoutRequest["ruleSet"], rules: RuleTables): Diameter {
  const entry = ruleSet === "faa" ? rules.faa.markerDiameter.reduced : rules.icao.markerDiameter.minimum;
  return { value: entry.value, unit: entry.unit };
}

/** FAA: the flag, or a recorded runway-end distance within the rule book's critical area. */
function inRunwayEndArea(request: MarkerLayoutRequest, rules: RuleTables): boolean {
  if (request.ruleSet !== "faa") return false;
  const distance = request.runwayEndDistance;
  return request.runwayEndCriticalArea || (distance !== undefined && toMetres(distance) <= toMetres(rules.faa.runwayEndArea.distance) * (1 + RELATIVE_TOLERANCE));
}

function ruleSpacingFor(request: MarkerLayoutRequest, diameter: Diameter, rules: RuleTables): RuleSpacing {
  return request.ruleSet === "faa"
    ? faaMaxSpacing(inRunwayEndArea(request, rules), rules)
    : icaoMaxSpacing(toMetres(diameter), rules);
}

/**
 * The request schema plus the checks that need the rule tables: a sphere below the rule's
 * smallest, and a user maximum spacing looser than the rule's. Use this to validate bodies.
 */
export function markerLayoutRulesSchema(rules: RuleTables) {
  return markerLayoutRequestSchema.superRefine((request, ctx) => checkAgainstRules(request, ctx, rules));
}

function checkAgainstRules(request: MarkerLayoutRequest, ctx: z.RefinementCtx, rules: RuleTables) {
  const minimum = smallestDiameter(request.ruleSet, rules);
  if (request.markerDiameter && toMetres(request.markerDiameter) < toMetres(minimum) * (1 - RELATIVE_TOLERANCE)) {
    const rule = request.ruleSet === "faa" ? "FAA AC 70/7460-1" : "ICAO Annex 14";
    ctx.addIssue({
      code: "custom",
      path: ["markerDiameter"],
      message: `${rule} needs spheres of at least ${formatLengthWithCompanion(minimum, { maximumFractionDigits: 0 })}; ${formatLength(request.markerDiameter)} is too small.`,
    });
    return;
  }
  // Then the smaller FAA sphere's conditions (the absolute minimum is said first).
  const smaller = smallerSphereCheck(request, rules);
  if (smaller && !smaller.allowed) {
    ctx.addIssue({ code: "custom", path: ["markerDiameter"], message: smaller.text });
    return;
  }
  if (request.maxSpacing) {
    const diameter = request.markerDiameter ?? standardDiameter(request, rules);
    const ruleMetres = ruleSpacingFor(request, diameter, rules).metres;
    if (toMetres(request.maxSpacing) > ruleMetres * (1 + RELATIVE_TOLERANCE)) {
      const ruleLimit = convertLength({ value: ruleMetres, unit: "m" }, request.maxSpacing.unit);
      ctx.addIssue({
        code: "custom",
        path: ["maxSpacing"],
        message: `Maximum spacing ${formatLength(request.maxSpacing)} is looser than the rule's ${formatLength(ruleLimit, { maximumFractionDigits: 2 })}; you may tighten the spacing, never loosen it.`,
      });
    }
  }
}

/** Validation against the shipped default tables. */
export const markerLayoutRequestRulesSchema = markerLayoutRulesSchema(DEFAULT_RULES);

export interface ValidationIssue {
  path: string;
  message: string;
}

/** Thrown by `layoutMarkers` for a request that fails validation; `errors` suit problem+json. */
export class MarkerLayoutValidationError extends Error {
  constructor(readonly errors: ValidationIssue[]) {
    super(`Invalid marker layout request: ${errors.map((e) => `${e.path || "(body)"}: ${e.message}`).join("; ")}`);
    this.name = "MarkerLayoutValidationError";
  }
}

function issuesOf(error: z.ZodError): ValidationIssue[] {
  return error.issues.map((issue) => ({ path: issue.path.map(String).join("."), message: issue.message }));
}

export type ParsedMarkerLayoutRequest =
  | { success: true; data: MarkerLayoutRequest }
  | { success: false; errors: ValidationIssue[] };

/** Validate a request (structure and rules) without throwing. */
export function parseMarkerLayoutRequest(input: unknown, rules: RuleTables = DEFAULT_RULES): ParsedMarkerLayoutRequest {
  const parsed = markerLayoutRulesSchema(rules).safeParse(input);
  return parsed.success ? { success: true, data: parsed.data } : { success: false, errors: issuesOf(parsed.error) };
}

/**
 * Lay out markers on a span. Lengths come back in the request's span unit; the diameter in
 * the request's diameter unit (or in/cm to go with ft/m when the standard sphere is used).
 * Markers are numbered from support A and spaced equally.
 *
 * Lit flags: when lighting is requested every position is lit, unless `litConditions` were
 * given and the wires are not suitable, in which case none is (the reasons are in the notes).
 * @throws MarkerLayoutValidationError
 */
export function layoutMarkers(input: MarkerLayoutRequestInput, rules: RuleTables = DEFAULT_RULES): MarkerLayout {
  const parsed = parseMarkerLayoutRequest(input, rules);
  if (!parsed.success) throw new MarkerLayoutValidationError(parsed.errors);
  const request = parsed.data;
  const unit: DistanceUnit = request.spanLength.unit;
  const span = request.spanLength;
  const notes: string[] = [];
  const references: RuleReference[] = [];

  const diameter: Diameter = request.markerDiameter ?? convertLength(standardDiameter(request, rules), diameterUnitFor(unit));
  const diameterReferences = diameterNotes(request, diameter, notes, rules);
  references.push(...diameterReferences);

  const ruleSpacing = ruleSpacingFor(request, diameter, rules);
  references.push(...ruleSpacing.references);
  const ruleMaxSpacing: Distance = convertLength({ value: ruleSpacing.metres, unit: "m" }, unit);
  if (ruleSpacing.interpolated) {
    notes.push(
      `Maximum spacing ${formatLength(ruleMaxSpacing, { maximumFractionDigits: 2 })} is interpolated linearly between the tabulated sphere diameters.`,
    );
  }
  if (request.ruleSet === "faa" && request.runwayEndDistance) {
    const area = rules.faa.runwayEndArea;
    const distanceText = formatLength(convertLength(request.runwayEndDistance, unit), { maximumFractionDigits: 0 });
    const areaText = formatLengthWithCompanion(area.distance, { maximumFractionDigits: 0 });
    references.push(referenceOf(area));
    notes.push(
      inRunwayEndArea(request, rules)
        ? `The nearest runway end is ${distanceText} away, within the ${areaText} critical area: the reduced runway-end spacing applies.`
        : `The nearest runway end is ${distanceText} away, beyond the ${areaText} critical area${request.runwayEndCriticalArea ? ", but the crossing is marked as in the critical area: the reduced spacing applies" : ": the standard spacing applies"}.`,
    );
  }
  if (request.ruleSet === "icao" && request.runwayEndCriticalArea) {
    notes.push("The ICAO table here has no separate runway-end spacing; the diameter-based maximum applies.");
  }

  const maxSpacing: Distance = request.maxSpacing ? convertLength(request.maxSpacing, unit) : ruleMaxSpacing;
  if (request.maxSpacing) {
    notes.push(`Spacing tightened by the user to at most ${formatLength(maxSpacing, { maximumFractionDigits: 2 })}.`);
  }

  const top = wiresAtTop(request, span.value, maxSpacing.value, notes, references, rules);
  const alongSpan = top.method === "each" ? top.perWire : top.total;
  const intervals = alongSpan + 1;
  const spacing: Distance = { value: span.value / intervals, unit };
  if (span.value <= maxSpacing.value * (1 + RELATIVE_TOLERANCE)) {
    notes.push("The span is no longer than the maximum spacing; one marker is placed at mid-span as the minimum.");
  }

  const colours = colourSequence(request, alongSpan, references, notes, rules);
  const { lit, litSuitability } = litFlags(request, notes, references, rules);

  const placement = request.ruleSet === "faa" ? rules.faa.placement : rules.icao.placement;
  references.push(referenceOf(placement));
  const onWire = top.wires === 1 ? "highest wire" : top.method === "each" ? `each of the ${top.wires} wires at the highest point` : `the ${top.wires} wires at the highest point, alternately`;
  const wire =
    lit && litSuitability && !request.litConditions?.highestWireEnergized
      ? `${onWire} (unlit spheres); lit markers on the energized conductor below, at the same positions`
      : onWire;

  const along = colours.map((colour, i) => ({ distance: (span.value * (i + 1)) / intervals, colour, step: i }));
  const placed =
    top.method === "each"
      ? along.flatMap((p) => Array.from({ length: top.wires }, (_, w) => ({ ...p, wire: w + 1 })))
      : along.map((p) => ({ ...p, wire: (p.step % top.wires) + 1 }));
  const positions = placed.map((p, i) => ({ index: i + 1, distanceFromSupportA: { value: p.distance, unit }, colour: p.colour, lit, wire: p.wire }));
  const count = positions.length;
  const markersPerWire = Array.from({ length: top.wires }, (_, w) => positions.filter((p) => p.wire === w + 1).length);

  return {
    ruleSet: request.ruleSet,
    spanLength: { value: span.value, unit },
    count,
    intervals,
    maxSpacing,
    ruleMaxSpacing,
    maxSpacingSource: request.maxSpacing ? "user" : "rule",
    maxSpacingInterpolated: ruleSpacing.interpolated,
    spacing,
    markerDiameter: diameter,
    wire,
    wiresAtTop: { count: top.wires, method: top.wires === 1 ? "single" : top.method, markersPerWire },
    positions,
    litSuitability,
    references: uniqueReferences(references),
    notes,
  };
}

/**
 * Several wires at the highest point, per the rule book: markers on each wire at the layout's
 * positions, or alternately from one wire to the next. Alternating, the distance between
 * adjacent markers runs from one wire to the next, so the spacing along the span shrinks until
 * √(along² + separation²) is within the maximum; a separation at or beyond the maximum cannot
 * alternate and every wire is marked instead.
 */
function wiresAtTop(request: MarkerLayoutRequest, span: number, maxSpacing: number, notes: string[], references: RuleReference[], rules: RuleTables) {
  const wires = request.wiresAtTop?.count ?? 1;
  const single = minimumMarkerCount(span, maxSpacing);
  if (wires === 1) return { wires, method: "each" as const, perWire: single, total: single };
  const rule = request.ruleSet === "faa" ? rules.faa.topWires : rules.icao.topWires;
  references.push(referenceOf(rule));
  const unit = request.spanLength.unit;
  const len = (value: number) => formatLength({ value, unit }, { maximumFractionDigits: 1 });
  const each = (why: string) => {
    notes.push(`${wires} wires at the highest point: ${why} each wire carries ${single} markers at the same positions, ${single * wires} in all.`);
    return { wires, method: "each" as const, perWire: single, total: single * wires };
  };
  if (rule.method === "each") return each("the rule book marks every one of them;");
  const given = request.wiresAtTop?.separation;
  const separation = given ? convertLength(given, unit).value : 0;
  if (separation >= maxSpacing * (1 - RELATIVE_TOLERANCE)) {
    return each(`they are ${len(separation)} apart, no less than the ${len(maxSpacing)} maximum spacing, so markers cannot alternate between them;`);
  }
  const along = Math.sqrt(maxSpacing ** 2 - separation ** 2);
  const total = minimumMarkerCount(span, along);
  const step = span / (total + 1);
  const diagonal = Math.sqrt(step ** 2 + separation ** 2);
  notes.push(
    `${wires} wires at the highest point: markers go alternately from one to the next, ${total} in all. ` +
      (given
        ? `Adjacent markers are ${len(diagonal)} apart from wire to wire (${len(step)} along the span, ${len(separation)} across), within the ${len(maxSpacing)} maximum.`
        : `The wires' separation is not stated, so the distance between adjacent markers is taken along the span only (${len(step)}); state the separation to check it from wire to wire.`),
  );
  return { wires, method: "alternate" as const, perWire: Math.ceil(total / wires), total };
}

/**
 * FAA spheres smaller than the standard one: allowed on a less extensive line (not a canyon,
 * lake or river crossing), or where the highest wire is below 50 ft above the ground within
 * 1,500 ft of a runway end (as the rule book has those figures). Null when the check does not
 * apply or cannot be made (extensiveness not known).
 */
function smallerSphereCheck(request: MarkerLayoutRequest, rules: RuleTables): { allowed: boolean; text: string } | null {
  if (request.ruleSet !== "faa" || !request.markerDiameter || request.extensive === undefined) return null;
  const { standard, reduced } = rules.faa.markerDiameter;
  if (toMetres(request.markerDiameter) >= toMetres(standard) * (1 - RELATIVE_TOLERANCE)) return null;
  const size = formatLength(request.markerDiameter);
  const heightLimit = formatLength(reduced.maxHeightAgl);
  const runwayLimit = formatLength(reduced.runwayEndWithin, { maximumFractionDigits: 0 });
  const height = request.highestWireHeight;
  const runway = request.runwayEndDistance;
  const low = height !== undefined && toMetres(height) < toMetres(reduced.maxHeightAgl);
  const near = runway !== undefined && toMetres(runway) <= toMetres(reduced.runwayEndWithin) * (1 + RELATIVE_TOLERANCE);
  const heightText = height ? `the highest wire is ${formatLength(convertLength(height, "ft"), { maximumFractionDigits: 0 })} above the ground` : "the wire height is not stated";
  const runwayText = runway ? `the nearest runway end is ${formatLength(convertLength(runway, "ft"), { maximumFractionDigits: 0 })} away` : "no runway-end distance is recorded";
  if (!request.extensive) return { allowed: true, text: `${size} spheres are allowed: the crossing is not a canyon, lake or river crossing, so it is taken as a less extensive line.` };
  if (low && near) return { allowed: true, text: `${size} spheres are allowed: ${heightText} (below ${heightLimit}) and ${runwayText} (within ${runwayLimit}).` };
  return {
    allowed: false,
    text: `${size} spheres are not allowed here: this is an extensive crossing (canyon, lake or river), and the low-line condition (below ${heightLimit} within ${runwayLimit} of a runway end) is not met: ${heightText}, ${runwayText}. Use ${formatLength(standard)} spheres.`,
  };
}

function diameterNotes(request: MarkerLayoutRequest, diameter: Diameter, notes: string[], rules: RuleTables): RuleReference[] {
  if (request.ruleSet === "icao") return [referenceOf(rules.icao.markerDiameter.minimum)];
  const { standard, reduced } = rules.faa.markerDiameter;
  const smaller = smallerSphereCheck(request, rules);
  if (smaller) {
    notes.push(smaller.text);
    return [referenceOf(standard), referenceOf(reduced)];
  }
  if (toMetres(diameter) < toMetres(standard) * (1 - RELATIVE_TOLERANCE)) {
    notes.push(
      `Spheres smaller than ${formatLength(standard)} (here ${formatLength(diameter)}) are allowed only on less extensive lines, or below 50 ft AGL within 1,500 ft of a runway end; extensive crossings (canyons, lakes, rivers) need ${formatLength(standard)}.`,
    );
    return [referenceOf(standard), referenceOf(reduced)];
  }
  return [referenceOf(standard)];
}

function colourSequence(
  request: MarkerLayoutRequest,
  count: number,
  references: RuleReference[],
  notes: string[],
  rules: RuleTables,
) {
  if (request.ruleSet === "faa") {
    references.push(referenceOf(rules.faa.colours), referenceOf(rules.faa.colourSequence));
    if (request.icaoColour) notes.push("The ICAO colour choice does not apply under the FAA rule set and was ignored.");
    if (count < rules.faa.colourSequence.allEndColourBelowCount) {
      notes.push(`Fewer than ${rules.faa.colourSequence.allEndColourBelowCount} markers: all orange.`);
    }
    return faaColourSequence(count, rules);
  }
  references.push(referenceOf(rules.icao.colours));
  const colour = request.icaoColour ?? "red";
  return icaoColourSequence(count, colour);
}

function litFlags(request: MarkerLayoutRequest, notes: string[], references: RuleReference[], rules: RuleTables) {
  if (!request.lit) return { lit: false, litSuitability: null };
  references.push(referenceOf(request.ruleSet === "icao" ? rules.icao.litMarkers : rules.faa.litMarkers));
  if (!request.litConditions) {
    notes.push(
      "Lighting requested: every marker position is lit. Wire suitability was not checked (give litConditions: whether the highest wire is energized and its separation from the energized conductor).",
    );
    return { lit: true, litSuitability: null };
  }
  const suitability = litMarkerSuitability({ ...request.litConditions, ruleSet: request.ruleSet }, rules);
  if (suitability.suitable) {
    notes.push("Lighting requested and suitable: every marker position is lit.");
  } else {
    notes.push("Lighting requested but lit markers are not suitable here; no position is marked lit.");
  }
  notes.push(...suitability.reasons);
  return { lit: suitability.suitable, litSuitability: suitability };
}

function uniqueReferences(references: RuleReference[]): RuleReference[] {
  const seen = new Set<string>();
  return references.filter((reference) => {
    const key = reference.key;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}
