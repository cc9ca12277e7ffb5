// Upload of a current-history CSV: preview and suggested mapping in the browser (sniffCsv on
// the file's first 64 KB), then the raw file goes to the API with a progress bar.
import { useState } from "react";
import { flushSync } from "react-dom";
import { useNavigate } from "react-router";
import { nonCsvKind, sniffCsv, SNIFF_BYTES, type CsvSniff } from "../../lib/ingest/sniff";
import { formatBytes } from "../../shared/format";
import { DELIMITER_CHOICES, INPUT_UNITS, POWER_UNITS, TIMESTAMP_FORMATS, type InputUnit } from "../../shared/ingest-options";
import { FormMessage } from "./forms";
import { TimeZoneNames } from "./time-zone-names";

interface Problem {
  title: string;
  detail?: string;
  errors?: { path: string; message: string }[];
  examples?: { line: number; text: string; problem: string }[];
}

type Stage = { kind: "idle" } | { kind: "uploading"; sent: number; total: number } | { kind: "parsing" } | { kind: "failed"; problem: Problem };

const FORMAT_LABELS: Record<string, string> = {
  auto: "Detect",
  iso: "ISO 8601 (2025-03-01T14:00)",
  ymd: "Year-month-day",
  dmy: "Day/month/year",
  mdy: "Month/day/year",
  "epoch-s": "Unix seconds",
  "epoch-ms": "Unix milliseconds",
  "serial-days": "Spreadsheet serial days",
};
const DELIMITER_LABELS: Record<string, string> = { auto: "Detect", ",": "Comma", ";": "Semicolon", tab: "Tab", "|": "Pipe" };
const UNIT_LABELS: Record<InputUnit, string> = {
  A: "amperes (A)",
  kA: "kiloamperes (kA)",
  MW: "megawatts (MW), three-phase",
  MVA: "megavolt-amperes (MVA), three-phase",
  kW: "kilowatts (kW), three-phase",
  kVA: "kilovolt-amperes (kVA), three-phase",
};
const isPower = (u: string) => (POWER_UNITS as readonly string[]).includes(u);

export function ProfileUpload({
  circuitId,
  phases,
  maxBytes,
  voltageKv,
  existingProfileId,
  timeZone = "UTC",
}: {
  circuitId: number;
  phases: number;
  maxBytes: number;
  voltageKv: number;
  /** Append to or replace the data of this profile instead of creating one. */
  existingProfileId?: number;
  /** The circuit's time zone: the default for timestamps without an offset. */
  timeZone?: string;
}) {
  const navigate = useNavigate();
  const [file, setFile] = useState<File | null>(null);
  const [sniff, setSniff] = useState<CsvSniff | null>(null);
  const [stage, setStage] = useState<Stage>({ kind: "idle" });
  const [perPhase, setPerPhase] = useState(phases > 1);
  const [unit, setUnit] = useState<InputUnit>("A");
  /** For an existing profile: append a newer export, or replace all its data. */
  const [mode, setMode] = useState<"append" | "replace">("append");
  /** Set when a circuit with more phases than mapped is about to get one; a second click uploads. */
  const [phaseWarning, setPhaseWarning] = useState<string | null>(null);

  async function pick(f: File | null) {
    setFile(f);
    setSniff(null);
    setStage({ kind: "idle" });
    setPhaseWarning(null);
    if (!f) return;
    if (f.size === 0) {
      setStage({ kind: "failed", problem: { title: "Empty file", detail: `${f.name} has no content (0 bytes). Choose the exported CSV file.` } });
      return;
    }
    // Said at once rather than after sending hundreds of megabytes the server would refuse (413).
    if (f.size > maxBytes) {
      setStage({ kind: "failed", problem: { title: "File too large", detail: `The file is ${formatBytes(f.size)}; the limit is ${formatBytes(maxBytes)}. Split the history into several files.` } });
      return;
    }
    const head = await f.slice(0, SNIFF_BYTES).text();
    const kind = nonCsvKind(head);
    if (kind) {
      setStage({ kind: "failed", problem: { title: "Not a CSV file", detail: `${f.name} is ${kind}, not CSV text. Export the current history as CSV and choose that file.` } });
      return;
    }
    if (head.trim() === "") {
      setStage({ kind: "failed", problem: { title: "Empty file", detail: `${f.name} holds only blank lines. Choose the exported CSV file.` } });
      return;
    }
    const s = sniffCsv(head, { complete: f.size <= SNIFF_BYTES });
    setSniff(s);
    setUnit(s.suggestions.unit);
    setPerPhase(Boolean(s.suggestions.phaseA || s.suggestions.phaseB || s.suggestions.phaseC) || (phases > 1 && !s.suggestions.currentColumn));
  }

  function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    if (!file) return;
    const params = new URLSearchParams();
    for (const [k, v] of new FormData(e.currentTarget)) if (typeof v === "string" && v !== "") params.set(k, v);
    if (perPhase) params.delete("currentColumn");
    else for (const p of ["phaseA", "phaseB", "phaseC"]) params.delete(p);
    // The reactive column only counts for active power (MW, kW); then it replaces the power factor.
    if (unit !== "MW" && unit !== "kW") params.delete("powerFactor");
    if (params.has("reactiveColumn")) params.delete("powerFactor");
    const mapped = perPhase ? ["phaseA", "phaseB", "phaseC"].filter((p) => params.has(p)).length : 1;
    if (phases > 1 && mapped < phases && !phaseWarning) {
      setPhaseWarning(
        `This circuit has ${phases} phases but the upload maps ${mapped === 1 ? "one column" : `${mapped} columns`}. ` +
          (perPhase ? "Choose a column for each phase, or upload anyway." : 'Tick "one column per phase" to map each phase, or upload anyway if the file holds one phase only.'),
      );
      return;
    }
    setPhaseWarning(null);
    params.set("file", file.name);
    const xhr = new XMLHttpRequest();
    if (existingProfileId && mode === "replace") xhr.open("PUT", `/api/v1/profiles/${existingProfileId}?${params}`);
    else xhr.open("POST", existingProfileId ? `/api/v1/profiles/${existingProfileId}/append?${params}` : `/api/v1/circuits/${circuitId}/profiles?${params}`);
    xhr.setRequestHeader("Content-Type", "text/csv");
    xhr.upload.onprogress = (ev) => setStage({ kind: "uploading", sent: ev.loaded, total: ev.lengthComputable ? ev.total : file.size });
    // Rendered at once: batched with the response's update, a fast server would answer before
    // the "reading the samples" status ever showed.
    xhr.upload.onload = () => flushSync(() => setStage({ kind: "parsing" }));
    xhr.onerror = () => setStage({ kind: "failed", problem: { title: "Upload interrupted", detail: "The connection failed. Nothing was saved; try again." } });
    xhr.onload = () => {
      let body: { profile?: { id: number } } & Problem;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = { title: `Server answered ${xhr.status}`, detail: "Nothing was saved." };
      }
      if ((xhr.status === 201 || (existingProfileId && xhr.status === 200)) && body.profile) {
        setFile(null);
        setSniff(null);
        setStage({ kind: "idle" });
        navigate(`/profiles/${body.profile.id}`);
      }
      else setStage({ kind: "failed", problem: body });
    };
    setStage({ kind: "uploading", sent: 0, total: file.size });
    xhr.send(file);
  }

  const busy = stage.kind === "uploading" || stage.kind === "parsing";
  const columns = sniff?.columns ?? [];
  const sug = sniff?.suggestions;
  const columnSelect = (name: string, label: string, value: string | undefined, optional = false) => (
    <div className="flex flex-col gap-1">
      <label htmlFor={`map-${name}`}>{label}</label>
      <select id={`map-${name}`} name={name} defaultValue={value ?? ""} required={!optional}>
        {optional && <option value="">— none —</option>}
        {!optional && !value && <option value="">Choose…</option>}
        {columns.map((c) => (
          <option key={c} value={c}>
            {c}
          </option>
        ))}
      </select>
    </div>
  );

  return (
    <section className="card flex flex-col gap-4" aria-labelledby="upload-heading">
      <h2 id="upload-heading">{existingProfileId ? "Append or replace data (CSV)" : "Upload current history (CSV)"}</h2>
      {existingProfileId && (
        <fieldset className="flex flex-col gap-2 text-sm">
          <legend className="sr-only">What the new file does</legend>
          <label className="flex items-start gap-2">
            <input type="radio" name="upload-mode" value="append" checked={mode === "append"} onChange={() => setMode("append")} disabled={busy} />
            <span>
              <strong>Append a newer export.</strong> The new file wins over its whole time span: stored samples from its first to its last timestamp are replaced, the rest are kept, and the quality
              report is rebuilt.
            </span>
          </label>
          <label className="flex items-start gap-2">
            <input type="radio" name="upload-mode" value="replace" checked={mode === "replace"} onChange={() => setMode("replace")} disabled={busy} />
            <span>
              <strong>Replace all data.</strong> The profile holds only the new file (a corrected or re-exported history), with its own phases and quality report.
            </span>
          </label>
          <p className="text-night-200">Either way, studies run before keep the data they were computed from, and say the data has changed since.</p>
        </fieldset>
      )}
      <div className="flex flex-col gap-1">
        <label htmlFor="profile-file">CSV file exported from SCADA or a historian</label>
        <input id="profile-file" type="file" accept=".csv,.txt,.tsv,text/csv,text/plain" onChange={(e) => pick(e.target.files?.[0] ?? null)} disabled={busy} />
      </div>
      {sniff?.looksBinary && <FormMessage tone="error">This file does not look like text. Export the history as CSV and try again.</FormMessage>}
      {sniff && !sniff.looksBinary && (
        <form onSubmit={submit} className="flex flex-col gap-4" key={file?.name}>
          <div className="overflow-x-auto">
            <p className="mb-1 text-sm text-night-400">
              First rows of <span className="figure">{file?.name}</span>
              {sniff.metadataLines.length > 0 && ` (${sniff.metadataLines.length} line(s) before the header skipped)`}
            </p>
            <table className="figure text-xs" aria-label="Preview of the first rows">
              <thead>
                <tr>
                  {columns.map((c) => (
                    <th key={c}>{c}</th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {sniff.previewRows.slice(0, 8).map((row, i) => (
                  <tr key={i}>
                    {row.map((cell, j) => (
                      <td key={j}>{cell}</td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <fieldset className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            <legend className="mb-2 font-semibold">Column mapping</legend>
            {columnSelect("timestampColumn", "Timestamp column", sug?.timestampColumn)}
            <div className="flex flex-col gap-1">
              <span className="text-sm text-night-200">Current</span>
              <label className="flex items-center gap-2">
                <input type="checkbox" checked={perPhase} onChange={(e) => setPerPhase(e.target.checked)} /> one column per phase
              </label>
            </div>
            {perPhase ? (
              <>
                {columnSelect("phaseA", "Phase A column", sug?.phaseA ?? sug?.currentColumn, true)}
                {columnSelect("phaseB", "Phase B column", sug?.phaseB, true)}
                {columnSelect("phaseC", "Phase C column", sug?.phaseC, true)}
              </>
            ) : (
              columnSelect("currentColumn", "Current column", sug?.currentColumn ?? sug?.phaseA)
            )}
            <div className="flex flex-col gap-1">
              <label htmlFor="map-unit">Unit of the values</label>
              <select id="map-unit" name="unit" value={unit} onChange={(e) => setUnit(e.target.value as InputUnit)}>
                {INPUT_UNITS.map((u) => (
                  <option key={u} value={u}>
                    {UNIT_LABELS[u]}
                  </option>
                ))}
              </select>
              {isPower(unit) && perPhase && <span className="text-xs text-amber-glow">Power is the three-phase total: map it as one column, not one per phase.</span>}
            </div>
            {isPower(unit) && (
              <>
                <div className="flex flex-col gap-1">
                  <label htmlFor="map-voltage">Line-to-line voltage (kV)</label>
                  <input id="map-voltage" name="voltageKv" type="number" step="any" min="0" defaultValue={voltageKv} className="figure" required />
                  <span className="text-xs text-night-400">Current I = S / (√3 · V_LL); the circuit's {voltageKv} kV unless the export is from another voltage level.</span>
                </div>
                {(unit === "MW" || unit === "kW") && (
                  <>
                    <div className="flex flex-col gap-1">
                      <label htmlFor="map-pf">Power factor</label>
                      <input id="map-pf" name="powerFactor" type="number" step="0.01" min="0.01" max="1" defaultValue={1} className="figure" />
                      <span className="text-xs text-night-400">S = P / pf, unless a reactive-power column is chosen.</span>
                    </div>
                    {columnSelect("reactiveColumn", `Reactive power column (${unit === "MW" ? "MVAr" : "kVAr"}, optional)`, undefined, true)}
                  </>
                )}
              </>
            )}
          </fieldset>
          <fieldset className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            <legend className="mb-2 font-semibold">Reading the file</legend>
            <div className="flex flex-col gap-1">
              <label htmlFor="map-format">Timestamp format</label>
              <select id="map-format" name="timestampFormat" defaultValue={sniff.dayMonthAmbiguous ? "" : (sug?.timestampFormat ?? "auto")} required>
                {sniff.dayMonthAmbiguous && <option value="">Choose day-first or month-first…</option>}
                {TIMESTAMP_FORMATS.map((f) => (
                  <option key={f} value={f}>
                    {FORMAT_LABELS[f]}
                  </option>
                ))}
              </select>
              {sniff.dayMonthAmbiguous && (
                <span className="text-xs text-amber-glow" role="alert">
                  The dates could be day/month or month/day. Choose which.
                </span>
              )}
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor="map-timezone">Time zone of the timestamps (IANA)</label>
              <input id="map-timezone" name="timezone" defaultValue={timeZone} list="tz-suggestions" />
              <TimeZoneNames id="tz-suggestions" />
              {sniff.hasExplicitOffset && <span className="text-xs text-night-400">The timestamps carry their own UTC offset; it wins over this zone.</span>}
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor="map-decimal">Decimal separator</label>
              <select id="map-decimal" name="decimal" defaultValue={sniff.decimal}>
                <option value=".">Point (12.5)</option>
                <option value=",">Comma (12,5)</option>
              </select>
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor="map-delimiter">Delimiter</label>
              <select id="map-delimiter" name="delimiter" defaultValue="auto">
                {DELIMITER_CHOICES.map((d) => (
                  <option key={d} value={d}>
                    {DELIMITER_LABELS[d]}
                    {d === "auto" ? ` (found: ${DELIMITER_LABELS[sniff.delimiter]})` : ""}
                  </option>
                ))}
              </select>
            </div>
            {columnSelect("qualityColumn", "Quality column (optional)", sug?.qualityColumn, true)}
            {columnSelect("temperatureColumn", "Temperature column (optional, for cold-weather storage)", undefined, true)}
            <div className="flex flex-col gap-1">
              <label htmlFor="map-temperatureUnit">Temperature unit</label>
              <select id="map-temperatureUnit" name="temperatureUnit" defaultValue="C">
                <option value="C">°C</option>
                <option value="F">°F</option>
              </select>
              <span className="text-xs text-night-400">Monthly means are kept with the profile; blank cells are gaps.</span>
            </div>
            <div className="flex flex-col gap-1">
              <label htmlFor="map-good">Values that mean good (optional)</label>
              <input id="map-good" name="goodQuality" placeholder="e.g. GOOD,OK,192" />
              <span className="text-xs text-night-400">Empty: OPC-style codes with the top two bits 11 (192–255) and the words GOOD/OK.</span>
            </div>
            {!existingProfileId && (
              <div className="flex flex-col gap-1">
                <label htmlFor="map-name">Profile name</label>
                <input id="map-name" name="name" defaultValue={file?.name.replace(/\.[^.]+$/, "")} maxLength={200} />
              </div>
            )}
          </fieldset>
          {phaseWarning && (
            <p role="alert" className="text-sm text-amber-glow">
              {phaseWarning}
            </p>
          )}
          <button className="btn self-start" type="submit" disabled={busy}>
            {phaseWarning ? "Upload anyway" : existingProfileId ? (mode === "replace" ? "Replace data and check quality" : "Append and check quality") : "Upload and check quality"}
          </button>
        </form>
      )}
      {stage.kind === "uploading" && (
        <div className="flex flex-col gap-1" aria-live="polite">
          <label htmlFor="upload-progress">
            Uploading… <span className="figure">{Math.round((100 * stage.sent) / Math.max(1, stage.total))} %</span>
          </label>
          <progress id="upload-progress" max={stage.total} value={stage.sent} className="w-full accent-amber-glow" />
        </div>
      )}
      {stage.kind === "parsing" && (
        <p role="status" className="animate-pulse text-amber-glow">
          Uploaded. Reading the samples and checking their quality…
        </p>
      )}
      {stage.kind === "failed" && (
        <div role="alert" className="rounded-md border border-verdict-nogo/60 p-3 text-sm">
          <p className="font-semibold text-verdict-nogo">{stage.problem.title}</p>
          {stage.problem.detail && <p className="mt-1">{stage.problem.detail}</p>}
          {stage.problem.errors?.map((e) => (
            <p key={e.path} className="mt-1">
              <span className="figure">{e.path}</span>: {e.message}
            </p>
          ))}
          {stage.problem.examples && stage.problem.examples.length > 0 && (
            <table className="mt-2 text-xs">
              <thead>
                <tr>
                  <th>Line</th>
                  <th>Row</th>
                  <th>Problem</th>
                </tr>
              </thead>
              <tbody>
                {stage.problem.examples.map((x) => (
                  <tr key={x.line}>
                    <td className="figure">{x.line}</td>
                    <td className="figure">{x.text}</td>
                    <td>{x.problem}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <p className="mt-2 text-night-400">Nothing was saved.</p>
        </div>
      )}
    </section>
  );
}
