// Checks an /api/v1 answer against the served OpenAPI document: the path and method are
// documented, the status is one the operation lists, and a JSON body validates (ajv, JSON
// Schema 2020-12) against that status's schema. Paths are matched generically, so endpoints
// added to the document later are checked without changing this file.
import Ajv2020 from "ajv/dist/2020";
import addFormats from "ajv-formats";

type Json = Record<string, unknown>;
export interface RecordedAnswer {
  method: string;
  path: string;
  status: number;
  contentType: string;
  body: string;
  test?: string;
}

const pointer = (...parts: string[]) => "#/" + parts.map((p) => p.replace(/~/g, "~0").replace(/\//g, "~1")).join("/");

export class ContractChecker {
  private ajv: Ajv2020;
  private templates: { template: string; regex: RegExp; literals: number }[];

  constructor(private doc: { paths: Record<string, Json>; servers: { url: string }[] }) {
    this.ajv = new Ajv2020({ strict: false, allErrors: true });
    addFormats(this.ajv);
    // The whole document is one schema resource, so `#/components/schemas/…` refs resolve.
    this.ajv.addSchema(doc as object, "openapi");
    this.templates = Object.keys(doc.paths)
      .map((template) => ({
        template,
        regex: new RegExp("^" + template.replace(/[.*+?^$()|[\]\\]/g, "\\$&").replace(/\{[^}]+\}/g, "[^/]+") + "$"),
        literals: template.split("/").filter((s) => s && !s.startsWith("{")).length,
      }))
      .sort((a, b) => b.literals - a.literals);
  }

  /** The documented path template of a request path under /api/v1, or null. */
  templateOf(pathname: string): string | null {
    const rest = pathname.replace(/^\/api\/v1/, "") || "/";
    return this.templates.find((t) => t.regex.test(rest))?.template ?? null;
  }

  /** Null when the answer keeps the contract; else what is wrong. Answers to undocumented addresses or methods (404/405) are not the contract's. */
  check(a: RecordedAnswer): string | null {
    const where = `${a.method} ${a.path} → ${a.status}`;
    const template = this.templateOf(a.path);
    if (!template) return a.status === 404 ? null : `${where}: path not in the document`;
    const operation = this.doc.paths[template][a.method.toLowerCase()] as Json | undefined;
    // An undocumented method answers 405, or 401/403 where the guard runs before the method check.
    if (!operation) return [401, 403, 405].includes(a.status) ? null : `${where}: method not in the document`;
    const responses = operation.responses as Record<string, Json>;
    const key = String(a.status) in responses ? String(a.status) : "default" in responses ? "default" : null;
    if (!key) return `${where}: status not documented (documented: ${Object.keys(responses).join(", ")})`;
    const content = responses[key].content as Record<string, Json> | undefined;
    if (!content || a.body === "") return null;
    const type = a.contentType.split(";")[0].trim();
    if (!(type in content)) return `${where}: content type ${type} not documented (documented: ${Object.keys(content).join(", ")})`;
    if (!type.includes("json")) return null;
    if (!content[type].schema) return null;
    const validate = this.ajv.getSchema(`openapi${pointer("paths", template, a.method.toLowerCase(), "responses", key, "content", type, "schema")}`);
    if (!validate) return `${where}: schema could not be compiled`;
    let body: unknown;
    try {
      body = JSON.parse(a.body);
    } catch {
      return `${where}: body is not JSON`;
    }
    if (validate(body)) return null;
    return `${where}: ${this.ajv.errorsText(validate.errors, { separator: "; " })}`;
  }
}
