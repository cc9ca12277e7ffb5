import { describe, expect, it } from "vitest";
import { hashPassword, verifyPassword } from "../../lib/passwords";

describe("password hashing", () => {
  it("verifies the right password and refuses a wrong one", async () => {
    const hash = await hashPassword("correct horse battery");
    expect(hash).toMatch(/^\$2[aby]\$10\$/); // bcrypt, cost 10
    expect(hash).not.toContain("correct horse");
    expect(await verifyPassword("correct horse battery", hash)).toBe(true);
    expect(await verifyPassword("correct horse batterz", hash)).toBe(false);
  });

  it("salts: the same password hashes differently each time", async () => {
    const [a, b] = await Promise.all([hashPassword("same-password"), hashPassword("same-password")]);
    expect(a).not.toBe(b);
    expect(await verifyPassword("same-password", a)).toBe(true);
    expect(await verifyPassword("same-password", b)).toBe(true);
  });

  it("refuses when there is no hash (invited user without a password yet)", async () => {
    expect(await verifyPassword("anything", null)).toBe(false);
    expect(await verifyPassword("", undefined)).toBe(false);
  });

  it("never truncates: input longer than bcrypt's 72 bytes does not match a hash of its first 72", async () => {
    const first72 = "x".repeat(72);
    const hash = await hashPassword(first72);
    expect(await verifyPassword(first72, hash)).toBe(true);
    expect(await verifyPassword(first72 + "anything", hash)).toBe(false);
  });
});
