import { useMemo, useState } from "react";
import { Form, useNavigation } from "react-router";
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { compileHarvestExpression } from "../../lib/engine/device";
import type { Device } from "../../shared/study-schemas";
import { coldDeratingText } from "../../shared/device-forms";
import { axisProps, CHART_COLOURS, tooltipStyle } from "./charts/chart-frame";
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

/** Harvest power over current, drawn live while the expression is edited. */
function HarvestCurve({ expression, minA, maxA, loadW }: { expression: string; minA: number; maxA: number; loadW: number }) {
  const curve = useMemo(() => {
    try {
      const f = compileHarvestExpression(expression);
      const top = Number.isFinite(maxA) && maxA > 0 ? maxA : 1000;
      const rows = [];
      for (let k = 0; k <= 100; k++) {
        const I = (top * k) / 100;
        rows.push({ I: Math.round(I * 10) / 10, W: I >= minA ? f(I) : 0 });
      }
      return { rows, error: null as string | null };
    } catch (e) {
      return { rows: [], error: (e as Error).message };
    }
  }, [expression, minA, maxA]);
  if (curve.error) return <p className="field-error">{curve.error}</p>;
  return (
    <div style={{ height: 220 }} aria-hidden="true">
      <ResponsiveContainer width="100%" height="100%">
        <LineChart data={curve.rows} margin={{ top: 8, right: 16, bottom: 4, left: 8 }}>
          <CartesianGrid stroke={CHART_COLOURS.grid} vertical={false} />
          <XAxis dataKey="I" type="number" unit=" A" {...axisProps} />
          <YAxis unit=" W" width={56} {...axisProps} />
          <Tooltip {...tooltipStyle} formatter={(v) => `${Number(v).toFixed(2)} W`} labelFormatter={(v) => `${v} A`} />
          {Number.isFinite(loadW) && <ReferenceLine y={loadW} stroke={CHART_COLOURS.amber} strokeDasharray="6 3" label={{ value: `load ${loadW} W`, fill: CHART_COLOURS.amber, fontSize: 11, position: "insideTopLeft" }} />}
          {Number.isFinite(minA) && <ReferenceLine x={minA} stroke={CHART_COLOURS.nogo} strokeDasharray="4 3" label={{ value: `min ${minA} A`, fill: CHART_COLOURS.nogo, fontSize: 11, position: "insideBottomRight" }} />}
          <Line dataKey="W" stroke={CHART_COLOURS.current} dot={false} isAnimationActive={false} />
        </LineChart>
      </ResponsiveContainer>
    </div>
  );
}

export function DeviceForm({ values = {}, errors, message, submitLabel, readOnly = false }: { values?: DeviceFormValues; errors?: FieldErrors; message?: string; submitLabel: string; readOnly?: boolean }) {
  const busy = useNavigation().state === "submitting";
  const spec = values.spec ?? {};
  const [expression, setExpression] = useState(spec.harvestW ?? "min(0.004 * I^2, 15)");
  const [minA, setMinA] = useState(spec.minCurrentA ?? 40);
  const [maxA, setMaxA] = useState(spec.maxCurrentA ?? 2000);
  const [loadW, setLoadW] = useState(spec.loadW ?? 4);
  const live: Partial<Record<keyof Device, (v: number) => void>> = { minCurrentA: setMinA, maxCurrentA: setMaxA, loadW: setLoadW };
  return (
    <Form method="post" className="grid gap-6 lg:grid-cols-2" noValidate>
      <fieldset className="card flex flex-col gap-3" disabled={readOnly}>
        {message && <FormMessage tone="error">{message}</FormMessage>}
        <Field name="name" label="Name" errors={errors}>
          <input id="name" name="name" defaultValue={values.name} required maxLength={200} />
        </Field>
        <Field name="harvestW" label="Harvest power (W) as an expression in I (amperes)" errors={errors} hint="mathjs syntax, e.g. min(0.004 * I^2, 15). Applies at or above the minimum current.">
          <input id="harvestW" name="harvestW" value={expression} onChange={(e) => setExpression(e.target.value)} className="figure" required />
        </Field>
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
        {!readOnly && (
          <button className="btn self-start" type="submit" name="intent" value="save" disabled={busy}>
            {busy ? "Saving…" : submitLabel}
          </button>
        )}
      </fieldset>
      <section className="card" aria-label="Harvest curve">
        <h2 className="mb-2">Harvest curve</h2>
        <HarvestCurve expression={expression} minA={minA} maxA={maxA} loadW={loadW} />
        <p className="mt-2 text-sm text-night-200">
          Power available from the line current, against the load (dashed amber). Below the minimum current (dashed red) the harvester gives nothing and the light
          lives on its storage.
        </p>
      </section>
    </Form>
  );
}
