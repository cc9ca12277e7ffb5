// Security headers on every kind of response (documents, API, static assets), set by server.ts.
// Checklist: OWASP ASVS 4.0.3 V14.4 (HTTP security headers); see docs/security.md.
import { describe, expect, it } from "vitest";
import { baseUrl, signIn } from "../support/http";

function cspDirectives(header: string | null): Map<string, string[]> {
  expect(header, "Content-Security-Policy header").toBeTruthy();
  return new Map(
    header!
      .split(";")
      .map((d) => d.trim().split(/\s+/))
      .filter((parts) => parts[0])
      .map(([name, ...values]) => [name, values]),
  );
}

function expectCommonHeaders(res: Response) {
  expect(res.headers.get("x-content-type-options")).toBe("nosniff");
  expect(res.headers.get("referrer-policy")).toBe("same-origin");
  expect(res.headers.get("x-powered-by")).toBeNull();
  const csp = cspDirectives(res.headers.get("content-security-policy"));
  expect(csp.get("frame-ancestors")).toEqual(["'none'"]);
  expect(csp.get("object-src")).toEqual(["'none'"]);
  // No third-party origin anywhere: only keywords, the nonce and same-document schemes.
  for (const [name, values] of csp) {
    for (const value of values) {
      expect(`${name} ${value}`).toMatch(/^[a-z-]+ ('self'|'none'|'unsafe-inline'|'nonce-[A-Za-z0-9+/=]+'|data:|blob:)$/);
    }
  }
  return csp;
}

describe("security headers", () => {
  it("a document carries a fresh CSP nonce that its inline scripts use, and scripts without it are not allowed", async () => {
    const [first, second] = await Promise.all([fetch(`${baseUrl()}/login`), fetch(`${baseUrl()}/login`)]);
    const csp = expectCommonHeaders(first);
    const scriptSrc = csp.get("script-src")!;
    expect(scriptSrc).not.toContain("'unsafe-inline'");
    const nonce = scriptSrc.find((v) => v.startsWith("'nonce-"))!.slice(7, -1);
    expect(nonce.length).toBeGreaterThanOrEqual(16);
    const html = await first.text();
    const inlineScripts = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)].map((m) => m[1]);
    expect(inlineScripts.length).toBeGreaterThan(0);
    for (const attributes of inlineScripts) expect(attributes).toContain(`nonce="${nonce}"`);
    // A nonce is used once.
    const other = cspDirectives(second.headers.get("content-security-policy")).get("script-src")!;
    expect(other).not.toContain(`'nonce-${nonce}'`);
    await second.arrayBuffer();
  });

  it("signed-in pages, API answers, errors and static assets carry the same headers", async () => {
    const engineer = await signIn("engineer@example.com");
    const home = await engineer.get("/");
    expect(home.status).toBe(200);
    expectCommonHeaders(home);
    const html = await home.text();
    const asset = html.match(/\/assets\/[\w.-]+\.js/)?.[0];
    expect(asset).toBeTruthy();

    for (const path of [asset!, "/favicon.svg", "/api/v1/openapi.json", "/api/v1/circuits", "/no-such-page"]) {
      const res = await fetch(baseUrl() + path, { redirect: "manual" });
      expectCommonHeaders(res);
      await res.arrayBuffer();
    }
  });
});
