import type { ReactNode } from "react";
import type { Route } from "./+types/docs.api";
import { openApiDocument } from "~/services/openapi.server";
import { Brand } from "~/components/brand";

// The API reference, rendered here from the served OpenAPI document itself (no external
// scripts or fonts), so the page and /api/v1/openapi.json always say the same. Public, like the document.
export function loader({ request }: Route.LoaderArgs) {
  return { doc: openApiDocument(new URL("/api/v1", request.url).toString()) as unknown as ApiDocument };
}

interface ApiOperation {
  summary: string;
  description?: string;
  "x-scope"?: string;
  parameters?: { name: string; in: string; required?: boolean; description?: string; schema?: Record<string, unknown> }[];
  requestBody?: { content: Record<string, { schema?: { $ref?: string }; example?: unknown }> };
  responses: Record<string, { description: string; content?: Record<string, { schema?: { $ref?: string } }> }>;
}
interface ApiDocument {
  info: { title: string; version: string; description: string };
  servers: { url: string }[];
  components: { schemas: Record<string, unknown> };
  paths: Record<string, Record<string, unknown>>;
}

const METHODS = ["get", "post", "put", "delete", "patch"] as const;
const refName = (ref?: string) => ref?.split("/").pop();
const anchor = (method: string, path: string) => `${method}-${path.replace(/[^a-z0-9]+/gi, "-")}`.replace(/-+$/, "");

/** Inline `code` in a line of the document's text. */
function inline(text: string): ReactNode[] {
  return text.split(/(`[^`]+`)/g).map((part, i) => (part.startsWith("`") && part.endsWith("`") ? <code key={i} className="figure">{part.slice(1, -1)}</code> : part));
}

/** The few text forms the document's descriptions use: "## " headings, "- " lists, paragraphs. */
function Prose({ text }: { text: string }) {
  return (
    <>
      {text.split(/\n\n+/).map((block, i) => {
        const lines = block.split("\n");
        const heading = lines[0].startsWith("## ") ? lines.shift()!.slice(3) : null;
        const items = lines.filter((l) => l.startsWith("- "));
        const prose = lines.filter((l) => !l.startsWith("- ")).join(" ");
        return (
          <div key={i} className="flex flex-col gap-1">
            {heading && <h2 className="mt-4">{heading}</h2>}
            {prose && <p className="max-w-3xl text-sm">{inline(prose)}</p>}
            {items.length > 0 && (
              <ul className="ml-5 list-disc text-sm">
                {items.map((l, j) => (
                  <li key={j}>{inline(l.slice(2))}</li>
                ))}
              </ul>
            )}
          </div>
        );
      })}
    </>
  );
}

function Operation({ method, path, op }: { method: string; path: string; op: ApiOperation }) {
  const body = op.requestBody ? Object.entries(op.requestBody.content)[0] : null;
  return (
    <section id={anchor(method, path)} className="card flex flex-col gap-2" aria-labelledby={`${anchor(method, path)}-h`}>
      <h3 id={`${anchor(method, path)}-h`} className="flex flex-wrap items-baseline gap-2">
        <span className="figure rounded bg-night-800 px-2 py-0.5 text-xs uppercase text-amber-glow">{method}</span>
        <span className="figure [overflow-wrap:anywhere]">{path}</span>
      </h3>
      <p className="font-semibold">{op.summary}</p>
      {op.description && <p className="text-sm text-night-200">{inline(op.description)}</p>}
      {op.parameters && op.parameters.length > 0 && (
        <table className="text-sm">
          <caption className="text-left text-xs text-night-400">Parameters</caption>
          <thead>
            <tr>
              <th scope="col">name</th>
              <th scope="col">in</th>
              <th scope="col">type</th>
              <th scope="col">about</th>
            </tr>
          </thead>
          <tbody>
            {op.parameters.map((p) => (
              <tr key={`${p.in}-${p.name}`}>
                <td className="figure">
                  {p.name}
                  {p.required ? " *" : ""}
                </td>
                <td>{p.in}</td>
                <td className="figure">{String(p.schema?.type ?? "")}</td>
                <td>{p.description ? inline(p.description) : ""}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {body && (
        <div className="text-sm">
          <p>
            Body: <span className="figure">{body[0]}</span>
            {body[1].schema?.$ref && (
              <>
                {" "}
                — <a href={`#schema-${refName(body[1].schema.$ref)}`}>{refName(body[1].schema.$ref)}</a>
              </>
            )}
          </p>
          {body[1].example !== undefined && (
            <pre className="figure mt-1 overflow-x-auto rounded bg-night-950 p-2 text-xs">{typeof body[1].example === "string" ? body[1].example : JSON.stringify(body[1].example, null, 2)}</pre>
          )}
        </div>
      )}
      <dl className="grid grid-cols-[4rem_1fr] gap-x-2 text-sm">
        {Object.entries(op.responses).map(([status, r]) => {
          const schema = r.content ? Object.values(r.content)[0]?.schema?.$ref : undefined;
          return (
            <div key={status} className="contents">
              <dt className="figure">{status}</dt>
              <dd>
                {r.description}
                {schema && (
                  <>
                    {" "}
                    — <a href={`#schema-${refName(schema)}`}>{refName(schema)}</a>
                  </>
                )}
              </dd>
            </div>
          );
        })}
      </dl>
    </section>
  );
}

export default function ApiReference({ loaderData }: Route.ComponentProps) {
  const { doc } = loaderData;
  const operations = Object.entries(doc.paths).flatMap(([path, item]) => METHODS.filter((m) => item[m]).map((m) => ({ path, method: m, op: item[m] as unknown as ApiOperation })));
  return (
    <main className="mx-auto flex max-w-5xl flex-col gap-4 p-6">
      <title>API reference · Duskline</title>
      <Brand className="mb-2" />
      <h1>
        {doc.info.title} <span className="text-base text-night-400">{doc.info.version}</span>
      </h1>
      <p className="text-sm">
        Base address <span className="figure">{doc.servers[0]?.url}</span>. The machine-readable document is at <a href="/api/v1/openapi.json">/api/v1/openapi.json</a>.
      </p>
      <Prose text={doc.info.description} />
      <nav aria-label="Endpoints" className="card">
        <h2 className="mb-2">Endpoints</h2>
        <ul className="columns-1 text-sm md:columns-2">
          {operations.map(({ path, method }) => (
            <li key={anchor(method, path)}>
              <a href={`#${anchor(method, path)}`} className="[overflow-wrap:anywhere]">
                <span className="figure uppercase">{method}</span> <span className="figure">{path}</span>
              </a>
            </li>
          ))}
        </ul>
      </nav>
      {operations.map(({ path, method, op }) => (
        <Operation key={anchor(method, path)} method={method} path={path} op={op} />
      ))}
      <h2 className="mt-4">Schemas</h2>
      {Object.entries(doc.components.schemas).map(([name, schema]) => (
        <details key={name} id={`schema-${name}`} className="card">
          <summary className="figure cursor-pointer">{name}</summary>
          <pre className="figure mt-2 overflow-x-auto text-xs">{JSON.stringify(schema, null, 2)}</pre>
        </details>
      ))}
    </main>
  );
}
