import { createHash, randomBytes } from "node:crypto";

// Keys look like `dsk_<8 hex>_<43 base64url>`: the prefix identifies a key in lists and logs,
// the rest is 256 bits of randomness. Only the SHA-256 of the whole key is stored.
export function newApiKey(): { key: string; prefix: string } {
  const prefix = `dsk_${randomBytes(4).toString("hex")}`;
  return { key: `${prefix}_${randomBytes(32).toString("base64url")}`, prefix };
}

export function apiKeyHash(key: string): string {
  return createHash("sha256").update(key).digest("hex");
}

/** The bearer token of an Authorization header, or null when there is none. */
export function bearerToken(request: Request): string | null {
  const header = request.headers.get("authorization");
  if (!header) return null;
  const m = header.match(/^Bearer\s+(\S+)\s*$/i);
  return m ? m[1] : "";
}

/** Prefix of the demo key that the local seed creates; the API refuses it wherever DUSKLINE_LOCAL is off. */
export const DEMO_KEY_PREFIX = "dl_demo";
