// A large value sent to a page as one JSON text instead of as a tree of values.
//
// Why: React Router encodes a page's route data for hydration value by value (turbo-stream: every
// number, string and object is looked up, numbered and written on its own). A saved study's
// results are ~2,400 values, and encoding them took about a fifth of the study page's server CPU
// (docs/performance.md, fifth round). One string is one value, written by JSON.stringify at native
// speed, and the server keeps the text with the page's data, so it is made once per version. The
// page parses it back once (fromJsonText in a useMemo). Only for JSON-safe values: no Date,
// Map, undefined or NaN, which JSON would change.
export type JsonText<T> = string & { readonly __jsonTextOf?: T };

export function toJsonText<T>(value: T): JsonText<T> {
  return JSON.stringify(value) as JsonText<T>;
}

export function fromJsonText<T>(text: JsonText<T>): T {
  return JSON.parse(text) as T;
}
