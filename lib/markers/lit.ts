// Can line-powered lit markers go on this crossing's wires?
// They hang on the highest energized conductor. Where the highest wire is a shield wire
// (not energized) the unlit spheres stay on it and the energized conductor must be close
// below it: about 20 ft (6 m) per AC 70/7460-1L, an unconfirmed rule until the organisation's
// rule book confirms it.
import type {
  LitMarkerSuitability,
  LitMarkerSuitabilityInput,
  RuleReference,
} from "../../shared/marker-schemas";
import { convertLength, formatLength, formatLengthWithCompanion, toMetres } from "../../shared/units";
import { DEFAULT_RULES, referenceOf, type RuleTables } from "./rules";

/**
 * ICAO: lit marking follows the national rule in the rule book (as shipped: lights not lower than
 * the highest live conductor, at most 70 m apart), not the FAA's voltage and separation figures.
 * Lights on the highest live conductor meet "not lower than" whatever wire is above it.
 */
function icaoLitSuitability(input: LitMarkerSuitabilityInput, rules: RuleTables): LitMarkerSuitability {
  const rule = rules.icao.litMarkers;
  const spacing = formatLengthWithCompanion(rule.maxSpacing, { maximumFractionDigits: 0 });
  const reasons = [
    `Under ICAO the national rule applies: lights not lower than the highest live conductor, at most ${spacing} apart; the marker positions are closer than that.`,
    input.highestWireEnergized
      ? "The highest wire is energized, so lit markers on it are not lower than the highest live conductor."
      : "The highest wire is a shield wire: lit markers go on the highest live conductor below it, which the rule allows; the unlit spheres stay on the shield wire.",
  ];
  return { suitable: true, reasons, references: [referenceOf(rule)] };
}

export function litMarkerSuitability(input: LitMarkerSuitabilityInput, rules: RuleTables = DEFAULT_RULES): LitMarkerSuitability {
  if (input.ruleSet === "icao") return icaoLitSuitability(input, rules);
  const rule = rules.faa.litMarkers;
  const references: RuleReference[] = [referenceOf(rule)];
  const reasons: string[] = [];
  let suitable = true;

  if (input.voltageKv !== undefined) {
    if (input.voltageKv < rule.minVoltageKv) {
      suitable = false;
      reasons.push(
        `The line is ${input.voltageKv} kV; AC 70/7460-1L provides lighted catenary markers for lines of ${rule.minVoltageKv} kV and above.`,
      );
    } else {
      reasons.push(`The line is ${input.voltageKv} kV, at or above the ${rule.minVoltageKv} kV the lit-marker provision covers.`);
    }
  }

  if (input.highestWireEnergized) {
    reasons.push("The highest wire is energized, so lit markers can hang on it in the marker positions.");
    return { suitable, reasons, references };
  }

  const limit = rule.maxSeparationFromHighestWire;
  const limitText = formatLengthWithCompanion(limit, { maximumFractionDigits: 0 });
  if (!input.verticalSeparation) {
    return {
      suitable: false,
      reasons: [
        ...reasons,
        `The highest wire is not energized (shield wire) and the vertical separation to the energized conductor is not given; it must be within about ${limitText}.`,
      ],
      references,
    };
  }

  const separation = input.verticalSeparation;
  const separationText = formatLength(separation);
  if (toMetres(separation) <= toMetres(limit) * (1 + 1e-9)) {
    reasons.push(
      `The highest wire is a shield wire: unlit spheres stay on it, and lit markers go on the energized conductor ${separationText} below, within the about ${limitText} allowed.`,
    );
  } else {
    suitable = false;
    const limitInUnit = convertLength(limit, separation.unit);
    reasons.push(
      `Lit markers are not suitable: the highest wire is a shield wire and the energized conductor is ${separationText} below it, more than the about ${formatLength(limitInUnit, { maximumFractionDigits: 1 })} allowed, so lights on it would not mark the top of the crossing.`,
    );
  }
  return { suitable, reasons, references };
}
