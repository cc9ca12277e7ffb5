import { useState } from "react";
import { useFetcher } from "react-router";
import { formatAvailability, formatHours, formatNumber } from "../../shared/format";
import type { VerdictStatus } from "../../shared/study-schemas";
import type { FieldErrors } from "./forms";
import type { StudyChartInputs } from "./study-result-charts";
import { VerdictBadge } from "./verdict-badge";
import { candidateErrorLabel } from "../../shared/optimise-forms";

interface Summary {
  verdict: VerdictStatus;
  reasons: string[];
  availability: number | null;
  darkHours: number;
  longestDarkStretchHours: number;
  reportableOutages: number;
  hoursBelowMin: number;
}

export interface WhatIfAnswer {
  device: { name: string; minCurrentA: number; maxCurrentA: number; storageWh: number; loadScale: number };
  summary: Summary;
  saved: Summary;
  charts: StudyChartInputs;
}

type WhatIfData = { whatIf: WhatIfAnswer } | { ok: false; errors: FieldErrors; message: string };

/**
 * The study page's what-if: one fetcher posting `intent=what-if` to the page's action (nothing
 * saved, the page's data not reloaded), and whether its charts or the saved study's are shown.
 * A new answer shows its charts; "back" shows the saved ones until the next answer.
 */
export function useWhatIf() {
  const fetcher = useFetcher<WhatIfData>({ key: "study-what-if" });
  const [dismissed, setDismissed] = useState<unknown>(null);
  const answer = fetcher.data && "whatIf" in fetcher.data ? fetcher.data.whatIf : null;
  return {
    fetcher,
    answer,
    /** The what-if whose charts are shown, or null for the saved study's. */
    shown: answer && dismissed !== answer ? answer : null,
    showSaved: () => setDismissed(answer),
    showWhatIf: () => setDismissed(null),
  };
}
export type WhatIf = ReturnType<typeof useWhatIf>;

export interface DeviceChoice {
  id: number;
  name: string;
  minCurrentA: number;
  storageWh: number;
}

interface WhatIfPanelProps {
  whatIf: WhatIf;
  /** The organisation's device profiles in use: the same study may run with any of them. */
  devices: DeviceChoice[];
  savedDevice: { id: number | null; name: string };
  minCurrentA: number;
  storageWh: number;
  loadScale: number;
  disabled?: string;
}

/** Recomputes the saved study with another device profile or other figures, without a page reload or saving. */
export function WhatIfPanel({ whatIf, devices, savedDevice, minCurrentA, storageWh, loadScale, disabled }: WhatIfPanelProps) {
  const { fetcher, answer: r } = whatIf;
  // Choosing another device fills in its own minimum current and storage (still editable).
  const [deviceId, setDeviceId] = useState("");
  const chosen = devices.find((d) => String(d.id) === deviceId);
  const others = devices.filter((d) => d.id !== savedDevice.id);
  const busy = fetcher.state !== "idle";
  const failed = fetcher.data && !("whatIf" in fetcher.data) ? fetcher.data : null;
  const fieldError = (name: string) =>
    failed?.errors?.[name]?.map((m) => (
      <span key={m} className="field-error" role="alert">
        {m}
      </span>
    ));
  const rows: { label: string; get: (s: Summary) => string }[] = [
    { label: "Availability", get: (s) => formatAvailability(s.availability) },
    { label: "Dark hours", get: (s) => formatHours(s.darkHours) },
    { label: "Longest dark stretch", get: (s) => formatHours(s.longestDarkStretchHours, 2) },
    { label: "Reportable outages (> 30 min)", get: (s) => String(s.reportableOutages) },
    { label: "Hours below minimum current", get: (s) => formatHours(s.hoursBelowMin) },
  ];
  return (
    <section className="card no-print flex flex-col gap-3" aria-labelledby="whatif-heading">
      <h2 id="whatif-heading">What if…</h2>
      <p className="text-sm text-night-400">Change the device or the load and recompute on the same history; the figures and the charts below are redrawn. Nothing is saved; run a new study to keep it.</p>
      {disabled ? (
        <p className="text-sm text-night-400">{disabled}</p>
      ) : (
        <fetcher.Form method="post" className="flex flex-wrap items-end gap-3" noValidate>
          <input type="hidden" name="intent" value="what-if" />
          {others.length > 0 && (
            <div className="flex flex-col gap-1">
              <label htmlFor="wi-device">Device profile</label>
              <select id="wi-device" name="deviceProfileId" value={deviceId} onChange={(e) => setDeviceId(e.target.value)} className="max-w-full">
                <option value="">{savedDevice.name} (this study's)</option>
                {others.map((d) => (
                  <option key={d.id} value={d.id}>
                    {d.name}
                  </option>
                ))}
              </select>
              {fieldError("deviceProfileId")}
            </div>
          )}
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-min">Minimum current (A)</label>
            <input key={`min-${deviceId}`} id="wi-min" name="minCurrentA" type="number" step="any" min="0" defaultValue={chosen?.minCurrentA ?? minCurrentA} className="figure w-32" />
            {fieldError("minCurrentA")}
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-storage">Storage (Wh)</label>
            <input key={`storage-${deviceId}`} id="wi-storage" name="storageWh" type="number" step="any" min="0" defaultValue={chosen?.storageWh ?? storageWh} className="figure w-32" />
            {fieldError("storageWh")}
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="wi-scale">Load scale</label>
            <input id="wi-scale" name="loadScale" type="number" step="0.01" min="0.01" defaultValue={loadScale} className="figure w-28" />
            {fieldError("loadScale")}
          </div>
          <div className="flex w-full flex-col gap-1">
            <label htmlFor="wi-switched-out">Line switched out</label>
            <textarea id="wi-switched-out" name="switchedOut" rows={2} className="figure" aria-describedby="wi-switched-out-hint" />
            <span id="wi-switched-out-hint" className="text-xs text-night-400">
              One period a line: name, start, end (dates or date-times, UTC unless a zone is written), e.g. “Spring outage, 2025-04-01, 2025-04-15”. The current reads 0 A inside.
            </span>
            {Object.keys(failed?.errors ?? {})
              .filter((k) => k.startsWith("switchedOut"))
              .flatMap((k) => (failed!.errors[k] ?? []).map((m) => `${candidateErrorLabel(k, []) ?? "Switched out"}: ${m}`))
              .map((m) => (
                <span key={m} className="field-error" role="alert">
                  {m}
                </span>
              ))}
          </div>
          <button className="btn" type="submit" disabled={busy}>
            {busy ? "Recomputing…" : "Recompute"}
          </button>
        </fetcher.Form>
      )}
      {failed?.message && (
        <p role="alert" className="field-error">
          {failed.message}
        </p>
      )}
      {r && (
        <div aria-live="polite" data-testid="what-if-result">
          <table>
            <thead>
              <tr>
                <th scope="col">Figure</th>
                <th scope="col">Saved run ({savedDevice.name})</th>
                <th scope="col">What-if ({r.device.name})</th>
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

/** Above the charts: which run they show, and the way to the other. */
export function ChartsShownBanner({ whatIf }: { whatIf: WhatIf }) {
  const { shown, answer } = whatIf;
  if (!answer) return null;
  if (shown) {
    const d = shown.device;
    return (
      <div role="status" className="card flex flex-wrap items-center justify-between gap-3 border-amber-glow/50" data-testid="what-if-banner">
        <p className="text-sm">
          <strong className="text-amber-glow">What-if charts</strong>, not saved: device {d.name}, minimum current {formatNumber(d.minCurrentA)} A, storage {formatNumber(d.storageWh)} Wh, load × {formatNumber(d.loadScale, 2)}.
        </p>
        <button type="button" className="btn-quiet" onClick={whatIf.showSaved}>
          Back to the saved study's charts
        </button>
      </div>
    );
  }
  return (
    <div className="flex justify-end">
      <button type="button" className="btn-quiet" onClick={whatIf.showWhatIf}>
        Show the what-if charts again
      </button>
    </div>
  );
}
