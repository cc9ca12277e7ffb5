import { describe, expect, it } from "vitest";
import { assertApiCookieRequest, crossSiteReason } from "../../app/utils/csrf.server";

// APP_URL defaults to http://127.0.0.1:<PORT>; the request below is addressed to another host so
// both own origins (APP_URL and the request's) are exercised.
const post = (headers: Record<string, string>, url = "http://app.test/circuits/new") => new Request(url, { method: "POST", headers });

describe("crossSiteReason", () => {
  it("lets reads through whatever their headers say", () => {
    expect(crossSiteReason(new Request("http://app.test/", { headers: { origin: "https://evil.example", "sec-fetch-site": "cross-site" } }))).toBeNull();
  });

  it("lets same-origin changes through", () => {
    expect(crossSiteReason(post({ origin: "http://app.test", "sec-fetch-site": "same-origin" }))).toBeNull();
    expect(crossSiteReason(post({ origin: "http://app.test" }))).toBeNull();
    expect(crossSiteReason(post({ "sec-fetch-site": "same-origin" }))).toBeNull();
    expect(crossSiteReason(post({ referer: "http://app.test/circuits" }))).toBeNull();
  });

  it("lets a program without browser headers through (it carries no visitor's cookie by accident)", () => {
    expect(crossSiteReason(post({}))).toBeNull();
  });

  it("refuses changes from another site or a sibling site", () => {
    expect(crossSiteReason(post({ origin: "https://evil.example" }))).toMatch(/Origin/);
    expect(crossSiteReason(post({ origin: "null" }))).toMatch(/Origin/);
    expect(crossSiteReason(post({ "sec-fetch-site": "cross-site", origin: "http://app.test" }))).toMatch(/Sec-Fetch-Site/);
    expect(crossSiteReason(post({ "sec-fetch-site": "same-site" }))).toMatch(/same-site/);
    expect(crossSiteReason(post({ "sec-fetch-site": "same-origin", origin: "https://evil.example" }))).toMatch(/Origin/);
    expect(crossSiteReason(post({ referer: "https://evil.example/page" }))).toMatch(/Referer/);
    expect(crossSiteReason(post({ origin: "http://app.test.evil.example" }))).toMatch(/Origin/);
  });
});

describe("assertApiCookieRequest", () => {
  it("refuses body types another site can send without asking (415)", () => {
    for (const type of ["text/plain", "text/plain; charset=application/json", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x"]) {
      const thrown = (() => {
        try {
          assertApiCookieRequest(post({ "content-type": type }, "http://app.test/api/v1/circuits"));
        } catch (e) {
          return e as Response;
        }
      })();
      expect(thrown?.status, type).toBe(415);
    }
  });

  it("answers a cross-site change with problem+json 403", () => {
    let thrown: Response | undefined;
    try {
      assertApiCookieRequest(post({ origin: "https://evil.example", "content-type": "application/json" }, "http://app.test/api/v1/circuits"));
    } catch (e) {
      thrown = e as Response;
    }
    expect(thrown?.status).toBe(403);
    expect(thrown?.headers.get("content-type")).toBe("application/problem+json");
  });

  it("lets a same-origin JSON change through", () => {
    expect(() => assertApiCookieRequest(post({ origin: "http://app.test", "content-type": "application/json" }, "http://app.test/api/v1/circuits"))).not.toThrow();
  });
});
