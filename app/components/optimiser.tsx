// The optimiser's settings form and result table (issue 13), shared by the crossing page
// (/crossings/:id/optimise) and the fleet page (/optimise). The work runs as a job; its page shows
// the progress and comes back here with ?job= when it is done.
import { useState, type ReactNode } from "react";
import { Form, useNavigation } from "react-router";
import type { FieldErrors } from "./forms";
import { Field, FormMessage } from "./forms";
import { VerdictBadge } from "./verdict-badge";
import { candidateErrorLabel } from "../../shared/optimise-forms";
import { formatAvailability, formatHours, formatMoney } from "../../shared/format";
import type { VerdictStatus } from "../../shared/study-schemas";
import { OPTIMISE_LIMITS } from "../../shared/optimise-schemas";

export interface OptimiserDevice {
  id: number;
  name: string;
  minCurrentA: number;
  turnOnCurrentA?: number;
  lifeYears: number;
}

/** Every error of the form as a line, a candidate's named after its device. */
function ErrorSummary({ errors, names }: { errors?: FieldErrors; names?: string[] }) {
  if (!errors) return null;
  const lines = Object.entries(errors).flatMap(([field, messages]) => {
    const who = candidateErrorLabel(field, names ?? []);
    return (messages ?? []).map((m) => (who ? `${who}: ${m}` : m));
  });
  return (
    <FormMessage tone="error">
      <ul className="list-inside list-disc">
        {lines.map((l) => (
          <li key={l}>{l}</li>
        ))}
      </ul>
    </FormMessage>
  );
}

export function OptimiserForm({ devices, errors, names, children }: { devices: OptimiserDevice[]; errors?: FieldErrors; names?: string[]; children?: ReactNode }) {
  const busy = useNavigation().state === "submitting";
  const [mode, setMode] = useState<"list" | "range">("list");
  return (
    <Form method="post" className="card flex flex-col gap-4" noValidate aria-label="Optimiser settings">
      <ErrorSummary errors={errors} names={names} />
      {children}
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-2 font-semibold">Candidate devices</legend>
        <table>
          <thead>
            <tr>
              <th scope="col">Try</th>
              <th scope="col">Device profile</th>
              <th scope="col">Unit cost</th>
              <th scope="col">Installation</th>
              <th scope="col">Life (years)</th>
            </tr>
          </thead>
          <tbody>
            {devices.map((d) => (
              <tr key={d.id}>
                <td>
                  <input type="checkbox" id={`use-${d.id}`} name={`use-${d.id}`} defaultChecked aria-label={`Try ${d.name}`} />
                </td>
                <td>
                  <label htmlFor={`use-${d.id}`}>{d.name}</label>
                  <span className="block text-xs text-night-400">
                    drop-out {d.minCurrentA} A{d.turnOnCurrentA !== undefined && d.turnOnCurrentA > d.minCurrentA ? `, turn-on ${d.turnOnCurrentA} A` : ""}
                  </span>
                </td>
                <td>
                  <input name={`unitCost-${d.id}`} aria-label={`Unit cost of ${d.name}`} type="number" step="any" min="0" defaultValue={1000} className="figure w-28" />
                </td>
                <td>
                  <input name={`installCost-${d.id}`} aria-label={`Installation cost of ${d.name}`} type="number" step="any" min="0" defaultValue={500} className="figure w-28" />
                </td>
                <td>
                  <input name={`lifeYears-${d.id}`} aria-label={`Life of ${d.name}`} type="number" step="any" min="0" defaultValue={d.lifeYears} className="figure w-20" />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-2 font-semibold">Storage sizes</legend>
        <Field name="storageMode" label="Offer" errors={errors}>
          <select id="storageMode" name="storageMode" value={mode} onChange={(e) => setMode(e.target.value as "list" | "range")}>
            <option value="list">A list of sizes</option>
            <option value="range">A range with a step</option>
          </select>
        </Field>
        {mode === "list" ? (
          <Field name="storageSizesWh" label="Sizes (Wh)" errors={errors} hint="Separated by commas or spaces.">
            <input id="storageSizesWh" name="storageSizesWh" defaultValue="0, 10, 20, 40, 80, 160" className="figure" />
          </Field>
        ) : (
          <div className="grid grid-cols-3 gap-2">
            <Field name="storageRangeFromWh" label="From (Wh)" errors={errors}>
              <input id="storageRangeFromWh" name="storageRangeFromWh" type="number" step="any" defaultValue={0} className="figure" />
            </Field>
            <Field name="storageRangeToWh" label="To (Wh)" errors={errors}>
              <input id="storageRangeToWh" name="storageRangeToWh" type="number" step="any" defaultValue={200} className="figure" />
            </Field>
            <Field name="storageRangeStepWh" label="Step (Wh)" errors={errors}>
              <input id="storageRangeStepWh" name="storageRangeStepWh" type="number" step="any" defaultValue={20} className="figure" />
            </Field>
          </div>
        )}
        <Field name="storageCostPerWh" label="Storage cost per Wh" errors={errors}>
          <input id="storageCostPerWh" name="storageCostPerWh" type="number" step="any" min="0" defaultValue={1.5} className="figure" />
        </Field>
        <Field name="storageLifeYears" label="Storage life (years)" errors={errors}>
          <input id="storageLifeYears" name="storageLifeYears" type="number" step="any" min="0" defaultValue={8} className="figure" />
        </Field>
      </fieldset>
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="mb-2 font-semibold">Money, time and load</legend>
        <Field name="horizonYears" label="Horizon (years)" errors={errors}>
          <input id="horizonYears" name="horizonYears" type="number" step="any" defaultValue={20} className="figure" />
        </Field>
        <Field name="discountRatePercent" label="Discount rate (%)" errors={errors}>
          <input id="discountRatePercent" name="discountRatePercent" type="number" step="any" defaultValue={5} className="figure" />
        </Field>
        <Field name="loadGrowthPercentPerYear" label="Load growth (% per year)" errors={errors} hint="−2 for a line losing load.">
          <input id="loadGrowthPercentPerYear" name="loadGrowthPercentPerYear" type="number" step="any" defaultValue={0} className="figure" />
        </Field>
        <label className="flex items-center gap-2 sm:col-span-3">
          <input type="checkbox" name="requireGoInLastYear" /> Require go in the last year of each device's life (the load grown by the rate above)
        </label>
        <Field
          name="monthlyTemperatureC"
          label="Monthly mean temperatures, Jan–Dec (°C)"
          errors={errors}
          hint="Twelve numbers. Empty: each crossing's stored normals (none: no cold derating). Months the load profile recorded temperatures for use those."
        >
          <input id="monthlyTemperatureC" name="monthlyTemperatureC" className="figure" placeholder="-8 -5 2 9 15 21 25 24 18 10 2 -5" />
        </Field>
        <Field
          name="switchedOut"
          label="Line switched out (what-if)"
          errors={errors}
          hint="One period a line: name, start, end (dates or date-times, UTC unless a zone is written), e.g. “Spring outage, 2025-04-01, 2025-04-15”. The current reads 0 A inside."
        >
          <textarea id="switchedOut" name="switchedOut" rows={2} className="figure sm:col-span-3" />
        </Field>
      </fieldset>
      <p className="text-sm text-night-400">
        At most {OPTIMISE_LIMITS.candidates} devices, {OPTIMISE_LIMITS.sizes} sizes and {OPTIMISE_LIMITS.pairs} device × size pairs. The run continues in the background; its page
        shows the progress.
      </p>
      <div>
        <button type="submit" className="btn self-start" disabled={busy}>
          {busy ? "Starting…" : "Find the cheapest that reaches go"}
        </button>
      </div>
    </Form>
  );
}

export interface OptimiserRow {
  name: string;
  storageWh: number;
  verdict: VerdictStatus | null;
  evaluation: string;
  availability: number | null;
  longestDarkStretchHours: number | null;
  presentValue: number;
  equivalentAnnualCost: number;
}

export function OptimiserResult({
  rows,
  recommended,
  closest,
  simulations,
}: {
  rows: OptimiserRow[];
  recommended: { name: string; storageWh: number } | null;
  closest: { name: string; storageWh: number; wouldTake: string } | null;
  simulations: number;
}) {
  const isRecommended = (r: OptimiserRow) => recommended?.name === r.name && recommended.storageWh === r.storageWh;
  const sorted = [...rows].sort((a, b) => a.equivalentAnnualCost - b.equivalentAnnualCost);
  return (
    <section className="card flex flex-col gap-3 overflow-x-auto" aria-labelledby="optimiser-result">
      <h2 id="optimiser-result">Result</h2>
      {recommended ? (
        <p data-testid="recommended">
          Recommended: <strong>{recommended.name}</strong> with <strong>{recommended.storageWh} Wh</strong> of storage, the cheapest per year that reaches go.
        </p>
      ) : closest ? (
        <p data-testid="closest">
          Nothing offered reaches go. Closest: <strong>{closest.name}</strong> with {closest.storageWh} Wh. {closest.wouldTake}
        </p>
      ) : (
        <p>Nothing offered reaches go, and the data are not enough for a verdict.</p>
      )}
      <p className="text-sm text-night-400">
        {simulations} simulations for {rows.length} device × size pairs: more storage never darkens a lit moment, so sizes above the smallest go are go without running, and
        sizes below a larger one that is not go are not go (verdict left open).
      </p>
      <table>
        <thead>
          <tr>
            <th scope="col">Device</th>
            <th scope="col">Storage</th>
            <th scope="col">Verdict</th>
            <th scope="col">Availability</th>
            <th scope="col">Longest dark</th>
            <th scope="col">Present value</th>
            <th scope="col">Per year</th>
          </tr>
        </thead>
        <tbody>
          {sorted.map((r) => (
            <tr key={`${r.name}|${r.storageWh}`} className={isRecommended(r) ? "font-semibold" : undefined}>
              <td>
                {r.name}
                {isRecommended(r) && <span className="ml-2 text-amber-glow">recommended</span>}
              </td>
              <td className="figure">{r.storageWh} Wh</td>
              <td>{r.verdict ? <VerdictBadge status={r.verdict} /> : <span className="text-night-400">not go</span>}{r.evaluation !== "simulated" && <span className="ml-1 text-xs text-night-400">(inferred)</span>}</td>
              <td className="figure">{r.availability === null ? "—" : formatAvailability(r.availability)}</td>
              <td className="figure">{r.longestDarkStretchHours === null ? "—" : formatHours(r.longestDarkStretchHours, 2)}</td>
              <td className="figure">{formatMoney(r.presentValue)}</td>
              <td className="figure">{formatMoney(r.equivalentAnnualCost)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
