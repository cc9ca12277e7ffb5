import { describe, expect, it } from "vitest";
import { hasRole, requireRole, requireUser, requireApiUser, safeRedirect } from "../../app/utils/auth.server";
import { assessSignIn, THROTTLE } from "../../lib/sign-in-throttle";

describe("role guards", () => {
  it("admins pass every role check; others only their own", () => {
    expect(hasRole({ role: "admin" }, ["manager"])).toBe(true);
    expect(hasRole({ role: "engineer" }, ["engineer", "consultant"])).toBe(true);
    expect(hasRole({ role: "engineer" }, ["admin"])).toBe(false);
    expect(hasRole({ role: "manager" }, ["engineer"])).toBe(false);
  });

  it("requireUser throws a redirect to the sign-in page without a session cookie", async () => {
    const thrown = await requireUser(new Request("http://x/circuits?tab=1")).catch((e) => e);
    expect(thrown).toBeInstanceOf(Response);
    expect(thrown.status).toBe(302);
    expect(thrown.headers.get("Location")).toBe("/login?redirectTo=%2Fcircuits%3Ftab%3D1");
  });

  it("requireUser on / redirects to plain /login", async () => {
    const thrown = await requireUser(new Request("http://x/")).catch((e) => e);
    expect(thrown.headers.get("Location")).toBe("/login");
  });

  it("requireRole also redirects when signed out (before any role check)", async () => {
    const thrown = await requireRole(new Request("http://x/admin/users"), "admin").catch((e) => e);
    expect(thrown.status).toBe(302);
  });

  it("requireApiUser answers problem+json 401 when signed out", async () => {
    const thrown: Response = await requireApiUser(new Request("http://x/api/v1/circuits")).catch((e) => e);
    expect(thrown.status).toBe(401);
    expect(thrown.headers.get("Content-Type")).toBe("application/problem+json");
    expect((await thrown.json()).title).toBe("Not signed in");
  });

  it("safeRedirect keeps only same-site paths", () => {
    expect(safeRedirect("/circuits/3")).toBe("/circuits/3");
    expect(safeRedirect("//evil.example/x")).toBe("/");
    expect(safeRedirect("https://evil.example")).toBe("/");
    expect(safeRedirect(null)).toBe("/");
  });
});

describe("sign-in throttle", () => {
  it("lets the first attempts through without delay", () => {
    expect(assessSignIn(0, 0)).toEqual({ allowed: true, delayMs: 0 });
    expect(assessSignIn(THROTTLE.slowAfter - 1, 0).delayMs).toBe(0);
  });

  it("slows down after repeated failures, growing but capped", () => {
    const d1 = assessSignIn(THROTTLE.slowAfter, 0).delayMs;
    const d2 = assessSignIn(THROTTLE.slowAfter + 1, 0).delayMs;
    expect(d1).toBeGreaterThan(0);
    expect(d2).toBeGreaterThan(d1);
    expect(assessSignIn(0, THROTTLE.lockAddressAfter - 1).delayMs).toBe(THROTTLE.maxDelayMs);
  });

  it("refuses a locked account and a noisy address with a message saying so", () => {
    const account = assessSignIn(THROTTLE.lockAccountAfter, 0);
    expect(account.allowed).toBe(false);
    expect(account.message).toMatch(/locked/);
    const address = assessSignIn(0, THROTTLE.lockAddressAfter);
    expect(address.allowed).toBe(false);
    expect(address.message).toMatch(/this address/);
  });
});

describe("safeRedirect: only paths on this site", () => {
  it.each([
    ["/circuits?tab=1", "/circuits?tab=1"],
    ["/studies/4#charts", "/studies/4#charts"],
    ["/", "/"],
  ])("keeps %s", (to, expected) => {
    expect(safeRedirect(to)).toBe(expected);
  });

  it.each([
    "/\\evil.example",
    "\\\\evil.example",
    "//evil.example",
    "/%5Cevil.example",
    "/%5cevil.example",
    "/%2F%2Fevil.example",
    "/%2Fevil.example/..",
    "%2F%2Fevil.example",
    "/%255Cevil.example",
    "/\t/evil.example",
    "/\n/evil.example",
    "/\u0000/evil.example",
    "https://evil.example/",
    "http:evil.example",
    "evil.example",
    "javascript:alert(1)",
    "",
  ])("refuses %j", (to) => {
    expect(safeRedirect(to)).toBe("/");
  });

  it("refuses non-strings", () => {
    expect(safeRedirect(null)).toBe("/");
    expect(safeRedirect(undefined, "/home")).toBe("/home");
  });
});

describe("sign-in throttle without a known address", () => {
  it("applies no per-address lock when the address is unknown (null), only the per-account one", () => {
    expect(assessSignIn(0, null).allowed).toBe(true);
    expect(assessSignIn(0, null).delayMs).toBe(0);
    expect(assessSignIn(0, THROTTLE.lockAddressAfter).allowed).toBe(false);
    expect(assessSignIn(THROTTLE.lockAccountAfter, null).allowed).toBe(false);
  });
});
