import { useState } from "react";
import { Form, Link, useNavigation } from "react-router";
import type { CrossingOptionsView, LayoutCounts } from "~/services/lighting-options.server";
import { FEASIBILITY_STATUSES, INSTALLATION_METHODS, OPTION_KINDS, type FeasibilityStatus, type OptionKind } from "../../shared/cost-schemas";
import { formatMoney, formatPercent } from "../../shared/format";
import { INSTALLATION_METHOD_LABELS, OPTION_KIND_LABELS, type LightingOptionValues } from "../../shared/lighting-option-schemas";
import { ChartFrame } from "./charts/chart-frame";
import { CumulativeCostChart } from "./charts/cumulative-cost";
import { Field, FormMessage, type FieldErrors } from "./forms";
import { VerdictBadge } from "./verdict-badge";

export const FEASIBILITY_LABELS: Record<FeasibilityStatus, string> = {
  go: "Go",
  marginal: "Marginal",
  "no-go": "No-go",
  "insufficient-data": "Insufficient data",
  unknown: "Unknown",
};

export function FeasibilityBadge({ status }: { status: FeasibilityStatus }) {
  if (status === "unknown") return <span className="inline-flex rounded-full border border-night-400 px-2.5 py-0.5 text-sm text-night-200">? Unknown</span>;
  return <VerdictBadge status={status} />;
}

/** Options side by side on life-cycle cost, the recommendation in words, and cumulative cost over the horizon. */
export function OptionsComparison({ crossingId, view, canEdit }: { crossingId: number; view: CrossingOptionsView; canEdit: boolean }) {
  const { options, comparison, currency, chart } = view;
  const money = (v: number) => formatMoney(v, currency);
  const byIndex = new Map(comparison.rows.map((r) => [r.index, r]));
  const lastYear = chart.rows.length - 1;
  return (
    <section className="card flex flex-col gap-4" aria-labelledby="options-heading">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="options-heading">Lighting options and life-cycle cost</h2>
        {canEdit && (
          <Link to={`/crossings/${crossingId}/options/new`} className="btn-quiet no-print">
            Add an option
          </Link>
        )}
      </div>
      {options.length === 0 ? (
        <p className="text-night-400">No options yet. Add the ways of marking and lighting this crossing you want to compare: line-powered or solar lit markers, lights on the supports, or unlit markers.</p>
      ) : (
        <>
          {comparison.recommendation ? (
            <div className="rounded-lg border border-verdict-go/60 bg-verdict-go/10 px-4 py-3" data-testid="recommendation">
              <p className="font-semibold text-verdict-go">{`Recommended: ${comparison.recommendation.name}`}</p>
              <ul className="mt-1 list-disc pl-5 text-sm text-night-100">
                {comparison.recommendation.reasons.map((r) => (
                  <li key={r}>{r}</li>
                ))}
              </ul>
            </div>
          ) : null}
          {comparison.warnings.map((w) => (
            <p key={w} role="alert" className="rounded-md border border-verdict-marginal/60 px-3 py-2 text-sm text-verdict-marginal">
              {w}
            </p>
          ))}
          <div className="overflow-x-auto">
            <table data-testid="options-comparison">
              <caption className="mb-2 text-left text-xs text-night-400">
                {`Amounts in ${currency}. Year-0 costs as spent; maintenance and replacements discounted to year 0. Ranked by equivalent annual cost.`}
              </caption>
              <thead>
                <tr>
                  <th scope="col">Option</th>
                  <th scope="col">Units</th>
                  <th scope="col">Capital</th>
                  <th scope="col">Installation</th>
                  <th scope="col">Outage</th>
                  <th scope="col">Maintenance (PV)</th>
                  <th scope="col">Replacements (PV)</th>
                  <th scope="col">Total PV</th>
                  <th scope="col">Equivalent annual cost</th>
                  <th scope="col">Replaced in year</th>
                  <th scope="col">Feasibility</th>
                </tr>
              </thead>
              <tbody>
                {options.map((o, i) => {
                  const r = byIndex.get(i)!;
                  return (
                    <tr key={o.id} className={r.recommended ? "bg-verdict-go/5" : undefined}>
                      <th scope="row" className="border-b border-night-800 font-normal">
                        {canEdit ? <Link to={`/crossings/${crossingId}/options/${o.id}`}>{o.name}</Link> : o.name}
                        {r.recommended && <span className="ml-2 text-xs text-verdict-go">recommended</span>}
                        <div className="text-xs text-night-400">
                          {OPTION_KIND_LABELS[o.kind]} · {INSTALLATION_METHOD_LABELS[o.installationMethod]} · {`${o.horizonYears} y at ${formatPercent(o.discountRatePercent / 100, 1)}`} · rank {r.costRank}
                        </div>
                      </th>
                      <td className="figure" data-testid={`option-units-${o.id}`}>
                        {o.effectiveUnits}
                        {o.unitsFromLayout && <div className="max-w-48 text-xs text-night-400">{`from the ${o.unitsBasis}`}</div>}
                      </td>
                      <td className="figure">{money(r.capital)}</td>
                      <td className="figure">{money(r.installation)}</td>
                      <td className="figure">{money(r.outage)}</td>
                      <td className="figure">{money(r.maintenancePV)}</td>
                      <td className="figure">{money(r.replacementsPV)}</td>
                      <td className="figure font-semibold">{money(r.totalPV)}</td>
                      <td className="figure">{`${money(r.equivalentAnnualCost)}/y`}</td>
                      <td className="figure">{r.replacementYears.length ? r.replacementYears.join(", ") : "—"}</td>
                      <td className="min-w-56">
                        <FeasibilityBadge status={r.feasibility.status} />
                        <div className="mt-1 text-xs text-night-200">
                          {r.feasibility.justification}
                          {o.studyId && (
                            <>
                              {" "}
                              <Link to={`/studies/${o.studyId}`}>{`Study #${o.studyId}`}</Link>
                            </>
                          )}
                        </div>
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          <ChartFrame
            title={`Cumulative cost over the horizon (present value, ${currency})`}
            summary={`Discounted spend accumulated year by year, replacements shown as steps. At year ${lastYear}: ${chart.series
              .map((s) => {
                const rows = chart.rows.filter((row) => row[s.key] !== undefined);
                const last = rows[rows.length - 1];
                return `${s.label} ${money(last?.[s.key] ?? 0)} (year ${last?.year ?? 0})`;
              })
              .join("; ")}.`}
          >
            <CumulativeCostChart rows={chart.rows} series={chart.series} currency={currency} />
          </ChartFrame>
        </>
      )}
      <p className="text-xs text-night-400">{`Starting figures of new options: ${view.demoLabel}`}</p>
    </section>
  );
}

export interface OptionFormContext {
  /** Counts of the crossing's current layouts (units left empty follow them): markers, and lights on the supports. */
  counts: LayoutCounts;
  /** What line-powered options are rated with: the latest study (or its absence). */
  lineFedFeasibility: { status: FeasibilityStatus; justification: string };
  currency: string;
  demoLabel: string;
}

export function LightingOptionForm({
  values,
  context,
  errors,
  message,
  submitLabel,
}: {
  values: LightingOptionValues;
  context: OptionFormContext;
  errors?: FieldErrors;
  message?: string;
  submitLabel: string;
}) {
  const busy = useNavigation().state === "submitting";
  const [kind, setKind] = useState<OptionKind>(values.kind);
  const [outage, setOutage] = useState(values.outageNeeded);
  const money = `(${context.currency})`;
  const num = (name: keyof LightingOptionValues, label: string, hint?: string, step = "any") => (
    <Field name={name} label={label} errors={errors} hint={hint}>
      <input id={name} name={name} type="number" step={step} min="0" defaultValue={(values[name] as number | null) ?? ""} className="figure" />
    </Field>
  );
  return (
    <Form method="post" className="flex max-w-3xl flex-col gap-4" noValidate>
      {message && <FormMessage tone="error">{message}</FormMessage>}
      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Option</legend>
        <Field name="name" label="Name" errors={errors}>
          <input id="name" name="name" defaultValue={values.name} required maxLength={120} />
        </Field>
        <Field name="kind" label="Kind" errors={errors}>
          <select id="kind" name="kind" value={kind} onChange={(e) => setKind(e.target.value as OptionKind)}>
            {OPTION_KINDS.map((k) => (
              <option key={k} value={k}>
                {OPTION_KIND_LABELS[k]}
              </option>
            ))}
          </select>
        </Field>
        <div className="grid gap-3 sm:grid-cols-2">
          {num(
            "units",
            "Units",
            kind === "structure-supply"
              ? `Leave empty to follow the support-light layout${context.counts.supportLights ? ` (now ${context.counts.supportLights.basis})` : ""}.`
              : `Leave empty to follow the marker layout${context.counts.markers ? ` (now ${context.counts.markers})` : ""}.`,
            "1",
          )}
          {num("unitPrice", `Unit price ${money}`)}
        </div>
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Installation</legend>
        <Field name="installationMethod" label="Method" errors={errors}>
          <select id="installationMethod" name="installationMethod" defaultValue={values.installationMethod}>
            {INSTALLATION_METHODS.map((m) => (
              <option key={m} value={m}>
                {INSTALLATION_METHOD_LABELS[m]}
              </option>
            ))}
          </select>
        </Field>
        <div className="grid gap-3 sm:grid-cols-3">
          {num("mobilisation", `Mobilisation ${money}`, "Once per visit.")}
          {num("ratePerHour", `Rate per hour ${money}`)}
          {num("minutesPerUnit", "Minutes per unit")}
        </div>
        <label className="flex items-center gap-2">
          <input type="checkbox" name="outageNeeded" checked={outage} onChange={(e) => setOutage(e.target.checked)} />
          The line must be taken out of service for the work
        </label>
        {outage ? num("outageCost", `Outage cost per visit ${money}`) : <input type="hidden" name="outageCost" value="0" />}
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Life cycle</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          {num("annualMaintenance", `Annual maintenance, all units ${money}`)}
          {num("serviceLifeYears", "Service life (years)", "Equipment is bought and installed again at each multiple inside the horizon.", "1")}
          {num("horizonYears", "Study horizon (years)", undefined, "1")}
          {num("discountRatePercent", "Discount rate (% per year)", "Real rate, e.g. 8.")}
        </div>
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Feasibility</legend>
        {kind === "line-powered" ? (
          <p className="text-sm text-night-200">
            Line-powered lit markers are rated by the crossing's latest feasibility study, not here. Now: <FeasibilityBadge status={context.lineFedFeasibility.status} />{" "}
            {context.lineFedFeasibility.justification}
          </p>
        ) : (
          <>
            <Field name="feasibilityStatus" label="Is this option feasible here?" errors={errors}>
              <select id="feasibilityStatus" name="feasibilityStatus" defaultValue={values.feasibilityStatus ?? ""}>
                <option value="">Choose…</option>
                {FEASIBILITY_STATUSES.map((s) => (
                  <option key={s} value={s}>
                    {FEASIBILITY_LABELS[s]}
                  </option>
                ))}
              </select>
            </Field>
            <Field name="feasibilityJustification" label="Why" errors={errors} hint="E.g. solar exposure, access for maintenance, whether lighting is required at all.">
              <textarea id="feasibilityJustification" name="feasibilityJustification" rows={3} defaultValue={values.feasibilityJustification ?? ""} />
            </Field>
          </>
        )}
      </fieldset>
      <p className="text-xs text-night-400">{context.demoLabel}</p>
      <button type="submit" className="btn self-start" disabled={busy}>
        {busy ? "Saving…" : submitLabel}
      </button>
    </Form>
  );
}
