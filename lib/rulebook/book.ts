// An organisation's rule book over the shipped tables: every sourced entry of the tables is one
// rule, found by its `key`; a stored rule replaces that entry's values and source. Pure: the
// service reads and writes the rows, this module lists, overlays and edits values.
import { ruleTablesSchema, type RuleTables } from "../markers/rules";
import type { RuleSet } from "../../shared/marker-schemas";
import { RULE_SOURCE_FIELDS, ruleSourceSchema, type RuleSource } from "../../shared/rule-book";

export type RuleValues = Record<string, unknown>;

/** One rule: where it sits (rule set), its values (the entry less its source) and its source. */
export interface RuleEntry {
  ruleSet: RuleSet;
  values: RuleValues;
  source: RuleSource;
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);
const isEntry = (v: unknown): v is Record<string, unknown> => isObject(v) && typeof v.key === "string" && typeof v.status === "string";

function split(entry: Record<string, unknown>): { values: RuleValues; source: RuleSource } {
  const values: RuleValues = {};
  const source: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(entry)) ((RULE_SOURCE_FIELDS as string[]).includes(k) ? source : values)[k] = v;
  return { values, source: ruleSourceSchema.parse(source) };
}

/** Every rule of the tables, in table order. */
export function ruleEntries(tables: RuleTables): RuleEntry[] {
  const out: RuleEntry[] = [];
  const walk = (node: unknown, ruleSet: RuleSet) => {
    if (isEntry(node)) out.push({ ruleSet, ...split(node) });
    else if (Array.isArray(node)) node.forEach((n) => walk(n, ruleSet));
    else if (isObject(node)) Object.values(node).forEach((n) => walk(n, ruleSet));
  };
  walk(tables.faa, "faa");
  walk(tables.icao, "icao");
  return out;
}

/** The tables with the stored rules put in place of the defaults; throws a ZodError when the result is not a valid table. */
export function withRules(defaults: RuleTables, rules: { values: RuleValues; source: RuleSource }[]): RuleTables {
  const byKey = new Map(rules.map((r) => [r.source.key, r]));
  const walk = (node: unknown): unknown => {
    if (isEntry(node)) {
      const stored = byKey.get(node.key as string);
      return stored ? { ...stored.values, ...stored.source } : node;
    }
    if (Array.isArray(node)) return node.map(walk);
    if (isObject(node)) return Object.fromEntries(Object.entries(node).map(([k, v]) => [k, walk(v)]));
    return node;
  };
  return ruleTablesSchema.parse(walk(defaults));
}

/** The numbers of a rule's values, by dotted path ("value", "maxSpacing.value"): what an override may change. */
export function numericValues(values: RuleValues, prefix = ""): { path: string; value: number }[] {
  return Object.entries(values).flatMap(([k, v]) => {
    const path = prefix ? `${prefix}.${k}` : k;
    if (typeof v === "number") return [{ path, value: v }];
    return isObject(v) ? numericValues(v, path) : [];
  });
}

/** A copy of the values with the numbers at the given paths replaced. */
export function withNumbers(values: RuleValues, numbers: Record<string, number>): RuleValues {
  const copy = structuredClone(values);
  for (const [path, value] of Object.entries(numbers)) {
    const parts = path.split(".");
    let node: Record<string, unknown> = copy;
    for (const part of parts.slice(0, -1)) node = node[part] as Record<string, unknown>;
    node[parts[parts.length - 1]] = value;
  }
  return copy;
}

/** Values in words for a page: "36 in", "69 kV…" stays the job of the page; here only "value unit" pairs and lists. */
export function valuesInWords(values: RuleValues): string {
  const words = (v: unknown): string => {
    if (Array.isArray(v)) return v.join(", ");
    if (isObject(v)) {
      if (typeof v.value === "number" && typeof v.unit === "string") return `${v.value} ${v.unit}`;
      return Object.entries(v).map(([k, x]) => `${k} ${words(x)}`).join("; ");
    }
    return String(v);
  };
  if (typeof values.value === "number" && typeof values.unit === "string") return `${values.value} ${values.unit}`;
  return Object.entries(values).map(([k, v]) => `${LABELS[k] ?? k}: ${words(v)}`).join("; ");
}

const LABELS: Record<string, string> = {
  wire: "wire",
  palette: "colours",
  cycle: "cycle",
  endColour: "end colour",
  allEndColourBelowCount: "all end colour below (markers)",
  minVoltageKv: "from (kV)",
  steadyRedMinCandela: "steady red at least (cd)",
  maxSeparationFromHighestWire: "energized line within",
  diameter: "sphere",
  maxSpacing: "spacing at most",
  alternateWith: "alternating with",
  choices: "choices",
};

export function numberLabel(path: string): string {
  const parts = path.split(".");
  const head = LABELS[parts[0]] ?? parts[0];
  return parts.length > 1 && parts[parts.length - 1] === "value" ? head : parts.map((p) => LABELS[p] ?? p).join(" ");
}
