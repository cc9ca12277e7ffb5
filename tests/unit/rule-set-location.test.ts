// Default rule set by location (lib/geo/rule-set.ts, docs/rule-book.md): FAA inside the United
// States and its territories, ICAO elsewhere. Points are well inside each place (city centres,
// rounded), so the 1:10 m generalised coast cannot decide them.
import { describe, expect, it } from "vitest";
import { defaultRuleSetAt } from "../../lib/geo/rule-set";

describe("default rule set by location", () => {
  it.each([
    ["Kansas", 38.5, -98.0],
    ["Alaska", 61.2, -149.9],
    ["Hawaii", 21.3, -157.85],
    ["District of Columbia", 38.9, -77.03],
    ["Puerto Rico", 18.2, -66.5],
    ["Guam", 13.45, 144.78],
    ["United States Virgin Islands", 18.34, -64.9],
    ["American Samoa", -14.28, -170.7],
  ])("FAA in %s", (place, lat, lon) => {
    const choice = defaultRuleSetAt(lat, lon);
    expect(choice.ruleSet).toBe("faa");
    expect(choice.reason).toContain(place);
  });

  it.each([
    ["Germany", 50, 7],
    ["Mexico City", 19.43, -99.13],
    ["Toronto", 43.65, -79.38],
    ["Havana", 23.11, -82.37],
    ["the open Atlantic", 35, -40],
    ["Sydney", -33.87, 151.21],
  ])("ICAO in %s", (_place, lat, lon) => {
    const choice = defaultRuleSetAt(lat, lon);
    expect(choice.ruleSet).toBe("icao");
    expect(choice.reason).toContain("outside the United States");
  });
});
