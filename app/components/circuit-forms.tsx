import { CROSSING_KIND_LABELS, CROSSING_KINDS } from "../../shared/circuit-schemas";
import { Field, RecordForm, type FieldErrors } from "./forms";
import { TimeZoneNames } from "./time-zone-names";

export interface CircuitValues {
  name?: string;
  voltageKv?: number;
  phases?: number;
  normalRatingA?: number | null;
  notes?: string | null;
  timeZone?: string | null;
}

export function CircuitForm({
  values = {},
  errors,
  message,
  submitLabel,
  organisationTimeZone,
}: {
  values?: CircuitValues;
  errors?: FieldErrors;
  message?: string;
  submitLabel: string;
  /** Shown as the default when the circuit has no zone of its own. */
  organisationTimeZone: string;
}) {
  return (
    <RecordForm message={message} submitLabel={submitLabel}>
      <Field name="name" label="Name" errors={errors}>
        <input id="name" name="name" defaultValue={values.name} required maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field name="voltageKv" label="Voltage (kV)" errors={errors}>
          <input id="voltageKv" name="voltageKv" type="number" step="any" min="0" defaultValue={values.voltageKv} required className="figure" />
        </Field>
        <Field name="phases" label="Phases" errors={errors}>
          <input id="phases" name="phases" type="number" min="1" max="6" defaultValue={values.phases ?? 3} required className="figure" />
        </Field>
      </div>
      <Field name="normalRatingA" label="Normal rating (A)" errors={errors} hint="Optional: the circuit's continuous rating.">
        <input id="normalRatingA" name="normalRatingA" type="number" step="any" min="0" defaultValue={values.normalRatingA ?? ""} className="figure" />
      </Field>
      <Field name="timeZone" label="Time zone (IANA)" errors={errors} hint={`Times on its profile and study pages are shown in it, and the hour × month grid counts its clock. Empty: the organisation's (${organisationTimeZone}).`}>
        <input id="timeZone" name="timeZone" defaultValue={values.timeZone ?? ""} placeholder={organisationTimeZone} maxLength={64} list="time-zone-names" autoComplete="off" />
      </Field>
      <TimeZoneNames />
      <Field name="notes" label="Notes" errors={errors}>
        <textarea id="notes" name="notes" rows={3} defaultValue={values.notes ?? ""} />
      </Field>
    </RecordForm>
  );
}

export interface CrossingValues {
  name?: string;
  lat?: number;
  lon?: number;
  spanLength?: { value: number; unit: "m" | "ft" };
  kind?: string;
}

export function CrossingForm({ values = {}, errors, message, submitLabel, chooseRuleSet = false }: { values?: CrossingValues; errors?: FieldErrors; message?: string; submitLabel: string; chooseRuleSet?: boolean }) {
  return (
    <RecordForm message={message} submitLabel={submitLabel}>
      <Field name="name" label="Name" errors={errors}>
        <input id="name" name="name" defaultValue={values.name} required maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field name="lat" label="Latitude (°, north +)" errors={errors}>
          <input id="lat" name="lat" type="number" step="any" min="-90" max="90" defaultValue={values.lat} required className="figure" />
        </Field>
        <Field name="lon" label="Longitude (°, east +)" errors={errors}>
          <input id="lon" name="lon" type="number" step="any" min="-180" max="180" defaultValue={values.lon} required className="figure" />
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3">
        <Field name="spanLengthValue" label="Span length" errors={errors}>
          <input id="spanLengthValue" name="spanLengthValue" type="number" step="any" min="0" defaultValue={values.spanLength?.value} required className="figure" />
        </Field>
        <Field name="spanLengthUnit" label="Unit" errors={errors}>
          <select id="spanLengthUnit" name="spanLengthUnit" defaultValue={values.spanLength?.unit ?? "ft"}>
            <option value="ft">feet (ft)</option>
            <option value="m">metres (m)</option>
          </select>
        </Field>
      </div>
      <Field name="kind" label="Crossing kind" errors={errors}>
        <select id="kind" name="kind" defaultValue={values.kind ?? "river"}>
          {CROSSING_KINDS.map((k) => (
            <option key={k} value={k}>
              {CROSSING_KIND_LABELS[k]}
            </option>
          ))}
        </select>
      </Field>
      {chooseRuleSet && (
        <Field name="ruleSet" label="Rule set" errors={errors} hint="By default FAA inside the United States and its territories, ICAO elsewhere; change it later in the span and marking details.">
          <select id="ruleSet" name="ruleSet" defaultValue="">
            <option value="">From the location</option>
            <option value="faa">FAA AC 70/7460-1</option>
            <option value="icao">ICAO Annex 14</option>
          </select>
        </Field>
      )}
    </RecordForm>
  );
}
