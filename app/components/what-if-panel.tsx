import { useState } from "react";
import { formatAvailability, formatHours } from "../../shared/format";
import type { VerdictStatus } from "../../shared/study-schemas";
import { VerdictBadge } from "./verdict-badge";

interface Summary {
  verdict: VerdictStatus;
  reasons: string[];
  availability: number | null;
  darkHours: number;
  longestDarkStretchHours: number;
  reportableOutages: number;
  hoursBelowMin: number;
}

/** Recomputes the saved study with other device figures through the API, without a page reload or saving. */
export function WhatIfPanel({ studyId, minCurrentA, storageWh, loadScale, disabled }: { studyId: number; minCurrentA: number; storageWh: number; loadScale: number; disabled?: string }) {
  const [state, setState] = useState<{ busy: boolean; result?: { summary: Summary; saved: Summary }; error?: string }>({ busy: false });

  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const body = { minCurrentA: Number(f.get("minCurrentA")), storageWh: Number(f.get("storageWh")), loadScale: Number(f.get("loadScale")) };
    setState((s) => ({ ...s, busy: true, error: undefined }));
    try {
      const res = await fetch(`/api/v1/studies/${studyId}/what-if`, { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) });
      const json = await res.json();
      if (!res.ok) setState({ busy: false, error: json.errors?.map((x: { message: string }) => x.message).join(" ") || json.detail || json.title });
      else setState({ busy: false, result: json });
    } catch {
      setState({ busy: false, error: "The recomputation failed; check the connection and try again." });
    }
  }

  const rows: { label: string; get: (s: Summary) => string }[] = [
    { label: "Availability", get: (s) => formatAvailability(s.availability) },
    { label: "Dark hours", get: (s) => formatHours(s.darkHours) },
    { label: "Longest dark stretch", get: (s) => formatHours(s.longestDarkStretchHours, 2) },
    { label: "Reportable outages (> 30 min)", get: (s) => String(s.reportableOutages) },
    { label: "Hours below minimum current", get: (s) => formatHours(s.hoursBelowMin) },
  ];
  const r = state.result;
  return (
    <section className="card no-print flex flex-col gap-3" aria-labelledby="whatif-heading">
      <h2 id="whatif-heading">What if…</h2>
      <p className="text-sm text-night-400">Change the device or the load and recompute on the same history. Nothing is saved; run a new study to keep it.</p>
      {disabled ? (
        <p className="text-sm text-night-400">{disabled}</p>
      ) : (
        <form onSubmit={submit} className="flex flex-wrap items-end gap-3">
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-min">Minimum current (A)</label>
            <input id="wi-min" name="minCurrentA" type="number" step="any" min="0" defaultValue={minCurrentA} className="figure w-32" />
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-storage">Storage (Wh)</label>
            <input id="wi-storage" name="storageWh" type="number" step="any" min="0" defaultValue={storageWh} className="figure w-32" />
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-scale">Load scale</label>
            <input id="wi-scale" name="loadScale" type="number" step="0.01" min="0.01" defaultValue={loadScale} className="figure w-28" />
          </div>
          <button className="btn" type="submit" disabled={state.busy}>
            {state.busy ? "Recomputing…" : "Recompute"}
          </button>
        </form>
      )}
      {state.error && (
        <p role="alert" className="field-error">
          {state.error}
        </p>
      )}
      {r && (
        <div aria-live="polite" data-testid="what-if-result">
          <table>
            <thead>
              <tr>
                <th scope="col">Figure</th>
                <th scope="col">Saved run</th>
                <th scope="col">What-if</th>
              </tr>
            </thead>
            <tbody>
              <tr>
                <td>Verdict</td>
                <td>
                  <VerdictBadge status={r.saved.verdict} />
                </td>
                <td>
                  <VerdictBadge status={r.summary.verdict} />
                </td>
              </tr>
              {rows.map((row) => (
                <tr key={row.label}>
                  <td>{row.label}</td>
                  <td className="figure">{row.get(r.saved)}</td>
                  <td className="figure" data-figure={row.label}>
                    {row.get(r.summary)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <ul className="mt-2 list-disc pl-6 text-sm text-night-200">
            {r.summary.reasons.map((x) => (
              <li key={x}>{x}</li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
