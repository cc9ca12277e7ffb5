// POST /api/v1/notice-check through the served app: the worked case of 77.9(b)(1) and the
// field-naming refusals. The rule arithmetic itself is tested in tests/unit/notice-check.test.ts.
import { describe, expect, it } from "vitest";
import { client, signIn } from "../support/http";

const worked = {
  heightAgl: { value: 150, unit: "ft" },
  siteElevation: { value: 0, unit: "ft" },
  nearest: { kind: "airport", distance: { value: 12000, unit: "ft" }, longestRunway: { value: 6000, unit: "ft" }, elevation: { value: 0, unit: "ft" } },
};

describe("POST /api/v1/notice-check", () => {
  it("answers the worked case: 150 ft at 12,000 ft from a 6,000 ft runway exceeds the 120 ft surface by 30 ft [published: 14 CFR 77.9(b)(1)]", async () => {
    const consultant = await signIn("consultant@example.com");
    const res = await consultant.json("/api/v1/notice-check", "POST", worked);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.noticeRequired).toBe(true);
    expect(body.reasons.map((r: { rule: string }) => r.rule)).toEqual(["77.9(a)", "77.9(b)(1)"]);
    expect(body.reasons[1]).toMatchObject({ exceeded: true, surfaceHeight: { value: 120, unit: "ft" }, exceedsBy: { value: 30, unit: "ft" } });
  });

  it.each([
    ["a height given as text", { ...worked, heightAgl: { value: "150", unit: "ft" } }, "heightAgl.value"],
    ["a negative distance", { ...worked, nearest: { ...worked.nearest, distance: { value: -1, unit: "ft" } } }, "nearest.distance.value"],
    ["an airport without its longest runway", { ...worked, nearest: { kind: "airport", distance: { value: 1, unit: "ft" }, elevation: { value: 0, unit: "ft" } } }, "nearest.longestRunway"],
    ["an unknown unit", { ...worked, siteElevation: { value: 0, unit: "yd" } }, "siteElevation.unit"],
    ["an unknown field", { ...worked, towerColour: "red" }, "towerColour"],
    ["a missing height", { siteElevation: worked.siteElevation }, "heightAgl"],
  ])("refuses %s with 422 naming the field", async (_what, body, path) => {
    const engineer = await signIn("engineer@example.com");
    const res = await engineer.json("/api/v1/notice-check", "POST", body);
    expect(res.status).toBe(422);
    expect(res.headers.get("content-type")).toBe("application/problem+json");
    const problem = await res.json();
    expect(problem.errors.map((e: { path: string }) => e.path)).toContain(path);
  });

  it("needs a caller", async () => {
    expect((await client().json("/api/v1/notice-check", "POST", worked)).status).toBe(401);
  });
});
