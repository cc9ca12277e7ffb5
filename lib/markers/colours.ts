// Colour sequences for a row of markers, numbered from support A.
import type { IcaoMarkerColour, MarkerColour } from "../../shared/marker-schemas";
import { DEFAULT_RULES, type RuleTables } from "./rules";

/**
 * FAA: fewer than 4 markers are all orange. Otherwise the cycle orange, white, yellow runs
 * from support A and the last marker is forced orange so both ends are orange (4 markers:
 * orange–white–yellow–orange). When forcing the end would put two oranges side by side
 * (5, 8, 11 … markers) the one before the last takes the colour that differs from both its
 * neighbours, so no two adjacent markers share a colour (5: orange–white–yellow–white–orange).
 */
export function faaColourSequence(count: number, rules: RuleTables = DEFAULT_RULES): MarkerColour[] {
  const { cycle, endColour, allEndColourBelowCount } = rules.faa.colourSequence;
  if (count < allEndColourBelowCount) return Array.from({ length: count }, () => endColour);

  const colours: MarkerColour[] = Array.from({ length: count }, (_, i) => cycle[i % cycle.length]);
  colours[count - 1] = endColour;
  const beforeLast = count - 2;
  if (colours[beforeLast] === endColour) {
    const neighbours = new Set([colours[beforeLast - 1], colours[count - 1]]);
    colours[beforeLast] = cycle.find((colour) => !neighbours.has(colour)) ?? cycle[1];
  }
  return colours;
}

/** ICAO: the chosen colour (red or orange) nearest support A, then white, alternating. */
export function icaoColourSequence(count: number, colour: IcaoMarkerColour): MarkerColour[] {
  return Array.from({ length: count }, (_, i) => (i % 2 === 0 ? colour : "white"));
}
