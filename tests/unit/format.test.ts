// Figures shown to users (shared/format.ts): availability that never contradicts the dark hours,
// and table rows whose parts add up to the total they show.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { formatAvailability, roundToTotal } from "../../shared/format";

describe("formatAvailability", () => {
  it("says 100 % only when nothing was dark", () => {
    expect(formatAvailability(1)).toBe("100 %");
    // 2.8 h dark out of 4,300 required known hours: 99.93 %, never 100.000 %.
    expect(formatAvailability(1 - 2.8 / 4300)).toBe("99.934 %");
    // A few seconds dark in a year: below the last digit, so "> 99.999 %".
    expect(formatAvailability(1 - 10 / 3600 / 4300)).toBe("> 99.999 %");
    expect(formatAvailability(null)).toBe("—");
  });

  it("rounds down, so a value below a threshold never prints as the threshold", () => {
    expect(formatAvailability(0.999)).toBe("99.900 %"); // exactly at 99.9 % (binary 0.999 × 10⁵ is 99899.999…)
    expect(formatAvailability(0.9989996)).toBe("99.899 %"); // just below 99.9 %: not "99.900 %"
    expect(formatAvailability(0.98765, 2)).toBe("98.76 %");
  });

  it("property: the printed value is never above the true one and never 100 % below 1", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }), (a) => {
        const text = formatAvailability(a);
        expect(text).not.toBe("100 %");
        const printed = Number(text.replace(/[>%\s]/g, ""));
        expect(printed / 100).toBeLessThanOrEqual(a + 1e-9);
      }),
    );
  });
});

describe("roundToTotal", () => {
  it("keeps a row's sum: 100.04 + 0.04 + 0.04 h (= 100.12) shows parts adding to 100.1, not 100.0", () => {
    const parts = roundToTotal([100.04, 0.04, 0.04], 1);
    expect(Math.round(parts.reduce((a, b) => a + b, 0) * 10)).toBe(1001);
    expect(parts.filter((x, i) => x > [100.04, 0.04, 0.04][i])).toHaveLength(1); // one part rounded up, two down
  });

  it("property: the rounded parts add up to the rounded total and each moves by less than one last digit", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1000, noNaN: true }), { minLength: 1, maxLength: 5 }), (parts) => {
        const r = roundToTotal(parts, 1);
        const sum = r.reduce((a, b) => a + b, 0);
        expect(Math.round(sum * 10)).toBe(Math.round(parts.reduce((a, b) => a + b, 0) * 10));
        r.forEach((x, i) => expect(Math.abs(x - parts[i])).toBeLessThan(0.1 + 1e-9));
      }),
    );
  });
});
