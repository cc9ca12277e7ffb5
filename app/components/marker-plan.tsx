import { useMemo, useState } from "react";
import { Link } from "react-router";
import { crossingPlan, type CrossingPlan, type CrossingPlanInput } from "../../lib/crossings/plan";
import { RULE_SET_LABELS } from "../../shared/crossing-details-schemas";
import type { LitMarkerSuitability, MarkerColour } from "../../shared/marker-schemas";
import type { RuleTables } from "../../lib/markers";
import { RuleStatus } from "./rule-status";
import { SupportLightsList } from "./support-lights";
import { formatLength } from "../../shared/units";
import { SpanElevation, SPHERE_FILL } from "./span-elevation";

function ColourChips({ colours }: { colours: MarkerColour[] }) {
  return (
    <ol className="flex flex-wrap items-center gap-1" aria-label="Colour sequence from support A">
      {colours.map((c, i) => (
        <li key={i} className="flex items-center gap-1 text-sm">
          <span aria-hidden="true" className="inline-block h-3.5 w-3.5 rounded-full border border-night-950" style={{ background: SPHERE_FILL[c] }} />
          {c}
          {i < colours.length - 1 && <span className="text-night-400">–</span>}
        </li>
      ))}
    </ol>
  );
}

function Suitability({ wires }: { wires: LitMarkerSuitability | null }) {
  if (!wires) {
    return <p className="text-sm text-night-400">Say which wire is highest (and its separation from the energized conductor) in the span and marking details to check whether line-powered lit markers suit this crossing.</p>;
  }
  return (
    <div className="flex flex-col gap-1 text-sm">
      <p className={`font-semibold ${wires.suitable ? "text-verdict-go" : "text-verdict-nogo"}`} data-testid="lit-suitability">
        {wires.suitable ? "Line-powered lit markers suit this crossing's wires." : "Line-powered lit markers are not suitable here."}
      </p>
      <ul className="list-disc pl-5 text-night-200">
        {wires.reasons.map((r) => (
          <li key={r}>{r}</li>
        ))}
      </ul>
    </div>
  );
}

/** The layout's notes speak the API's field names; on the page, point to the form instead. */
function pageNote(note: string): string {
  return note.includes("litConditions")
    ? "Lighting requested: every marker position is lit. Wire suitability was not checked: state the highest wire in the span and marking details."
    : note;
}

export interface MarkerPlanProps {
  crossingId: number;
  input: CrossingPlanInput;
  /** The organisation's rule book, so the what-if lays out as the saved plan does. */
  rules: RuleTables;
  plan: CrossingPlan;
  wires: LitMarkerSuitability | null;
  surface: "water" | "ground";
  canEdit: boolean;
  /** Support-structure lights shown (the page holds the switch, so the notice above lists their rules too). */
  supportsLit: boolean;
  onSupportsLitChange: (lit: boolean) => void;
}

/**
 * Marker layout summary, span elevation drawing and the what-if span length. The layout is
 * pure computation, so the what-if re-runs it in the browser as the value changes; nothing is saved.
 */
export function MarkerPlan({ crossingId, input, rules, plan: savedPlan, wires, surface, canEdit, supportsLit, onSupportsLitChange: setSupportsLit }: MarkerPlanProps) {
  const saved = input.spanLength.value;
  const unit = input.spanLength.unit;
  const [spanText, setSpanText] = useState(String(saved));
  const [lit, setLit] = useState(true);
  const whatIf = Number(spanText.replace(",", "."));
  const spanChanged = spanText.trim() !== "" && whatIf !== saved;

  const plan: CrossingPlan = useMemo(() => {
    if (!spanChanged && lit) return savedPlan;
    if (!(whatIf > 0) || !Number.isFinite(whatIf)) return { ok: false, errors: [{ path: "spanLength", message: "Enter a span length above 0." }] };
    return crossingPlan(input, { lit, rules, spanLength: spanChanged ? whatIf : undefined });
  }, [savedPlan, input, rules, lit, spanChanged, whatIf]);

  const layout = plan.ok ? plan.layout : null;
  const len = (value: number) => formatLength({ value, unit });

  return (
    <section className="card flex flex-col gap-4" aria-labelledby="markers-heading">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="markers-heading">Marker layout and span elevation</h2>
        {canEdit && (
          <Link to={`/crossings/${crossingId}/details`} className="btn-quiet no-print">
            Span and marking details
          </Link>
        )}
      </div>

      <form className="no-print flex flex-wrap items-end gap-4 rounded-lg border border-night-700 p-3" onSubmit={(e) => e.preventDefault()} aria-label="What-if">
        <div className="flex flex-col gap-1">
          <label htmlFor="whatif-span">{`What-if span length (${unit})`}</label>
          <input
            id="whatif-span"
            data-testid="whatif-span"
            type="number"
            min="0"
            step="any"
            inputMode="decimal"
            className="figure w-40"
            value={spanText}
            onChange={(e) => setSpanText(e.target.value)}
          />
        </div>
        <label className="flex items-center gap-2">
          <input type="checkbox" checked={lit} onChange={(e) => setLit(e.target.checked)} />
          Lay out as line-powered lit markers
        </label>
        <label className="flex items-center gap-2">
          <input type="checkbox" checked={supportsLit} onChange={(e) => setSupportsLit(e.target.checked)} data-testid="support-lights-toggle" />
          Light the supports (catenary lighting)
        </label>
        {(spanChanged || !lit) && (
          <button
            type="button"
            className="btn-quiet"
            onClick={() => {
              setSpanText(String(saved));
              setLit(true);
            }}
          >
            Back to the saved span
          </button>
        )}
        <p className="basis-full text-xs text-night-400">
          {spanChanged ? `What-if: ${len(whatIf)} instead of the saved ${len(saved)}. Not saved.` : `Saved span ${len(saved)}. Change it here to see the layout follow; nothing is saved.`}
        </p>
      </form>

      {!plan.ok || !layout ? (
        <div role="alert" className="rounded-md border border-verdict-nogo/60 px-3 py-2 text-sm text-verdict-nogo">
          <p className="font-semibold">No layout for these values.</p>
          <ul className="list-disc pl-5">
            {(plan.ok ? [] : plan.errors).map((e) => (
              <li key={e.path + e.message}>{e.message}</li>
            ))}
          </ul>
        </div>
      ) : (
        <>
          <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2 lg:grid-cols-4" aria-live="polite">
            <div>
              <dt className="text-night-400">Markers</dt>
              <dd className="figure text-2xl text-amber-glow" data-testid="marker-count">
                {layout.count}
              </dd>
              <dd className="text-night-400">{`${layout.intervals} equal intervals`}</dd>
            </div>
            <div>
              <dt className="text-night-400">Spacing</dt>
              <dd className="figure text-lg">{len(layout.spacing.value)}</dd>
              <dd className="text-night-400">
                {`at most ${formatLength(layout.maxSpacing, { maximumFractionDigits: 2 })}`}
                {layout.maxSpacingSource === "user" ? " (tightened)" : ""}
                {layout.maxSpacingInterpolated ? " (interpolated between tabulated diameters)" : ""}
              </dd>
            </div>
            <div>
              <dt className="text-night-400">Sphere diameter</dt>
              <dd className="figure text-lg">{formatLength(layout.markerDiameter)}</dd>
              <dd className="text-night-400">{RULE_SET_LABELS[layout.ruleSet]}</dd>
            </div>
            <div>
              <dt className="text-night-400">On</dt>
              <dd>{layout.wire}</dd>
              {layout.wiresAtTop.count > 1 && (
                <dd className="text-night-400" data-testid="markers-per-wire">
                  {layout.wiresAtTop.markersPerWire.map((n, i) => `wire ${i + 1}: ${n}`).join(", ")}
                </dd>
              )}
            </div>
            <div className="sm:col-span-2 lg:col-span-4">
              <dt className="text-night-400">Colours from support A</dt>
              <dd>
                <ColourChips colours={layout.positions.filter((p) => layout.wiresAtTop.method !== "each" || p.wire === 1).map((p) => p.colour)} />
              </dd>
            </div>
          </dl>

          <figure className="flex flex-col gap-2">
            <SpanElevation curve={plan.curve} figures={plan.figures} layout={layout} surface={surface} supportLights={supportsLit ? plan.supportLights : null} />
            <figcaption className="text-xs text-night-400">
              Heights are measured from the support bases; the ground or water line is drawn at its stated level (level with the bases unless stated). The conductor is a catenary through both
              attachments. Lit positions are ringed{plan.figures.markedWireOffset > 0 ? "; lit devices hang on the energized conductor below the shield wire" : ""}.
            </figcaption>
          </figure>

          {plan.assumed.length > 0 && (
            <div className="rounded-md border border-night-600 px-3 py-2 text-sm">
              <p className="font-semibold text-night-200">Not stated, so assumed for the drawing:</p>
              <ul className="list-disc pl-5 text-night-200">
                {plan.assumed.map((a) => (
                  <li key={a}>{a}</li>
                ))}
              </ul>
            </div>
          )}

          <div className="grid gap-4 lg:grid-cols-2">
            <div className="flex flex-col gap-2">
              <h3 className="font-semibold">Notes</h3>
              <ul className="list-disc pl-5 text-sm text-night-200">
                {layout.notes.map((n) => (
                  <li key={n}>{pageNote(n)}</li>
                ))}
              </ul>
              <h3 className="mt-2 font-semibold">Lit markers</h3>
              <Suitability wires={wires} />
              {supportsLit && (
                <>
                  <h3 className="mt-2 font-semibold">Support-structure lights</h3>
                  <SupportLightsList lighting={plan.supportLights} unit={unit} />
                </>
              )}
            </div>
            <div>
              <h3 className="mb-1 font-semibold">References</h3>
              <table>
                <thead>
                  <tr>
                    <th scope="col">Rule</th>
                    <th scope="col">Section</th>
                    <th scope="col">Status</th>
                  </tr>
                </thead>
                <tbody>
                  {layout.references.map((r) => (
                    <tr key={r.key}>
                      <td>
                        <Link to={`/rules/${r.key}`}>{r.title}</Link>
                        <p className="text-xs text-night-400">{r.rule}</p>
                      </td>
                      <td className="whitespace-nowrap">{r.section}</td>
                      <td>
                        <RuleStatus source={r} />
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </div>
        </>
      )}
    </section>
  );
}
