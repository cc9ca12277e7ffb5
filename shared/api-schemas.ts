// Request shapes shared by every /api/v1 list: `limit` and an opaque `cursor`.
import { z } from "zod";

export const LIST_LIMIT_DEFAULT = 50;
export const LIST_LIMIT_MAX = 500;

export const listQuerySchema = z
  .object({
    limit: z.coerce
      .number({ error: `limit is a whole number from 1 to ${LIST_LIMIT_MAX}.` })
      .int(`limit is a whole number from 1 to ${LIST_LIMIT_MAX}.`)
      .min(1, `limit is a whole number from 1 to ${LIST_LIMIT_MAX}.`)
      .max(LIST_LIMIT_MAX, `limit is at most ${LIST_LIMIT_MAX}.`)
      .default(LIST_LIMIT_DEFAULT),
    cursor: z.string().max(200).optional(),
  })
  .strict();

type JsonSchema = { [key: string]: unknown };
const jsonSchemas = new WeakMap<z.ZodType, JsonSchema>();

/**
 * Paths of the fields in `body` that `schema` does not know, at any depth (objects inside arrays
 * too). Read from the schema's JSON Schema, so every request schema is strict about unknown
 * fields without a second copy of its shape, and pages may still post extra form fields.
 */
export function unknownFields(schema: z.ZodType, body: unknown): string[] {
  let json = jsonSchemas.get(schema);
  if (!json) {
    json = z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as JsonSchema;
    jsonSchemas.set(schema, json);
  }
  const found: string[] = [];
  walk(json, json, body, [], found);
  return found;
}

function resolve(root: JsonSchema, s: JsonSchema): JsonSchema {
  const ref = s.$ref;
  if (typeof ref === "string" && ref.startsWith("#/$defs/")) return ((root.$defs as Record<string, JsonSchema>) ?? {})[ref.slice(8)] ?? {};
  if (ref === "#") return root;
  return s;
}

/** The schemas a value may be checked against: the schema itself and its allOf / anyOf / oneOf branches. */
function branches(root: JsonSchema, s: JsonSchema): JsonSchema[] {
  const r = resolve(root, s);
  const subs = ["allOf", "anyOf", "oneOf"].flatMap((k) => (Array.isArray(r[k]) ? (r[k] as JsonSchema[]) : []));
  return [r, ...subs.flatMap((b) => branches(root, b))];
}

function walk(root: JsonSchema, s: JsonSchema, value: unknown, path: string[], found: string[]): void {
  if (found.length >= 20) return;
  const all = branches(root, s);
  if (Array.isArray(value)) {
    for (const b of all) {
      const items = b.items as JsonSchema | undefined;
      const prefix = b.prefixItems as JsonSchema[] | undefined;
      if (!items && !prefix) continue;
      value.forEach((v, i) => {
        if (v !== null && typeof v === "object") walk(root, prefix?.[i] ?? items ?? {}, v, [...path, String(i)], found);
      });
      return;
    }
    return;
  }
  if (value === null || typeof value !== "object") return;
  const withProps = all.filter((b) => b.properties && typeof b.properties === "object");
  // A record, a free object or a schema without object branches: any key is allowed.
  if (withProps.length === 0 || all.some((b) => b.additionalProperties !== undefined && b.additionalProperties !== false)) return;
  for (const [key, v] of Object.entries(value as Record<string, unknown>)) {
    const known = withProps.filter((b) => key in (b.properties as object));
    if (known.length === 0) {
      found.push([...path, key].join("."));
      continue;
    }
    if (v !== null && typeof v === "object") walk(root, { anyOf: known.map((b) => (b.properties as Record<string, JsonSchema>)[key]) }, v, [...path, key], found);
  }
}
