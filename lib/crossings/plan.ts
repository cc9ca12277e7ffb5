// From a crossing's stored details to a marker layout and a span geometry, filling what the
// user has not stated with stated assumptions. Runs on the server (crossing page) and in the
// browser (what-if span length), so it stays pure.
//
// Heights in the details are measured from the support bases; lib/span measures them from the
// ground or water under the span. `surfaceLevel` (relative to the bases, negative = below)
// converts one to the other: height above surface = height above bases − surfaceLevel.
import { layoutMarkers, MarkerLayoutValidationError, supportStructureLighting, type RuleTables, type SupportLighting, type ValidationIssue } from "../markers";
import { minimumClearance, solveSpan, type SpanCurve } from "../span";
import type { CrossingDetails } from "../../shared/crossing-details-schemas";
import {
  spanGeometryInputSchema,
  type LitMarkerSuitability,
  type MarkerLayout,
  type MarkerLayoutRequestInput,
  type RuleReference,
  type SagSpec,
  type SpanGeometryInput,
} from "../../shared/marker-schemas";
import { convertLength, formatLength, type DistanceUnit } from "../../shared/units";

export interface CrossingPlanInput {
  spanLength: { value: number; unit: DistanceUnit };
  voltageKv: number;
  details: CrossingDetails;
  /** The crossing's kind: canyon, lake and river crossings are extensive (smaller FAA spheres). */
  kind?: string;
}

const EXTENSIVE_KINDS = ["river", "canyon", "lake"];

export interface CrossingPlanOptions {
  /** Lay the markers out as line-powered lit markers (default true). */
  lit?: boolean;
  /** What-if span length in the crossing's unit; heights stay, a stated sag scales with the span squared. */
  spanLength?: number;
  /** The organisation's rule book (shipped defaults when omitted). */
  rules?: RuleTables;
}

/** Everything the page and the drawing need, heights above the ground or water surface. */
export interface SpanFigures {
  unit: DistanceUnit;
  spanLength: number;
  supportTopA: number;
  supportTopB: number;
  /** Height of the support bases above the surface (0 when the surface is at the bases). */
  baseHeight: number;
  attachmentA: number;
  attachmentB: number;
  sag: SagSpec;
  /** Vertical offset of the marked (highest) wire above the conductor drawn; 0 when the conductor is the highest wire. */
  markedWireOffset: number;
  highestWire: CrossingDetails["highestWire"];
}

export type CrossingPlan =
  | {
      ok: true;
      request: MarkerLayoutRequestInput;
      layout: MarkerLayout;
      figures: SpanFigures;
      curve: SpanCurve;
      /** Lights on the supports at three levels, for when the wires are lit that way. */
      supportLights: SupportLighting;
      /** Values the user did not state and the plan filled in, in words. */
      assumed: string[];
    }
  | { ok: false; errors: ValidationIssue[] };

const round = (value: number, digits = 1) => Math.round(value * 10 ** digits) / 10 ** digits;

/** Default attachment height when none is stated: a tenth of the span, between 12 m and 90 m. */
function defaultAttachmentHeight(spanLength: number, unit: DistanceUnit): number {
  const metres = convertLength({ value: spanLength, unit }, "m").value;
  const chosen = Math.min(90, Math.max(12, metres / 10));
  return Math.round(convertLength({ value: chosen, unit: "m" }, unit).value);
}

/** Share of the span used as mid-span sag when none is stated. */
const DEFAULT_SAG_RATIO = 0.03;
/** A scaled sag never takes the conductor below this share of its lower attachment height. */
const MAX_SAG_SHARE_OF_HEIGHT = 0.8;

export function spanFigures(input: CrossingPlanInput, spanOverride: number | undefined, assumed: string[]): SpanFigures {
  const { details } = input;
  const unit = input.spanLength.unit;
  const savedSpan = input.spanLength.value;
  const spanLength = spanOverride ?? savedSpan;
  const len = (value: number) => formatLength({ value, unit });
  const surfaceLevel = details.surfaceLevel ?? 0;
  if (details.surfaceLevel == null) assumed.push("Ground or water level not stated: taken level with the support bases.");

  const shieldOffset = details.highestWire === "shield" ? details.wireSeparation : null;
  const supportTop = [details.supportHeightA, details.supportHeightB];
  let attachment = [details.attachmentHeightA, details.attachmentHeightB];
  let allAssumed = false;
  if (attachment.every((h) => h == null)) {
    if (supportTop.some((h) => h != null)) {
      attachment = supportTop.map((top) => {
        const t = top ?? supportTop.find((h) => h != null)!;
        return shieldOffset != null && shieldOffset < t ? t - shieldOffset : t;
      });
      assumed.push("Conductor attachment heights not stated: taken from the support heights" + (shieldOffset != null ? " less the shield-wire separation." : "."));
    } else {
      const h = defaultAttachmentHeight(savedSpan, unit) + Math.max(0, surfaceLevel);
      attachment = [h, h];
      allAssumed = true;
      assumed.push(`Support and attachment heights not stated: ${len(h)} assumed at both ends (a tenth of the span, between 12 m and 90 m).`);
    }
  } else if (attachment.some((h) => h == null)) {
    const known = attachment.find((h) => h != null)!;
    attachment = attachment.map((h) => h ?? known);
    assumed.push(`One attachment height not stated: taken equal to the other (${len(known)}).`);
  }
  const [attachA, attachB] = attachment as [number, number];
  const tops = supportTop.map((top, i) => top ?? attachment[i]! + (shieldOffset ?? 0)) as [number, number];
  if (!allAssumed && supportTop.some((h) => h == null)) {
    assumed.push("Support height not stated at every end: drawn at the top wire.");
  }

  const aboveSurfaceA = attachA - surfaceLevel;
  const aboveSurfaceB = attachB - surfaceLevel;
  let sag: SagSpec;
  if (details.sagKind && details.sagValue != null) {
    sag = { kind: details.sagKind, value: details.sagValue };
    if (sag.kind === "midspan-sag" && spanLength !== savedSpan) {
      // Same tension and conductor: sag grows with the square of the span.
      const scaled = sag.value * (spanLength / savedSpan) ** 2;
      const limit = MAX_SAG_SHARE_OF_HEIGHT * Math.min(aboveSurfaceA, aboveSurfaceB);
      sag = { kind: "midspan-sag", value: Math.min(scaled, limit) };
      assumed.push(
        scaled > limit
          ? `What-if span: sag scaled with the span squared, capped at ${len(round(limit))} to keep the conductor above the ground or water.`
          : `What-if span: sag scaled with the span squared to ${len(round(scaled))}.`,
      );
    }
  } else {
    const value = Math.min(DEFAULT_SAG_RATIO * spanLength, MAX_SAG_SHARE_OF_HEIGHT * Math.min(aboveSurfaceA, aboveSurfaceB));
    sag = { kind: "midspan-sag", value: round(value) };
    assumed.push(`Sag not stated: ${len(round(value))} at mid-span assumed (3 % of the span).`);
  }

  let markedWireOffset = 0;
  if (details.highestWire === "shield") {
    markedWireOffset = details.wireSeparation ?? Math.max(0, Math.min(tops[0] - attachA, tops[1] - attachB));
    if (details.wireSeparation == null) assumed.push("Shield-wire separation not stated: the shield wire is drawn at the support tops.");
  } else if (details.highestWire == null) {
    assumed.push("Highest wire not stated: markers drawn on the conductor, lit-marker suitability not checked.");
  }

  return {
    unit,
    spanLength,
    supportTopA: tops[0] - surfaceLevel,
    supportTopB: tops[1] - surfaceLevel,
    baseHeight: -surfaceLevel,
    attachmentA: aboveSurfaceA,
    attachmentB: aboveSurfaceB,
    sag,
    markedWireOffset,
    highestWire: details.highestWire,
  };
}

function highestWireAboveSurface(f: SpanFigures): number {
  return Math.max(f.attachmentA, f.attachmentB) + f.markedWireOffset;
}

/** The marker layout request for the crossing (the same body `POST /api/v1/markers/layout` takes). */
export function crossingLayoutRequest(input: CrossingPlanInput, options: CrossingPlanOptions = {}): MarkerLayoutRequestInput {
  const { details } = input;
  const unit = input.spanLength.unit;
  // Only stated heights judge the smaller sphere's low-line condition, never assumed ones.
  const stated = [details.supportHeightA, details.supportHeightB, details.attachmentHeightA, details.attachmentHeightB].some((h) => h != null);
  const highestWireHeight = stated ? highestWireAboveSurface(spanFigures(input, options.spanLength, [])) : null;
  const lit = options.lit ?? true;
  return {
    ruleSet: details.ruleSet,
    spanLength: { value: options.spanLength ?? input.spanLength.value, unit },
    ...(details.markerDiameter ? { markerDiameter: details.markerDiameter } : {}),
    runwayEndCriticalArea: details.runwayEndCriticalArea,
    ...(details.runwayEndDistance != null ? { runwayEndDistance: { value: details.runwayEndDistance, unit } } : {}),
    ...(input.kind ? { extensive: EXTENSIVE_KINDS.includes(input.kind) } : {}),
    ...(highestWireHeight != null ? { highestWireHeight: { value: highestWireHeight, unit } } : {}),
    ...(details.ruleSet === "icao" ? { icaoColour: details.icaoColour } : {}),
    lit,
    ...((details.topWireCount ?? 1) > 1
      ? { wiresAtTop: { count: details.topWireCount!, ...(details.topWireSeparation != null ? { separation: { value: details.topWireSeparation, unit } } : {}) } }
      : {}),
    ...(lit && details.highestWire
      ? {
          litConditions: {
            highestWireEnergized: details.highestWire === "phase",
            ...(details.highestWire === "shield" && details.wireSeparation != null ? { verticalSeparation: { value: details.wireSeparation, unit } } : {}),
            voltageKv: input.voltageKv,
          },
        }
      : {}),
  };
}

/** Layout, geometry and the assumptions made, or the validation issues that stop them. */
export function crossingPlan(input: CrossingPlanInput, options: CrossingPlanOptions = {}): CrossingPlan {
  const request = crossingLayoutRequest(input, options);
  let layout: MarkerLayout;
  try {
    layout = layoutMarkers(request, options.rules);
  } catch (error) {
    if (error instanceof MarkerLayoutValidationError) return { ok: false, errors: error.errors };
    throw error;
  }
  const assumed: string[] = [];
  const figures = spanFigures(input, options.spanLength, assumed);
  const geometry: SpanGeometryInput = {
    unit: figures.unit,
    spanLength: figures.spanLength,
    attachmentHeightA: figures.attachmentA,
    attachmentHeightB: figures.attachmentB,
    sag: figures.sag,
  };
  const checked = spanGeometryInputSchema.safeParse(geometry);
  if (!checked.success) {
    return { ok: false, errors: checked.error.issues.map((i) => ({ path: i.path.map(String).join("."), message: i.message })) };
  }
  const curve = solveSpan(checked.data, "catenary");
  const supportLights = supportStructureLighting({ supportTopA: figures.supportTopA, supportTopB: figures.supportTopB, lowestPoint: minimumClearance(curve).height, unit: figures.unit }, input.details.ruleSet, options.rules);
  return { ok: true, request, layout, figures, curve, supportLights, assumed };
}

/**
 * The rules a crossing rests on, once each: the layout's, the wires' lit-marker check, and the
 * support-structure lights' when those are in use. The top-of-page notice, the approval's
 * relied-on rules and the report's rule list all take this one list.
 */
export function reliedReferences(plan: CrossingPlan, wires: LitMarkerSuitability | null, supportLightsInUse: boolean): RuleReference[] {
  const all = [...(plan.ok ? plan.layout.references : []), ...(wires?.references ?? []), ...(plan.ok && supportLightsInUse ? plan.supportLights.references : [])];
  return [...new Map(all.map((r) => [r.key, r])).values()];
}

/** Support-structure lights are in use where an option prices them, or the wires do not suit lit markers. */
export function supportLightsInUse(wires: LitMarkerSuitability | null, optionKinds: string[]): boolean {
  return (wires != null && !wires.suitable) || optionKinds.includes("structure-supply");
}
