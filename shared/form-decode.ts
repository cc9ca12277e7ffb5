// The one way a page form's text becomes typed values: the form's own zod schema (the API's
// where there is one) says which fields are numbers, flags, lists or nested objects, and
// `decodeForm` turns the submitted text into those shapes before the schema validates it.
// Every page reads numbers the same way (numberFromText), so "12,5" and "1,000" mean the same
// on every form.
//
// Why not @conform-to/zod: its coercion keys nested values by dotted field names
// ("spanLength.value") and reports errors under them, while these pages name their fields flat
// (spanLengthValue, the names the field errors and the browser tests use); and its number
// coercion reads "12,5" as NaN. Walking the schema here is a few dozen lines that keep both.
import type { z } from "zod";

/** Spaces that may group digits: space, no-break space, narrow no-break space. */
const GROUP_SPACE = /[ \u00a0\u202f]/g;
/** Digits grouped by thousands with commas or spaces, optional decimals: 1,000 / 12 500.5. */
const GROUPED = /^[-+]?[1-9]\d{0,2}(?:(?:,\d{3})+|(?:[ \u00a0\u202f]\d{3})+)(?:\.\d+)?$/;
/** A plain decimal number, with a point or a comma: 12 / -0.5 / 12,5 / .5 / 1e3. */
const DECIMAL = /^[-+]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:e[-+]?\d+)?$/i;

/**
 * A number as people type it: "12,5" and "12.5" are 12.5; "1,000" and "1 000" are 1000 (three
 * digits after a comma group thousands, so "0,125" is 0.125 but "1,250" is 1250); "−3" is -3.
 * Empty text → undefined (not stated); text that is not a number → NaN.
 */
export function numberFromText(text: string): number | undefined {
  const t = text.trim().replace(/^[−–]/, "-");
  if (t === "") return undefined;
  if (GROUPED.test(t)) return Number(t.replace(/,/g, "").replace(GROUP_SPACE, ""));
  if (DECIMAL.test(t)) return Number(t.replace(",", "."));
  return Number.NaN;
}

/** Numbers typed as one text ("-8 -5 2" or "0, 20, 40"): separated by spaces, commas or semicolons. */
function numberList(text: string): unknown[] | undefined {
  if (text.trim() === "") return undefined;
  return text
    .split(/[\s,;]+/)
    .filter(Boolean)
    .map((x) => decodeNumber(x));
}

/** Form text as a number; text that is not one stays text, so the schema names the field. */
function decodeNumber(value: unknown): unknown {
  if (typeof value !== "string") return value;
  const n = numberFromText(value);
  return Number.isNaN(n) ? value : n;
}

const isBlank = (v: unknown) => typeof v === "string" && v.trim() === "";
const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
const capitalised = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

type Def = { type: string; [key: string]: unknown };
const defOf = (schema: z.ZodType): Def => (schema as unknown as { _zod: { def: Def } })._zod.def;

/** Wrappers that accept an absent value (or wrap one schema without changing its kind). */
const OPTIONAL_WRAPPERS = new Set(["optional", "nullable", "default", "prefault", "catch"]);
const PLAIN_WRAPPERS = new Set(["readonly", "nonoptional"]);

/** The schema under wrappers and pipes: what kind of value the field finally takes. */
function baseOf(schema: z.ZodType): Def {
  let def = defOf(schema);
  for (;;) {
    if (OPTIONAL_WRAPPERS.has(def.type) || PLAIN_WRAPPERS.has(def.type)) def = defOf(def.innerType as z.ZodType);
    else if (def.type === "pipe") def = defOf((defOf(def.in as z.ZodType).type === "transform" ? def.out : def.in) as z.ZodType);
    else return def;
  }
}

const takesText = (def: Def) => ["string", "enum", "literal", "template_literal"].includes(def.type);

/**
 * A submitted form as the schema's input. Text for a number field is read with numberFromText
 * (text that is no number stays text and is refused by the schema under the field's name);
 * an empty optional field is not stated (its default applies); a checkbox is true when sent as
 * "on" or "true"; a list of numbers may be typed as one text; a nested object the form sends
 * flat is gathered from its flat names (spanLengthValue → spanLength.value, the names
 * `fieldName` gives its errors). Values that are not text (a JSON body) are left to the schema.
 */
export function decodeForm(schema: z.ZodType, input: unknown): unknown {
  const def = defOf(schema);
  switch (def.type) {
    case "optional":
    case "nullable":
    case "default":
    case "prefault":
    case "catch":
      return decodeForm(def.innerType as z.ZodType, isBlank(input) ? undefined : input);
    case "readonly":
    case "nonoptional":
      return decodeForm(def.innerType as z.ZodType, input);
    case "pipe":
      // z.preprocess is a pipe from a transform: decode for the schema after it.
      return decodeForm((defOf(def.in as z.ZodType).type === "transform" ? def.out : def.in) as z.ZodType, input);
    case "number":
      return isBlank(input) ? undefined : decodeNumber(input);
    case "boolean":
      if (input === undefined || input === "" || input === "off" || input === "false") return false;
      return input === "on" || input === "true" ? true : input;
    case "array": {
      const element = def.element as z.ZodType;
      if (typeof input === "string" && baseOf(element).type === "number") return numberList(input);
      return Array.isArray(input) ? input.map((v) => decodeForm(element, v)) : input;
    }
    case "record":
      if (!isPlainObject(input)) return input;
      return Object.fromEntries(Object.entries(input).map(([k, v]) => [k, decodeForm(def.valueType as z.ZodType, v)]));
    case "object":
      return isPlainObject(input) ? decodeObject(def.shape as Record<string, z.ZodType>, input) : input;
    case "intersection":
      return decodeForm(def.right as z.ZodType, decodeForm(def.left as z.ZodType, input));
    case "union": {
      const options = def.options as z.ZodType[];
      const bases = options.map(baseOf);
      if (typeof input === "string") {
        if (bases.some(takesText)) return input;
        return bases.some((b) => b.type === "number") ? (isBlank(input) ? undefined : decodeNumber(input)) : input;
      }
      if (!isPlainObject(input)) return input;
      // Objects (a discriminated union such as the schedule): each option decodes its own fields.
      return options.reduce<unknown>((value, option, i) => (bases[i].type === "object" ? decodeForm(option, value) : value), input);
    }
    default:
      return input;
  }
}

/** A form validated by its schema after decoding: what `parseForm` (app/utils/forms.server.ts) runs for every page action. */
export function safeParseForm<T extends z.ZodType>(schema: T, input: unknown): z.ZodSafeParseResult<z.output<T>> {
  return schema.safeParse(decodeForm(schema, input)) as z.ZodSafeParseResult<z.output<T>>;
}

function decodeObject(shape: Record<string, z.ZodType>, input: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...input };
  for (const [key, field] of Object.entries(shape)) {
    let raw = input[key];
    if (raw === undefined) {
      const base = baseOf(field);
      // A required object the form does not send at all is still gathered ({}), so its errors carry the flat names.
      if (base.type === "object") raw = gatherFlat(key, base.shape as Record<string, z.ZodType>, input) ?? (OPTIONAL_WRAPPERS.has(defOf(field).type) ? undefined : {});
    }
    const value = decodeForm(field, raw);
    if (value === undefined) delete out[key];
    else out[key] = value;
  }
  return out;
}

/** { value, unit } of `spanLength` from the flat fields spanLengthValue and spanLengthUnit; undefined when none of them is sent. */
function gatherFlat(key: string, shape: Record<string, z.ZodType>, input: Record<string, unknown>): Record<string, unknown> | undefined {
  const entries = Object.keys(shape)
    .map((sub) => [sub, input[key + capitalised(sub)]] as const)
    .filter(([, v]) => v !== undefined);
  return entries.length ? Object.fromEntries(entries) : undefined;
}
