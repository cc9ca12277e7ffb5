// Lists of the JSON API: `limit` (default 50, at most 500) and an opaque `cursor`; the answer
// carries `next`, the cursor of the following page, or null on the last. Items are in creation
// order (ascending id), so a page boundary holds while records are added.
import { listQuerySchema } from "../../shared/api-schemas";
import { problem } from "./http.server";

export interface PageRequest {
  limit: number;
  afterId: number;
}

const encode = (id: number) => Buffer.from(JSON.stringify({ after: id })).toString("base64url");

function decode(cursor: string): number {
  try {
    const { after } = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8")) as { after?: unknown };
    if (typeof after === "number" && Number.isSafeInteger(after) && after >= 0) return after;
  } catch {
    // fall through to the refusal
  }
  const message = "Not a cursor this API gave out; pass back the `next` value of the previous page.";
  throw problem(400, "Invalid cursor", message, { errors: [{ path: "cursor", message }] });
}

/** Reads `limit` and `cursor` from the query string, other parameters ignored when `others` lists them. */
export function pageRequest(request: Request, others: string[] = []): PageRequest {
  const params = Object.fromEntries([...new URL(request.url).searchParams].filter(([k]) => !others.includes(k)));
  const { limit, cursor } = listQuerySchema.parse(params);
  return { limit, afterId: cursor === undefined ? 0 : decode(cursor) };
}

/** One page of `items` (any order in; ascending id out) and the cursor of the next. */
export function pageOf<T extends { id: number }>(items: readonly T[], page: PageRequest): { items: T[]; next: string | null } {
  const after = [...items].filter((i) => i.id > page.afterId).sort((a, b) => a.id - b.id);
  const slice = after.slice(0, page.limit);
  return { items: slice, next: after.length > page.limit ? encode(slice[slice.length - 1].id) : null };
}
