// Support-structure (catenary) lighting: lights on each supporting structure at three levels —
// the top, the catenary's lowest point and midway between — flashing in the rule book's sequence
// (middle, top, bottom as shipped). Used where the wires must be lit and lit markers are not
// chosen or not suitable. Heights are above the ground or water, in the span's unit.
//
// The count (what the "lights on the supports" option is costed for) is structures × levels ×
// lights per level: a tall structure whose top is far above the catenary's low point gets
// intermediate levels, so that no two adjacent levels are further apart than the rule book's gap.
import type { RuleReference, RuleSet } from "../../shared/marker-schemas";
import { convertLength, formatLength, type DistanceUnit } from "../../shared/units";
import { DEFAULT_RULES, referenceOf, type RuleTables, type SupportLightLevel } from "./rules";

export interface SupportLight {
  support: "A" | "B";
  level: SupportLightLevel;
  height: number;
  /** 1 = flashes first in each cycle. */
  flashOrder: number;
}

export interface SupportLightCount {
  structures: number;
  /** Levels on the structure with the most (both usually have the same). */
  levels: number;
  lightsPerLevel: number;
  /** Lights in all: the sum over structures of levels × lights per level. */
  total: number;
  /** Where the count comes from, in words. */
  basis: string;
}

export interface SupportLighting {
  lights: SupportLight[];
  sequence: SupportLightLevel[];
  flashesPerMinute: number;
  lightType: string;
  count: SupportLightCount;
  references: RuleReference[];
}

const RELATIVE_TOLERANCE = 1e-9;

/** Levels between the top and the bottom (both included): at least three, more where a gap would exceed maxGap. */
export function supportLevelCount(top: number, bottom: number, maxGap: number): number {
  const gaps = Math.ceil(((top - bottom) / maxGap) * (1 - RELATIVE_TOLERANCE));
  return Math.max(3, gaps + 1);
}

function levelName(index: number, levels: number): SupportLightLevel {
  if (index === 0) return "top";
  return index === levels - 1 ? "bottom" : "middle";
}

/** The lights of both supports, from their tops and the catenary's lowest point (all above the surface). */
export function supportStructureLighting(
  span: { supportTopA: number; supportTopB: number; lowestPoint: number; unit: DistanceUnit },
  ruleSet: RuleSet,
  rules: RuleTables = DEFAULT_RULES,
): SupportLighting {
  const book = ruleSet === "faa" ? rules.faa : rules.icao;
  const rule = book.supportLights;
  const maxGap = convertLength(book.supportLightLevels.maxLevelGap, span.unit).value;
  const perLevel = book.supportLightLevels.lightsPerLevel;
  const order = (level: SupportLightLevel) => rule.sequence.indexOf(level) + 1;
  let total = 0;
  let mostLevels = 0;
  const lights = (["A", "B"] as const).flatMap((support) => {
    const top = support === "A" ? span.supportTopA : span.supportTopB;
    const bottom = Math.min(span.lowestPoint, top);
    const levels = supportLevelCount(top, bottom, maxGap);
    mostLevels = Math.max(mostLevels, levels);
    total += levels * perLevel;
    return Array.from({ length: levels }, (_, i) => {
      const level = levelName(i, levels);
      return { support, level, height: top - ((top - bottom) * i) / (levels - 1), flashOrder: order(level) };
    });
  });
  const gapText = formatLength(book.supportLightLevels.maxLevelGap, { maximumFractionDigits: 0 });
  const sameLevels = total === 2 * mostLevels * perLevel;
  const basis = sameLevels
    ? `2 structures × ${mostLevels} levels × ${perLevel} light${perLevel === 1 ? "" : "s"} per level = ${total}`
    : `2 structures, ${lights.filter((l) => l.support === "A").length} and ${lights.filter((l) => l.support === "B").length} levels, × ${perLevel} light${perLevel === 1 ? "" : "s"} per level = ${total}`;
  return {
    lights,
    sequence: [...rule.sequence],
    flashesPerMinute: rule.flashesPerMinute,
    lightType: book.supportLightType.lightType,
    count: {
      structures: 2,
      levels: mostLevels,
      lightsPerLevel: perLevel,
      total,
      basis: `${basis} (top, catenary low point and midway; extra levels where adjacent ones would be more than ${gapText} apart)`,
    },
    references: [referenceOf(rule), referenceOf(book.supportLightType), referenceOf(book.supportLightLevels)],
  };
}
