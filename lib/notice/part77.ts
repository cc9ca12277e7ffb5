// Whether a crossing's structure or wire needs notice to the FAA under 14 CFR 77.9 (a) and (b).
//
// Conventions (docs/notice-check.md states them in full):
// - Heights are compared in metres internally and reported in the unit of `heightAgl`.
// - (a): more than 200 ft above ground level at its site.
// - (b): taller than an imaginary surface that rises from the nearest point of the nearest runway
//   (or landing area of a heliport): 100:1 for 20,000 ft where the airport's longest runway is
//   longer than 3,200 ft; 50:1 for 10,000 ft where it is 3,200 ft or less; 25:1 for 5,000 ft
//   from a heliport. The surface starts at the runway's (or heliport's) elevation; its height is
//   reported above the site's ground, so `exceedsBy = heightAgl − surfaceHeight`.
// - Paragraphs (c) (traverse ways), (d) (on an airport) and (e) (exceptions) are not evaluated;
//   the result says so, and the aviation authority's determination governs in any case.
// Hand-written because no maintained library encodes Part 77; the arithmetic is a few lines.
import { convertLength, toMetres, type Length } from "../../shared/units";

export type NoticeUnit = "ft" | "m";
export type NoticeLength = Length<NoticeUnit>;

export interface NoticeCheckInput {
  heightAgl: NoticeLength;
  siteElevation: NoticeLength;
  nearest?: {
    kind: "airport" | "heliport";
    distance: NoticeLength;
    /** Longest runway of the airport; ignored for a heliport. */
    longestRunway?: NoticeLength;
    elevation: NoticeLength;
  };
}

export type NoticeRule = "77.9(a)" | "77.9(b)(1)" | "77.9(b)(2)" | "77.9(b)(3)";

export interface NoticeReason {
  rule: NoticeRule;
  /** True when this rule requires notice for the structure. */
  exceeded: boolean;
  text: string;
  /** Height allowed by the rule above the site's ground. */
  surfaceHeight: NoticeLength;
  /** heightAgl − surfaceHeight; positive when the rule is exceeded. */
  exceedsBy: NoticeLength;
}

export interface NoticeCheckResult {
  noticeRequired: boolean;
  reasons: NoticeReason[];
  notEvaluated: string[];
}

const FT = 0.3048;
const AGL_LIMIT_M = 200 * FT;
const SHORT_RUNWAY_M = 3200 * FT;

interface Surface {
  rule: NoticeRule;
  slope: number;
  extentM: number;
  describe: string;
}

function surfaceFor(nearest: NonNullable<NoticeCheckInput["nearest"]>): Surface {
  if (nearest.kind === "heliport") return { rule: "77.9(b)(3)", slope: 25, extentM: 5000 * FT, describe: "25 to 1 for 5,000 ft from the nearest landing and take-off area of a heliport" };
  const longest = nearest.longestRunway ? toMetres(nearest.longestRunway) : Infinity;
  return longest > SHORT_RUNWAY_M + 1e-9
    ? { rule: "77.9(b)(1)", slope: 100, extentM: 20000 * FT, describe: "100 to 1 for 20,000 ft from the nearest runway of an airport whose longest runway is more than 3,200 ft" }
    : { rule: "77.9(b)(2)", slope: 50, extentM: 10000 * FT, describe: "50 to 1 for 10,000 ft from the nearest runway of an airport whose longest runway is 3,200 ft or less" };
}

const round = (value: number) => Math.round(value * 100) / 100;

export function checkNotice(input: NoticeCheckInput): NoticeCheckResult {
  const unit = input.heightAgl.unit;
  const inUnit = (metres: number): NoticeLength => ({ value: round(convertLength({ value: metres, unit: "m" }, unit).value), unit });
  const heightM = toMetres(input.heightAgl);
  const reasons: NoticeReason[] = [];

  const aExceeded = heightM > AGL_LIMIT_M + 1e-9;
  reasons.push({
    rule: "77.9(a)",
    exceeded: aExceeded,
    text: aExceeded ? "Higher than 200 ft above ground level at its site: notice is required." : "Not higher than 200 ft above ground level at its site.",
    surfaceHeight: inUnit(AGL_LIMIT_M),
    exceedsBy: inUnit(heightM - AGL_LIMIT_M),
  });

  if (input.nearest) {
    const surface = surfaceFor(input.nearest);
    const distanceM = toMetres(input.nearest.distance);
    const within = distanceM <= surface.extentM + 1e-9;
    // The surface's height above the site: its rise over the distance, from the runway's elevation.
    const surfaceAboveSiteM = toMetres(input.nearest.elevation) + distanceM / surface.slope - toMetres(input.siteElevation);
    const exceeded = within && heightM > surfaceAboveSiteM + 1e-9;
    const where = `${round(convertLength(input.nearest.distance, unit).value)} ${unit} from the nearest ${input.nearest.kind === "heliport" ? "landing area" : "runway"}`;
    const text = !within
      ? `Farther away than the ${surface.slope}:1 surface reaches (${round(convertLength({ value: surface.extentM, unit: "m" }, unit).value)} ${unit}): ${where}.`
      : exceeded
        ? `Higher than the surface rising ${surface.describe}: at ${where} the surface is ${inUnit(surfaceAboveSiteM).value} ${unit} above the site; notice is required.`
        : `Below the surface rising ${surface.describe}: at ${where} the surface is ${inUnit(surfaceAboveSiteM).value} ${unit} above the site.`;
    reasons.push({ rule: surface.rule, exceeded, text, surfaceHeight: inUnit(surfaceAboveSiteM), exceedsBy: inUnit(heightM - surfaceAboveSiteM) });
  }

  const notEvaluated = ["77.9(c) traverse ways (roads, railways, waterways)", "77.9(d) structures on an airport", "77.9(e) exceptions (shielding and others)"];
  if (!input.nearest) notEvaluated.unshift("77.9(b): no nearest airport or heliport was given");
  return { noticeRequired: reasons.some((r) => r.exceeded), reasons, notEvaluated };
}
