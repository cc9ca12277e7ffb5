// Security headers on every kind of response (documents, API, static assets), set by server.ts.
// Checklist: OWASP ASVS 4.0.3 V14.4 (HTTP security headers); see docs/security.md.
import { randomUUID } from "node:crypto";
import http from "node:http";
import { gunzipSync } from "node:zlib";
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

  it("pages and API answers may not be kept by a browser or proxy; assets keep their own caching", async () => {
    const engineer = await signIn("engineer@example.com");
    for (const path of ["/", "/portfolio", "/api/v1/circuits", "/api/v1/portfolio"]) {
      const res = await engineer.get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers.get("cache-control"), path).toBe("no-store");
      await res.arrayBuffer();
    }
    const signedOut = await fetch(`${baseUrl()}/login`);
    expect(signedOut.headers.get("cache-control")).toBe("no-store");
    const html = await (await engineer.get("/")).text();
    const asset = await fetch(baseUrl() + html.match(/\/assets\/[\w.-]+\.js/)![0]);
    expect(asset.headers.get("cache-control")).toBe("public, max-age=31536000, immutable");
    // Other public files keep theirs (a route's own rule is checked with the report PDF, study-report.test.ts).
    const favicon = await fetch(`${baseUrl()}/favicon.svg`);
    expect(favicon.headers.get("cache-control")).toMatch(/^public, max-age=\d+$/);
  });

  it("a page served again from the page cache carries its own response's nonce, and a change shows at once", async () => {
    const engineer = await signIn("engineer@example.com");
    const nonceOf = (res: Response) => cspDirectives(res.headers.get("content-security-policy")).get("script-src")!.find((v) => v.startsWith("'nonce-"))!.slice(7, -1);
    const pages: { nonce: string; html: string }[] = [];
    for (let i = 0; i < 3; i++) {
      const res = await engineer.get("/circuits");
      expect(res.status).toBe(200);
      pages.push({ nonce: nonceOf(res), html: await res.text() });
    }
    expect(new Set(pages.map((p) => p.nonce)).size).toBe(3);
    for (const { nonce, html } of pages) {
      const inlineScripts = [...html.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)].map((m) => m[1]);
      expect(inlineScripts.length).toBeGreaterThan(0);
      for (const attributes of inlineScripts) expect(attributes).toContain(`nonce="${nonce}"`);
      for (const other of pages.filter((p) => p.nonce !== nonce)) expect(html).not.toContain(other.nonce);
    }
    // The same page apart from the nonce (kept and reused) ...
    expect(pages[1].html.replaceAll(pages[1].nonce, "N")).toBe(pages[0].html.replaceAll(pages[0].nonce, "N"));
    // ... until what it shows changes: a new circuit is on the next view.
    const name = `Cache check ${randomUUID().slice(0, 8)}`;
    const created = await engineer.post("/circuits/new", { name, voltageKv: "69", phases: "3" });
    expect(created.status).toBe(302);
    const after = await engineer.get("/circuits");
    expect(await after.text()).toContain(name);
  });

  it("compresses a response for a client that accepts gzip, and sends one that accepts no encoding as it is", async () => {
    const get = (headers: Record<string, string>) =>
      new Promise<{ encoding: string | undefined; vary: string | undefined; body: Buffer }>((resolve, reject) => {
        const req = http.get(`${baseUrl()}/login`, { headers }, (res) => {
          const chunks: Buffer[] = [];
          res.on("data", (c: Buffer) => chunks.push(c));
          res.on("end", () => resolve({ encoding: res.headers["content-encoding"], vary: res.headers.vary, body: Buffer.concat(chunks) }));
        });
        req.on("error", reject);
      });
    const zipped = await get({ "accept-encoding": "gzip" });
    expect(zipped.encoding).toBe("gzip");
    expect(zipped.vary).toMatch(/accept-encoding/i);
    const plain = await get({});
    expect(plain.encoding).toBeUndefined();
    const page = plain.body.toString("utf8");
    expect(page).toContain("<html");
    // The same page either way (apart from the nonce).
    const nonce = (html: string) => /nonce="([^"]+)"/.exec(html)![1];
    const unzipped = gunzipSync(zipped.body).toString("utf8");
    expect(unzipped.replaceAll(nonce(unzipped), "N")).toBe(page.replaceAll(nonce(page), "N"));
  });
});
