import { useMemo, useState } from "react";
import { Form, useNavigation } from "react-router";
import { harvestCurve } from "../../lib/engine/harvest-curve";
import type { Device, HarvestPoint } from "../../shared/study-schemas";
import { coldDeratingText, harvestCellName } from "../../shared/device-forms";
import { AxisScaleToggle, HarvestCurves } from "./charts/harvest-curves";
import { Field, FormMessage, type FieldErrors } from "./forms";

export interface DeviceFormValues {
  name?: string;
  note?: string | null;
  spec?: Partial<Device>;
}

const NUMBER_FIELDS: { name: keyof Device; label: string; unit: string; hint?: string; step?: string }[] = [
  { name: "minCurrentA", label: "Minimum operating current", unit: "A", hint: "At or above it the harvester runs; below it, it drops out." },
  { name: "turnOnCurrentA", label: "Turn-on current", unit: "A", hint: "Empty: the minimum current. Set it higher when the harvester switches on above its drop-out (hysteresis)." },
  { name: "maxCurrentA", label: "Maximum (rated) current", unit: "A", hint: "Hours above it are reported." },
  { name: "loadW", label: "Load while lit", unit: "W", hint: "Average draw, flash duty included." },
  { name: "standbyW", label: "Standby draw", unit: "W", hint: "While not required to be lit." },
  { name: "storageWh", label: "Usable storage", unit: "Wh", hint: "0 = no storage." },
  { name: "chargeEfficiency", label: "Charge efficiency", unit: "0–1", step: "0.01" },
  { name: "selfDischargePctPerDay", label: "Self-discharge", unit: "% per day", step: "0.01" },
  { name: "initialCharge", label: "Initial charge", unit: "0–1", step: "0.01" },
  { name: "lifeYears", label: "Service life", unit: "years" },
];

const TABLE_RULE = "Linear between rows; below the first row, linear from 0 A and 0 W; above the last row, its watts held (never extrapolated upward).";

type Harvest = { mode: "expression"; expression: string } | { mode: "table"; rows: { currentA: string; watts: string }[] };

/** The harvest as the chart can draw it, or the reason it cannot. */
function curveOf(harvest: Harvest, minA: number, maxA: number, scale: "log" | "linear") {
  try {
    const device =
      harvest.mode === "expression"
        ? { minCurrentA: minA, maxCurrentA: maxA, harvestW: harvest.expression }
        : { minCurrentA: minA, maxCurrentA: maxA, harvestPoints: typedRows(harvest.rows) };
    if (device.harvestPoints && device.harvestPoints.length < 2) return { rows: [], error: "Enter at least two rows with rising currents to draw the curve." };
    return { rows: harvestCurve(device, scale), error: null as string | null };
  } catch (e) {
    return { rows: [], error: (e as Error).message };
  }
}

/** Rows that read as numbers with rising currents (the server checks them properly). */
function typedRows(rows: { currentA: string; watts: string }[]): HarvestPoint[] {
  const out: HarvestPoint[] = [];
  for (const r of rows) {
    const c = Number(r.currentA.replace(",", "."));
    const w = Number(r.watts.replace(",", "."));
    if (r.currentA.trim() === "" || !Number.isFinite(c) || !Number.isFinite(w) || w < 0) continue;
    if (out.length > 0 && c <= out[out.length - 1].currentA) continue;
    out.push({ currentA: c, watts: w });
  }
  return out;
}

function HarvestCurvePanel({ harvest, minA, maxA, loadW }: { harvest: Harvest; minA: number; maxA: number; loadW: number }) {
  const [scale, setScale] = useState<"log" | "linear">("log");
  const curve = useMemo(() => curveOf(harvest, minA, maxA, scale), [harvest, minA, maxA, scale]);
  return (
    <section className="card flex flex-col gap-2" aria-labelledby="curve-heading">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="curve-heading">Harvest curve</h2>
        <AxisScaleToggle scale={scale} onChange={setScale} />
      </div>
      {curve.error ? (
        <p className="field-error">{curve.error}</p>
      ) : (
        <div style={{ height: 240 }} aria-hidden="true" data-testid="harvest-curve">
          <HarvestCurves curves={[{ name: "Harvest", rows: curve.rows }]} scale={scale} loadW={loadW} minA={minA} />
        </div>
      )}
      <p className="text-sm text-night-200">
        Power available from the line current, against the load (dashed amber). Below the minimum current (dashed red) the harvester gives nothing and the light lives
        on its storage. The log axis gives each decade of current the same width, so the region near the minimum is readable.
      </p>
    </section>
  );
}

/** The harvest entered as an expression in I or as datasheet rows (current, watts). */
function HarvestInput({ harvest, setHarvest, errors }: { harvest: Harvest; setHarvest: (h: Harvest) => void; errors?: FieldErrors }) {
  const tableErrors = harvestTableErrors(errors);
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1">Harvest power</legend>
      <div className="flex flex-wrap gap-4 text-sm">
        <label className="flex items-center gap-2">
          <input type="radio" name="harvestMode" value="expression" checked={harvest.mode === "expression"} onChange={() => setHarvest({ mode: "expression", expression: "min(0.004 * I^2, 15)" })} />
          Expression in I
        </label>
        <label className="flex items-center gap-2">
          <input
            type="radio"
            name="harvestMode"
            value="table"
            checked={harvest.mode === "table"}
            onChange={() => setHarvest({ mode: "table", rows: [{ currentA: "", watts: "" }, { currentA: "", watts: "" }, { currentA: "", watts: "" }] })}
          />
          Table from a datasheet
        </label>
      </div>
      {harvest.mode === "expression" ? (
        <Field name="harvestW" label="Harvest power (W) as an expression in I (amperes)" errors={errors} hint="mathjs syntax, e.g. min(0.004 * I^2, 15). Applies at or above the minimum current.">
          <input id="harvestW" name="harvestW" value={harvest.expression} onChange={(e) => setHarvest({ mode: "expression", expression: e.target.value })} className="figure" required />
        </Field>
      ) : (
        <div className="flex flex-col gap-2">
          <div className="overflow-x-auto">
            <table aria-label="Harvest table">
              <thead>
                <tr>
                  <th scope="col">Row</th>
                  <th scope="col">Current (A)</th>
                  <th scope="col">Power (W)</th>
                  <th scope="col">
                    <span className="sr-only">Remove</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {harvest.rows.map((r, i) => (
                  <tr key={i}>
                    <td className="figure">{i + 1}</td>
                    <td>
                      <input
                        aria-label={`Row ${i + 1} current (A)`}
                        name={harvestCellName(i, "currentA")}
                        inputMode="decimal"
                        value={r.currentA}
                        onChange={(e) => setHarvest({ mode: "table", rows: harvest.rows.map((x, k) => (k === i ? { ...x, currentA: e.target.value } : x)) })}
                        className="figure w-24"
                      />
                    </td>
                    <td>
                      <input
                        aria-label={`Row ${i + 1} power (W)`}
                        name={harvestCellName(i, "watts")}
                        inputMode="decimal"
                        value={r.watts}
                        onChange={(e) => setHarvest({ mode: "table", rows: harvest.rows.map((x, k) => (k === i ? { ...x, watts: e.target.value } : x)) })}
                        className="figure w-24"
                      />
                    </td>
                    <td>
                      <button type="button" className="btn-quiet text-xs" onClick={() => setHarvest({ mode: "table", rows: harvest.rows.filter((_, k) => k !== i) })} aria-label={`Remove row ${i + 1}`}>
                        ✕
                      </button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <button type="button" className="btn-quiet self-start text-sm" onClick={() => setHarvest({ mode: "table", rows: [...harvest.rows, { currentA: "", watts: "" }] })}>
            Add row
          </button>
          <span className="text-xs text-night-400">Currents rising from row to row, watts not negative. {TABLE_RULE}</span>
        </div>
      )}
      {tableErrors.map((m) => (
        <span key={m} className="field-error" role="alert">
          {m}
        </span>
      ))}
    </fieldset>
  );
}

/** The harvest table's errors in row order, each naming its row (form names harvestPoints2CurrentA → row 3). */
function harvestTableErrors(errors: FieldErrors | undefined): string[] {
  return Object.entries(errors ?? {})
    .filter(([key]) => key.startsWith("harvestPoints"))
    .flatMap(([key, messages]) => {
      const row = /^harvestPoints(\d+)/.exec(key);
      return (messages ?? []).map((m) => (row && !m.startsWith("Row ") ? `Row ${Number(row[1]) + 1}: ${m}` : m));
    });
}

function initialHarvest(spec: Partial<Device>): Harvest {
  if (spec.harvestPoints?.length) return { mode: "table", rows: spec.harvestPoints.map((p) => ({ currentA: String(p.currentA), watts: String(p.watts) })) };
  return { mode: "expression", expression: spec.harvestW ?? "min(0.004 * I^2, 15)" };
}

export function DeviceForm({ values = {}, errors, message, submitLabel, readOnly = false }: { values?: DeviceFormValues; errors?: FieldErrors; message?: string; submitLabel: string; readOnly?: boolean }) {
  const busy = useNavigation().state === "submitting";
  const spec = values.spec ?? {};
  const [harvest, setHarvest] = useState<Harvest>(() => initialHarvest(spec));
  const [minA, setMinA] = useState(spec.minCurrentA ?? 40);
  const [maxA, setMaxA] = useState(spec.maxCurrentA ?? 2000);
  const [loadW, setLoadW] = useState(spec.loadW ?? 4);
  const live: Partial<Record<keyof Device, (v: number) => void>> = { minCurrentA: setMinA, maxCurrentA: setMaxA, loadW: setLoadW };
  if (readOnly) {
    return (
      <div className="grid gap-6 lg:grid-cols-2">
        <DeviceValues values={values} />
        <HarvestCurvePanel harvest={harvest} minA={minA} maxA={maxA} loadW={loadW} />
      </div>
    );
  }
  return (
    <Form method="post" className="grid gap-6 lg:grid-cols-2" noValidate>
      <div className="card flex flex-col gap-3">
        {message && <FormMessage tone="error">{message}</FormMessage>}
        <Field name="name" label="Name" errors={errors}>
          <input id="name" name="name" defaultValue={values.name} required maxLength={200} />
        </Field>
        <HarvestInput harvest={harvest} setHarvest={setHarvest} errors={errors} />
        <div className="grid grid-cols-2 gap-3">
          {NUMBER_FIELDS.map((f) => (
            <Field key={f.name} name={f.name} label={`${f.label} (${f.unit})`} errors={errors} hint={f.hint}>
              <input
                id={f.name}
                name={f.name}
                type="number"
                step={f.step ?? "any"}
                defaultValue={spec[f.name] as number | undefined}
                onChange={(e) => live[f.name]?.(Number(e.target.value))}
                className="figure"
              />
            </Field>
          ))}
        </div>
        <Field name="coldDerating" label="Cold derating (°C : usable share of the storage)" errors={errors} hint="Pairs such as -20:0.5, 0:0.85, 20:1, rising in °C; interpolated between them. Empty: no derating. Applies when a study has monthly temperatures.">
          <input id="coldDerating" name="coldDerating" defaultValue={coldDeratingText(spec.coldDerating)} className="figure" />
        </Field>
        <Field name="note" label="Note" errors={errors}>
          <textarea id="note" name="note" rows={3} defaultValue={values.note ?? ""} />
        </Field>
        <button className="btn self-start" type="submit" name="intent" value="save" disabled={busy}>
          {busy ? "Saving…" : submitLabel}
        </button>
      </div>
      <HarvestCurvePanel harvest={harvest} minA={minA} maxA={maxA} loadW={loadW} />
    </Form>
  );
}

/** The profile's values as text, for roles that may read but not change them. */
function DeviceValues({ values }: { values: DeviceFormValues }) {
  const spec = values.spec ?? {};
  return (
    <section className="card flex flex-col gap-3" aria-labelledby="values-heading" data-testid="device-values">
      <h2 id="values-heading">Values</h2>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
        {spec.harvestW !== undefined && (
          <>
            <dt className="text-night-400">Harvest power (W)</dt>
            <dd className="figure break-all">{spec.harvestW}</dd>
          </>
        )}
        {NUMBER_FIELDS.map((f) => (
          <Row key={f.name} label={f.label} value={spec[f.name] === undefined ? "—" : `${(spec[f.name] as number).toLocaleString("en", { maximumFractionDigits: 4 })} ${f.unit}`} />
        ))}
        <Row label="Cold derating (°C : usable share)" value={coldDeratingText(spec.coldDerating) || "none"} />
        {values.note && <Row label="Note" value={values.note} />}
      </dl>
      {spec.harvestPoints && (
        <div className="overflow-x-auto">
          <table aria-label="Harvest table">
            <caption className="text-left text-sm text-night-400">Harvest table. {TABLE_RULE}</caption>
            <thead>
              <tr>
                <th scope="col">Row</th>
                <th scope="col">Current (A)</th>
                <th scope="col">Power (W)</th>
              </tr>
            </thead>
            <tbody>
              {spec.harvestPoints.map((p, i) => (
                <tr key={i}>
                  <td className="figure">{i + 1}</td>
                  <td className="figure">{p.currentA}</td>
                  <td className="figure">{p.watts}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

function Row({ label, value }: { label: string; value: string }) {
  return (
    <>
      <dt className="text-night-400">{label}</dt>
      <dd className="figure">{value}</dd>
    </>
  );
}
