// Rendered pages, kept by exactly what they were rendered from.
//
// A document is a pure function of the URL, the status and the route data (loader data, action
// data, errors: everything the render reads; the signed-in person is in the layout's loader
// data). So once the loaders have run, a page whose inputs hash to a key seen before is the same
// HTML, and React's render, the data's encoding for hydration and the stream plumbing (about
// two-thirds of a study page's CPU) can be skipped. Nothing is ever served stale: the loaders run
// on every request, and any change in what they return is a new key.
//
// The one per-response part of the HTML is the CSP nonce; pages are kept split at it and the
// request's own nonce is put back in. The inputs are hashed through `v8.serialize`, which keeps
// what JSON would lose (Dates, Maps, Sets, undefined); data it cannot serialise (a function, a
// promise for streaming) is simply not cached.
import { createHash } from "node:crypto";
import { serialize } from "node:v8";
import { LRUCache } from "lru-cache";
import type { EntryContext } from "react-router";

// Slices of one Buffer.concat result, so backed by a plain ArrayBuffer (what a Response body takes).
type PageParts = Buffer<ArrayBuffer>[];

/** Stretches of a kept page at least this long are sent as they are kept; shorter ones are joined. */
const LONG_STRETCH = 8 * 1024;

export class PageCache {
  private readonly pages: LRUCache<string, PageParts> | null;

  constructor(maxBytes: number) {
    this.pages =
      maxBytes > 0
        ? new LRUCache<string, PageParts>({ maxSize: maxBytes, sizeCalculation: (parts) => Math.max(1, parts.reduce((n, p) => n + p.length, 0)) })
        : null;
  }

  /** The key of a GET document rendered without errors or action data, else null (not cached). */
  keyOf(request: Request, status: number, context: EntryContext): string | null {
    if (!this.pages || request.method !== "GET" || status !== 200) return null;
    const { loaderData, actionData, errors } = context.staticHandlerContext;
    if (actionData || errors) return null;
    let data: Buffer;
    try {
      data = serialize(loaderData);
    } catch {
      return null;
    }
    return createHash("sha256").update(request.url).update("\0").update(data).digest("base64url");
  }

  /**
   * The kept page with `nonce` in place of the one it was rendered with, if kept, as the chunks to
   * send: the long stretches between nonces are the kept bytes themselves, not copies (a study page
   * is ~185 KB, and copying it on every view was garbage for the collector), and the short ones
   * around the nonces (the head's script links have dozens) are joined into one chunk each.
   */
  get(key: string, nonce: string | undefined): Buffer<ArrayBuffer>[] | null {
    const parts = this.pages?.get(key);
    if (!parts) return null;
    const separator = Buffer.from(nonce ?? "");
    const chunks: Buffer<ArrayBuffer>[] = [];
    let short: Buffer<ArrayBuffer>[] = [];
    parts.forEach((part, i) => {
      if (i > 0) short.push(separator);
      if (part.length < LONG_STRETCH) return short.push(part);
      if (short.length) chunks.push(Buffer.concat(short));
      chunks.push(part);
      short = [];
    });
    if (short.length) chunks.push(Buffer.concat(short));
    return chunks;
  }

  set(key: string, html: Buffer<ArrayBuffer>, nonce: string | undefined): void {
    if (!this.pages) return;
    this.pages.set(key, nonce ? splitAt(html, Buffer.from(nonce)) : [html]);
  }

  get size(): number {
    return this.pages?.size ?? 0;
  }
}

function splitAt(html: Buffer<ArrayBuffer>, separator: Buffer): PageParts {
  const parts: PageParts = [];
  let from = 0;
  for (let at = html.indexOf(separator, from); at !== -1; at = html.indexOf(separator, from)) {
    parts.push(html.subarray(from, at));
    from = at + separator.length;
  }
  parts.push(html.subarray(from));
  return parts;
}
