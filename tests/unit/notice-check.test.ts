// 14 CFR 77.9 notice check. Every case is worked by hand from the rule's text [published:
// 14 CFR 77.9(a) and (b)(1)–(3), as summarised in docs/notice-check.md].
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { checkNotice, type NoticeCheckInput } from "../../lib/notice/part77";

const ft = (value: number) => ({ value, unit: "ft" as const });
const m = (value: number) => ({ value, unit: "m" as const });
const reason = (input: NoticeCheckInput, rule: string) => checkNotice(input).reasons.find((r) => r.rule === rule)!;

describe("77.9(a): more than 200 ft above ground level", () => {
  it("a 210 ft structure anywhere needs notice, exceeding the limit by 10 ft", () => {
    const result = checkNotice({ heightAgl: ft(210), siteElevation: ft(0) });
    expect(result.noticeRequired).toBe(true);
    expect(reason({ heightAgl: ft(210), siteElevation: ft(0) }, "77.9(a)")).toMatchObject({ exceeded: true, surfaceHeight: ft(200), exceedsBy: ft(10) });
  });

  it("exactly 200 ft is not 'more than' 200 ft", () => {
    expect(checkNotice({ heightAgl: ft(200), siteElevation: ft(0) }).noticeRequired).toBe(false);
  });

  it("works in metres: 61 m = 200.13 ft needs notice; 60 m = 196.85 ft does not", () => {
    expect(checkNotice({ heightAgl: m(61), siteElevation: m(0) }).noticeRequired).toBe(true);
    expect(checkNotice({ heightAgl: m(60), siteElevation: m(0) }).noticeRequired).toBe(false);
    // 200 ft = 60.96 m exactly (international foot).
    expect(reason({ heightAgl: m(60), siteElevation: m(0) }, "77.9(a)").surfaceHeight).toEqual(m(60.96));
  });
});

describe("77.9(b): imaginary surfaces from the nearest runway or heliport", () => {
  const airport = (distance: number, longest: number) => ({ kind: "airport" as const, distance: ft(distance), longestRunway: ft(longest), elevation: ft(0) });

  it("150 ft structure 12,000 ft from a 6,000 ft runway at the same elevation: surface 12,000/100 = 120 ft, exceeded by 30 ft", () => {
    const input = { heightAgl: ft(150), siteElevation: ft(0), nearest: airport(12000, 6000) };
    expect(checkNotice(input).noticeRequired).toBe(true);
    expect(reason(input, "77.9(b)(1)")).toMatchObject({ exceeded: true, surfaceHeight: ft(120), exceedsBy: ft(30) });
  });

  it("the same at 16,000 ft: surface 160 ft, not required", () => {
    const input = { heightAgl: ft(150), siteElevation: ft(0), nearest: airport(16000, 6000) };
    expect(checkNotice(input).noticeRequired).toBe(false);
    expect(reason(input, "77.9(b)(1)")).toMatchObject({ exceeded: false, surfaceHeight: ft(160), exceedsBy: ft(-10) });
  });

  it("60 ft structure 4,000 ft from a 2,500 ft runway: 50:1 surface 80 ft, not required", () => {
    const input = { heightAgl: ft(60), siteElevation: ft(0), nearest: airport(4000, 2500) };
    expect(checkNotice(input).noticeRequired).toBe(false);
    expect(reason(input, "77.9(b)(2)")).toMatchObject({ exceeded: false, surfaceHeight: ft(80) });
  });

  it("a runway of exactly 3,200 ft takes the 50:1 surface; 3,201 ft the 100:1 surface", () => {
    expect(checkNotice({ heightAgl: ft(60), siteElevation: ft(0), nearest: airport(4000, 3200) }).reasons[1].rule).toBe("77.9(b)(2)");
    expect(checkNotice({ heightAgl: ft(60), siteElevation: ft(0), nearest: airport(4000, 3201) }).reasons[1].rule).toBe("77.9(b)(1)");
  });

  it("heliport 1,000 ft away with a 45 ft structure: 25:1 surface 40 ft, required", () => {
    const input = { heightAgl: ft(45), siteElevation: ft(0), nearest: { kind: "heliport" as const, distance: ft(1000), elevation: ft(0) } };
    expect(checkNotice(input).noticeRequired).toBe(true);
    expect(reason(input, "77.9(b)(3)")).toMatchObject({ exceeded: true, surfaceHeight: ft(40), exceedsBy: ft(5) });
  });

  it("beyond the surface's reach (20,000 ft for 100:1) the rule does not apply, however tall below 200 ft", () => {
    const input = { heightAgl: ft(199), siteElevation: ft(0), nearest: airport(20001, 6000) };
    expect(checkNotice(input).noticeRequired).toBe(false);
    expect(reason(input, "77.9(b)(1)").text).toContain("Farther away");
  });

  it("a site 50 ft above the runway lowers the surface above its ground by 50 ft: 150 ft at 12,000 ft → 70 ft, exceeded by 80 ft", () => {
    const input = { heightAgl: ft(150), siteElevation: ft(1050), nearest: { ...airport(12000, 6000), elevation: ft(1000) } };
    expect(reason(input, "77.9(b)(1)")).toMatchObject({ surfaceHeight: ft(70), exceedsBy: ft(80) });
  });

  it("property: the answer does not depend on the unit the figures are given in", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 400 }), fc.integer({ min: 0, max: 25000 }), fc.integer({ min: 1000, max: 12000 }), (h, d, runway) => {
        const inFeet = checkNotice({ heightAgl: ft(h), siteElevation: ft(0), nearest: airport(d, runway) });
        const inMetres = checkNotice({ heightAgl: m(h * 0.3048), siteElevation: m(0), nearest: { kind: "airport", distance: m(d * 0.3048), longestRunway: m(runway * 0.3048), elevation: m(0) } });
        expect(inMetres.noticeRequired).toBe(inFeet.noticeRequired);
      }),
    );
  });
});
