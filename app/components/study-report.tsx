import type { ReportSection, StudyReportModel } from "../../lib/report/study-report";
import { NightCells } from "./night-calendar";
import { VerdictBadge } from "./verdict-badge";
import { formatUtc } from "../../shared/format";

/** The study report as a page (print CSS in app.css `.report`); the PDF renders the same model. */
export function StudyReport({ model }: { model: StudyReportModel }) {
  return (
    <article className="report flex flex-col gap-4">
      <header>
        <h1>{model.title}</h1>
        <p className="text-sm text-night-400">
          {model.subtitle} · generated {formatUtc(model.generatedAt)}
        </p>
      </header>
      <aside role="note" aria-label="Safety caution" className="report-caution rounded-lg border border-amber-glow/50 bg-amber-glow/10 px-4 py-3 text-sm">
        <p>{model.caution}</p>
        <p className="mt-1">{model.deference}</p>
      </aside>
      <section aria-labelledby="report-verdict" className="report-block">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="report-verdict">Verdict</h2>
          <VerdictBadge status={model.verdict.status} large />
          <span className="text-sm text-night-400">judged on {model.verdict.basis}</span>
        </div>
        <ul className="mt-1 list-disc pl-6">
          {model.verdict.reasons.map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      </section>
      {model.sections.map((s, i) => (
        <ReportBlock key={i} section={s} />
      ))}
    </article>
  );
}

function ReportBlock({ section }: { section: ReportSection }) {
  return (
    <section className="report-block break-inside-avoid-page">
      <h2 className="mb-2">{section.heading}</h2>
      {section.kind === "facts" && (
        <table>
          <tbody>
            {section.rows.map(([k, v]) => (
              <tr key={k}>
                <th scope="row" className="pr-4 text-left font-normal text-night-400">
                  {k}
                </th>
                <td>{v}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {section.kind === "table" && section.rows.length > 0 && <DataTable columns={section.columns} rows={section.rows} />}
      {section.kind === "list" && (
        <ul className="list-disc pl-6">
          {section.items.map((item) => (
            <li key={item}>{item}</li>
          ))}
        </ul>
      )}
      {section.kind === "span" && (
        <svg viewBox={section.drawing.viewBox} className="w-full max-w-2xl" role="img" aria-label={`Span elevation with ${section.drawing.markers.length} markers`}>
          <line x1={section.drawing.surface.x1} y1={section.drawing.surface.y} x2={section.drawing.surface.x2} y2={section.drawing.surface.y} stroke="currentColor" strokeOpacity={0.5} />
          {(["a", "b"] as const).map((k) => (
            <line key={k} x1={section.drawing.supports[k].x} y1={section.drawing.supports[k].base} x2={section.drawing.supports[k].x} y2={section.drawing.supports[k].top} stroke="currentColor" strokeWidth={3} />
          ))}
          <polyline points={section.drawing.conductorPoints} fill="none" stroke="currentColor" />
          {section.drawing.markers.map((m, i) => (
            <circle key={i} cx={m.x} cy={m.y} r={4} fill="#e8590c" />
          ))}
        </svg>
      )}
      {section.kind === "nights" && (
        <div className="flex flex-col gap-2">
          <NightCells nights={section.nights} />
          {section.exceptions.length > 0 && <DataTable columns={["Night of", "Status", "Dark min", "Unknown min", "Required min"]} rows={section.exceptions} />}
        </div>
      )}
      {"note" in section && section.note && <p className="mt-1 text-sm text-night-400">{section.note}</p>}
    </section>
  );
}

function DataTable({ columns, rows }: { columns: string[]; rows: string[][] }) {
  return (
    <div className="overflow-x-auto">
      <table>
        <thead>
          <tr>
            {columns.map((c) => (
              <th key={c} scope="col">
                {c}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i}>
              {r.map((cell, j) => (
                <td key={j} className={j > 0 ? "figure" : undefined}>
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
