import { useState, type ReactNode } from "react";
import { Form, Link, useNavigation } from "react-router";
import {
  HIGHEST_WIRE_LABELS,
  HIGHEST_WIRES,
  LIT_PHASES,
  RULE_SET_LABELS,
  SAG_KIND_LABELS,
  SAG_KINDS,
  type CrossingDetails,
} from "../../shared/crossing-details-schemas";
import { RULE_SETS, type RuleSet } from "../../shared/marker-schemas";
import type { DistanceUnit } from "../../shared/units";
import { Field, FormMessage, type FieldErrors } from "./forms";

/** The "Span and marking details" of a crossing; every length in the span's unit. */
export function CrossingDetailsForm({
  details,
  unit,
  voltageKv,
  errors,
  message,
}: {
  details: CrossingDetails;
  unit: DistanceUnit;
  voltageKv: number;
  errors?: FieldErrors;
  message?: string;
}) {
  const busy = useNavigation().state === "submitting";
  const [ruleSet, setRuleSet] = useState<RuleSet>(details.ruleSet);
  const length = (name: keyof CrossingDetails, label: string, hint?: ReactNode, allowNegative = false) => (
    <Field name={name} label={`${label} (${unit})`} errors={errors} hint={hint}>
      <input id={name} name={name} type="number" step="any" min={allowNegative ? undefined : "0"} defaultValue={(details[name] as number | null) ?? ""} className="figure" />
    </Field>
  );
  return (
    <Form method="post" className="flex max-w-3xl flex-col gap-4" noValidate>
      {message && <FormMessage tone="error">{message}</FormMessage>}
      <p className="text-sm text-night-400">
        {`Lengths in ${unit}, the span's unit. Heights are measured from the support bases, taken as one level. Anything left empty is assumed on the crossing page, and the page says what was assumed.`}
      </p>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Supports and conductor</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          {length("supportHeightA", "Support A height", "Top of the tower or pole above its base.")}
          {length("supportHeightB", "Support B height")}
          {length("attachmentHeightA", "Conductor attachment at A", "Highest energized conductor's attachment.")}
          {length("attachmentHeightB", "Conductor attachment at B")}
        </div>
        <div className="grid gap-3 sm:grid-cols-2">
          <Field name="sagKind" label="Sag given as" errors={errors}>
            <select id="sagKind" name="sagKind" defaultValue={details.sagKind ?? ""}>
              <option value="">Not stated (3 % of the span assumed)</option>
              {SAG_KINDS.map((k) => (
                <option key={k} value={k}>
                  {SAG_KIND_LABELS[k]}
                </option>
              ))}
            </select>
          </Field>
          {length("sagValue", "Sag or clearance")}
        </div>
        {length(
          "surfaceLevel",
          "Ground or water level under the span",
          "Relative to the support bases: 0 = level with them, negative = below (a river or canyon floor lower than the tower footings).",
          true,
        )}
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Wires</legend>
        <Field name="highestWire" label="Highest wire" errors={errors} hint={`Voltage ${voltageKv} kV comes from the circuit.`}>
          <select id="highestWire" name="highestWire" defaultValue={details.highestWire ?? ""}>
            <option value="">Not stated</option>
            {HIGHEST_WIRES.map((w) => (
              <option key={w} value={w}>
                {HIGHEST_WIRE_LABELS[w]}
              </option>
            ))}
          </select>
        </Field>
        {length("wireSeparation", "Vertical distance from the highest wire down to the highest energized conductor", <>
            {"0 when a phase conductor is highest. Lit markers need it within about 20 ft (6 m), an unconfirmed rule: "}
            <Link to="/rules/faa.lit-markers">confirm it in the rule book</Link>.
          </>,
        )}
        <div className="grid gap-3 sm:grid-cols-2">
          <Field name="topWireCount" label="Wires at the highest point" errors={errors} hint="Wires side by side at the top (two shield wires, say); empty = one. Markers go on each or alternately, per the rule book.">
            <input id="topWireCount" name="topWireCount" type="number" step="1" min="1" defaultValue={details.topWireCount ?? ""} className="figure" />
          </Field>
          {length("topWireSeparation", "Their separation side by side", "Horizontal distance between adjacent wires at the top; checks the distance between markers that alternate.")}
        </div>
        <Field name="litPhase" label="Phase lit devices would hang on" errors={errors}>
          <select id="litPhase" name="litPhase" defaultValue={details.litPhase ?? ""}>
            <option value="">Not chosen</option>
            {LIT_PHASES.map((p) => (
              <option key={p} value={p}>
                {`Phase ${p}`}
              </option>
            ))}
          </select>
        </Field>
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Marking rules</legend>
        <Field name="ruleSet" label="Rule set" errors={errors}>
          <select id="ruleSet" name="ruleSet" value={ruleSet} onChange={(e) => setRuleSet(e.target.value as RuleSet)}>
            {RULE_SETS.map((r) => (
              <option key={r} value={r}>
                {RULE_SET_LABELS[r]}
              </option>
            ))}
          </select>
        </Field>
        <div className="grid gap-3 sm:grid-cols-2">
          {length("runwayEndDistance", "Distance to the nearest runway end", <>
              {"Under FAA rules a runway end within the rule book's critical area sets the reduced spacing by itself. The 1,500 ft shipped is unconfirmed: "}
              <Link to="/rules/faa.runway-end-area">confirm it in the rule book</Link>.
            </>,
          )}
          <label className="flex items-center gap-2 self-end pb-2">
            <input type="checkbox" name="runwayEndCriticalArea" defaultChecked={details.runwayEndCriticalArea} />
            In a runway-end critical area (FAA: markers at most 50 ft apart)
          </label>
        </div>
        <div className="grid gap-3 sm:grid-cols-2">
          <Field name="markerDiameterValue" label="Sphere diameter (optional)" errors={errors} hint={ruleSet === "faa" ? "Empty: 36 in. 20 in only where the rule allows it." : "Empty: 60 cm. Larger spheres allow wider spacing (interpolated)."}>
            <input id="markerDiameterValue" name="markerDiameterValue" type="number" step="any" min="0" defaultValue={details.markerDiameter?.value ?? ""} className="figure" />
          </Field>
          <Field name="markerDiameterUnit" label="Diameter unit" errors={errors}>
            <select id="markerDiameterUnit" name="markerDiameterUnit" defaultValue={details.markerDiameter?.unit ?? (unit === "ft" ? "in" : "cm")}>
              <option value="in">inches (in)</option>
              <option value="cm">centimetres (cm)</option>
            </select>
          </Field>
        </div>
        {ruleSet === "icao" ? (
          <Field name="icaoColour" label="Colour alternating with white (ICAO)" errors={errors}>
            <select id="icaoColour" name="icaoColour" defaultValue={details.icaoColour}>
              <option value="red">Red</option>
              <option value="orange">Orange</option>
            </select>
          </Field>
        ) : (
          <input type="hidden" name="icaoColour" value={details.icaoColour} />
        )}
      </fieldset>

      <fieldset className="card flex flex-col gap-3">
        <legend className="px-1 font-semibold">Costs</legend>
        <Field name="costCurrency" label="Currency of the option costs" errors={errors} hint="ISO 4217 code.">
          <input id="costCurrency" name="costCurrency" defaultValue={details.costCurrency} maxLength={3} className="figure w-24 uppercase" />
        </Field>
      </fieldset>

      <button type="submit" className="btn self-start" disabled={busy}>
        {busy ? "Saving…" : "Save details"}
      </button>
    </Form>
  );
}
