import { describe, expect, it } from "vitest";
import { retryDelayMs } from "../../lib/retry";

describe("outbox retry back-off", () => {
  it("doubles from one second and stops at the cap", () => {
    expect([0, 1, 2, 3, 4, 9].map((n) => retryDelayMs(n))).toEqual([0, 1000, 2000, 4000, 8000, 256_000]);
    expect(retryDelayMs(10)).toBe(300_000);
    expect(retryDelayMs(10_000)).toBe(300_000);
    expect(retryDelayMs(3, { baseMs: 500, capMs: 1500 })).toBe(1500);
  });
});
