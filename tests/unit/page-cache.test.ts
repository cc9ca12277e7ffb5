// The rendered-page cache (app/utils/page-cache.server.ts): a page is reused only for the same
// URL and the same route data, with the request's own CSP nonce put back in.
import { describe, expect, it } from "vitest";
import type { EntryContext } from "react-router";
import { PageCache } from "../../app/utils/page-cache.server";

const MB = 1024 * 1024;

function context(loaderData: unknown, more: { actionData?: unknown; errors?: unknown } = {}): EntryContext {
  return { staticHandlerContext: { loaderData, actionData: more.actionData ?? null, errors: more.errors ?? null } } as unknown as EntryContext;
}
const get = (url: string) => new Request(url);
/** The page a kept entry sends, as text. */
const page = (chunks: Buffer[] | null) => (chunks ? Buffer.concat(chunks).toString() : null);

describe("page cache", () => {
  it("gives the same key for the same URL and data, another for other data or another URL", () => {
    const cache = new PageCache(MB);
    const data = { "routes/app-layout": { user: { id: 1, name: "Ada" } }, "routes/studies.$studyId": { study: { id: 7, at: new Date(0) } } };
    const a = cache.keyOf(get("http://x/studies/7"), 200, context(data));
    expect(a).toBeTruthy();
    expect(cache.keyOf(get("http://x/studies/7"), 200, context(structuredClone(data)))).toBe(a);
    // Another person, another date, another URL (zoom in the query): other keys.
    expect(cache.keyOf(get("http://x/studies/7"), 200, context({ ...data, "routes/app-layout": { user: { id: 2, name: "Ada" } } }))).not.toBe(a);
    expect(cache.keyOf(get("http://x/studies/7"), 200, context({ ...data, "routes/studies.$studyId": { study: { id: 7, at: new Date(1) } } }))).not.toBe(a);
    expect(cache.keyOf(get("http://x/studies/7?from=2024-01-01"), 200, context(data))).not.toBe(a);
  });

  it("tells apart what JSON would merge: a Map's entries, undefined against a missing field", () => {
    const cache = new PageCache(MB);
    const url = "http://x/p";
    expect(cache.keyOf(get(url), 200, context({ m: new Map([[1, "a"]]) }))).not.toBe(cache.keyOf(get(url), 200, context({ m: new Map([[1, "b"]]) })));
    expect(cache.keyOf(get(url), 200, context({ a: undefined }))).not.toBe(cache.keyOf(get(url), 200, context({})));
  });

  it("does not cache what may differ per request: posts, errors, action data, other statuses, data it cannot serialise", () => {
    const cache = new PageCache(MB);
    expect(cache.keyOf(new Request("http://x/p", { method: "POST" }), 200, context({}))).toBeNull();
    expect(cache.keyOf(get("http://x/p"), 404, context({}))).toBeNull();
    expect(cache.keyOf(get("http://x/p"), 200, context({}, { errors: { root: new Error("x") } }))).toBeNull();
    expect(cache.keyOf(get("http://x/p"), 200, context({}, { actionData: { "routes/p": { ok: true } } }))).toBeNull();
    expect(cache.keyOf(get("http://x/p"), 200, context({ later: Promise.resolve(1) }))).toBeNull();
    expect(cache.keyOf(get("http://x/p"), 200, context({ f: () => 1 }))).toBeNull();
    expect(new PageCache(0).keyOf(get("http://x/p"), 200, context({}))).toBeNull();
  });

  it("returns the kept page with the new request's nonce everywhere the old one was", () => {
    const cache = new PageCache(MB);
    const html = (nonce: string) => `<html><script nonce="${nonce}">a</script><p>Night ◐</p><script nonce="${nonce}">b</script></html>`;
    cache.set("k", Buffer.from(html("OLDnonce0123456789")), "OLDnonce0123456789");
    expect(page(cache.get("k", "NEWnonceABCDEFGHIJ"))).toBe(html("NEWnonceABCDEFGHIJ"));
    expect(page(cache.get("k", "NEWnonceABCDEFGHIJ"))).not.toContain("OLDnonce");
    expect(cache.get("other", "n")).toBeNull();
    // Kept without a nonce: returned as it was.
    cache.set("plain", Buffer.from("<p>x</p>"), undefined);
    expect(page(cache.get("plain", undefined))).toBe("<p>x</p>");
  });

  it("sends long stretches as the kept bytes and joins the short ones around nonces into one chunk each", () => {
    const cache = new PageCache(MB);
    const links = (nonce: string) => Array.from({ length: 30 }, (_, i) => `<link rel="modulepreload" href="/a${i}.js" nonce="${nonce}"/>`).join("");
    const body = "<p>" + "night ".repeat(20_000) + "</p>"; // 120 KB without a nonce
    const html = (nonce: string) => `<head>${links(nonce)}</head><body>${body}<script nonce="${nonce}">x</script></body>`;
    cache.set("k", Buffer.from(html("OLDnonce0123456789")), "OLDnonce0123456789");
    const chunks = cache.get("k", "NEWnonceABCDEFGHIJ")!;
    expect(Buffer.concat(chunks).toString()).toBe(html("NEWnonceABCDEFGHIJ"));
    // The head's 30 links in one chunk, the body as kept, the end in one chunk.
    expect(chunks).toHaveLength(3);
    expect(chunks[1].toString()).toMatch(/^"\/><\/head><body><p>night night/);
    // Not a copy: the same bytes for every view.
    expect(cache.get("k", "n")![1].buffer).toBe(chunks[1].buffer);
  });

  it("keeps at most its size in bytes, dropping the least recently used page", () => {
    const cache = new PageCache(10_000);
    for (let i = 0; i < 5; i++) cache.set(`p${i}`, Buffer.alloc(3_000, 65), undefined);
    expect(cache.size).toBe(3);
    expect(cache.get("p0", undefined)).toBeNull();
    expect(page(cache.get("p4", undefined))?.length).toBe(3_000);
  });
});
