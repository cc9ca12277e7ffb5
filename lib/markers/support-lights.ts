// Support-structure (catenary) lighting: lights on each supporting structure at three levels —
// the top, the catenary's lowest point and midway between — flashing in the rule book's sequence
// (middle, top, bottom as shipped). Used where the wires must be lit and lit markers are not
// chosen or not suitable. Heights are above the ground or water, in the span's unit.
import type { RuleReference, RuleSet } from "../../shared/marker-schemas";
import { DEFAULT_RULES, referenceOf, type RuleTables, type SupportLightLevel } from "./rules";

export interface SupportLight {
  support: "A" | "B";
  level: SupportLightLevel;
  height: number;
  /** 1 = flashes first in each cycle. */
  flashOrder: number;
}

export interface SupportLighting {
  lights: SupportLight[];
  sequence: SupportLightLevel[];
  flashesPerMinute: number;
  lightType: string;
  references: RuleReference[];
}

/** The lights of both supports, from their tops and the catenary's lowest point (all above the surface). */
export function supportStructureLighting(
  span: { supportTopA: number; supportTopB: number; lowestPoint: number },
  ruleSet: RuleSet,
  rules: RuleTables = DEFAULT_RULES,
): SupportLighting {
  const rule = ruleSet === "faa" ? rules.faa.supportLights : rules.icao.supportLights;
  const type = ruleSet === "faa" ? rules.faa.supportLightType : rules.icao.supportLights;
  const order = (level: SupportLightLevel) => rule.sequence.indexOf(level) + 1;
  const lights = (["A", "B"] as const).flatMap((support) => {
    const top = support === "A" ? span.supportTopA : span.supportTopB;
    const bottom = Math.min(span.lowestPoint, top);
    const heights: Record<SupportLightLevel, number> = { top, middle: (top + bottom) / 2, bottom };
    return (["top", "middle", "bottom"] as const).map((level) => ({ support, level, height: heights[level], flashOrder: order(level) }));
  });
  const references = ruleSet === "faa" ? [referenceOf(rule), referenceOf(type)] : [referenceOf(rule)];
  return { lights, sequence: [...rule.sequence], flashesPerMinute: rule.flashesPerMinute, lightType: type.lightType, references };
}
