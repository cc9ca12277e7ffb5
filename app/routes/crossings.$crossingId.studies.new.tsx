import { useState } from "react";
import { Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.studies.new";
import { requireRole } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, withInputErrors, readForm } from "~/utils/forms.server";
import { circuitTimeZone, getCircuit, getCrossing } from "~/services/circuits.server";
import { listProfiles } from "~/services/profiles.server";
import { listDeviceProfiles } from "~/services/devices.server";
import { getPolicy } from "~/services/policy.server";
import { startCrossingStudy } from "~/services/studies.server";
import { studyFormToRequest, studyRequestSchema } from "../../shared/study-forms";
import { DEFAULT_SUN_ALTITUDE_DEG } from "../../shared/study-schemas";
import { Field, FormMessage } from "~/components/forms";
import { formatPercent } from "../../shared/format";
import { insufficientDataWarning, knownHoursInPeriod, type MonthCoverage } from "../../lib/ingest/known-hours";
import { defaultStudyPhase, studyPhaseChoices } from "../../shared/study-forms";
import { localDate, startOfLocalDay } from "../../shared/zoned-time";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireRole(context, "engineer");
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const circuit = await getCircuit(user.organisationId, crossing.circuitId);
  const [profiles, devices, policy] = await Promise.all([
    listProfiles(user.organisationId, crossing.circuitId),
    listDeviceProfiles(user.organisationId, { includeRetired: false }),
    getPolicy(user.organisationId),
  ]);
  return {
    crossing: { id: crossing.id, name: crossing.name },
    circuit: { id: circuit.id, name: circuit.name },
    timeZone: await circuitTimeZone(circuit),
    profiles: profiles.map((p) => ({
      id: p.id,
      name: p.name,
      phases: p.phases,
      start: p.startAt.toISOString(),
      end: p.endAt.toISOString(),
      monthlyCoverage: ((p.quality as { monthlyCoverage?: MonthCoverage[] }).monthlyCoverage ?? []).map((m) => ({ month: m.month, coverage: m.coverage })),
    })),
    devices: devices.map((d) => ({ id: d.id, name: d.name, minCurrentA: d.spec.minCurrentA, storageWh: d.spec.storageWh })),
    policy,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const crossingId = pageId(params.crossingId);
  // Period dates are days of the circuit's calendar.
  const crossing = await orNotFound(getCrossing(user.organisationId, crossingId));
  const timeZone = await circuitTimeZone(await getCircuit(user.organisationId, crossing.circuitId));
  const form = parseForm(studyRequestSchema, studyFormToRequest({ ...await readForm(request), crossingId }, timeZone));
  if (!form.ok) return form.response;
  const started = await withInputErrors(() => orNotFound(startCrossingStudy(user, form.value)));
  if (!started.ok) return started.response;
  // A long study runs as a job: its page shows the progress and then opens the study.
  throw redirect(started.value.job ? `/jobs/${started.value.job.id}` : `/studies/${started.value.study.id}`);
}

export default function NewStudy({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, circuit, profiles, devices, policy, timeZone } = loaderData;
  const busy = useNavigation().state === "submitting";
  const errors = actionData?.errors;
  const [profileId, setProfileId] = useState<number | undefined>(profiles[0]?.id);
  const profile = profiles.find((p) => p.id === profileId) ?? profiles[0];
  const [phase, setPhase] = useState(() => defaultStudyPhase(profile?.phases ?? "A"));
  const [period, setPeriod] = useState({ from: "", to: "" });
  const day = (d: string) => (/^\d{4}-\d{2}-\d{2}$/.test(d) ? startOfLocalDay(d, timeZone) : undefined);
  const warning = profile
    ? insufficientDataWarning(knownHoursInPeriod(profile.monthlyCoverage, Date.parse(profile.start), Date.parse(profile.end), day(period.from), day(period.to)), policy)
    : null;
  const [deviceId, setDeviceId] = useState<number | undefined>(devices[0]?.id);
  const chosenDevice = devices.find((d) => d.id === deviceId) ?? devices[0];
  return (
    <div className="flex flex-col gap-4">
      <title>{`New study · ${crossing.name} · Duskline`}</title>
      <h1>New feasibility study</h1>
      <p className="text-night-200">
        {crossing.name} on {circuit.name}. The study runs on the server and is saved with its inputs; earlier runs stay readable.
      </p>
      {profiles.length === 0 && <FormMessage tone="error">This circuit has no load profile yet. Upload its current history on the circuit page first.</FormMessage>}
      {devices.length === 0 && <FormMessage tone="error">There is no device profile in use. Create one under Device profiles first.</FormMessage>}
      {actionData?.message && <FormMessage tone="error">{actionData.message}</FormMessage>}
      <Form method="post" className="card flex max-w-2xl flex-col gap-4" noValidate>
        <Field name="profileId" label="Load profile" errors={errors} hint={profile && `${localDate(profile.start, timeZone)} – ${localDate(profile.end, timeZone)} (${timeZone}), phases ${profile.phases.split("").join(", ")}`}>
          <select
            id="profileId"
            name="profileId"
            required
            value={profile?.id}
            onChange={(e) => {
              const next = profiles.find((p) => p.id === Number(e.target.value));
              setProfileId(next?.id);
              if (next) setPhase(defaultStudyPhase(next.phases));
            }}
          >
            {profiles.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </select>
        </Field>
        <Field name="deviceProfileId" label="Device profile" errors={errors} hint={chosenDevice && `Minimum current ${chosenDevice.minCurrentA} A, storage ${chosenDevice.storageWh} Wh`}>
          <select id="deviceProfileId" name="deviceProfileId" required value={chosenDevice?.id} onChange={(e) => setDeviceId(Number(e.target.value))}>
            {devices.map((d) => (
              <option key={d.id} value={d.id}>
                {d.name}
              </option>
            ))}
          </select>
        </Field>
        <fieldset className="grid gap-3 sm:grid-cols-2">
          <legend className="mb-2 font-semibold">When must the light be on?</legend>
          <Field name="scheduleKind" label="Schedule" errors={errors}>
            <select id="scheduleKind" name="scheduleKind" defaultValue="night">
              <option value="night">Night (sun below the altitude)</option>
              <option value="always">Always (24 h)</option>
            </select>
          </Field>
          <Field name="scheduleSunAltitudeDeg" label="Sun altitude for night (°)" errors={errors} hint="−0.833° is sunset/sunrise; a higher value widens the window (photocells that switch early).">
            <input id="scheduleSunAltitudeDeg" name="sunAltitudeDeg" type="number" step="0.001" defaultValue={DEFAULT_SUN_ALTITUDE_DEG} className="figure" />
          </Field>
        </fieldset>
        <fieldset className="grid gap-3 sm:grid-cols-2">
          <legend className="mb-2 font-semibold">Parameters</legend>
          <Field
            name="paramsPhase"
            label="Phase the device hangs on"
            errors={errors}
            hint={
              profile && profile.phases.length >= 3 && phase === "min"
                ? "Lowest of the three by default: at each moment the weakest phase, the safe assumption while the device's phase is not settled."
                : undefined
            }
          >
            <select id="paramsPhase" name="phase" value={phase} onChange={(e) => setPhase(e.target.value)}>
              {studyPhaseChoices(profile?.phases ?? "A").map((p) => (
                <option key={p} value={p}>
                  {p === "min" ? "Lowest of the phases" : p}
                </option>
              ))}
            </select>
          </Field>
          <Field name="paramsInterpolation" label="Between samples" errors={errors} hint="Step suits store-on-change historians.">
            <select id="paramsInterpolation" name="interpolation" defaultValue="linear">
              <option value="linear">Linear</option>
              <option value="step">Step</option>
            </select>
          </Field>
          <Field name="paramsLoadScale" label="Load scale (what-if)" errors={errors} hint="0.8 = 20 % less load.">
            <input id="paramsLoadScale" name="loadScale" type="number" step="0.01" defaultValue={1} className="figure" />
          </Field>
          <Field name="paramsMaxGapMinutes" label="Max gap (min)" errors={errors} hint="Empty: 3 × the median interval.">
            <input id="paramsMaxGapMinutes" name="maxGapMinutes" type="number" step="any" className="figure" />
          </Field>
          <Field name="paramsPeriodStart" label={`Period from (date in ${timeZone})`} errors={errors} hint="Empty: whole profile.">
            <input id="paramsPeriodStart" name="periodStart" type="date" value={period.from} onChange={(e) => setPeriod({ ...period, from: e.target.value })} />
          </Field>
          <Field name="paramsPeriodEnd" label={`Period to (date in ${timeZone})`} errors={errors}>
            <input id="paramsPeriodEnd" name="periodEnd" type="date" value={period.to} onChange={(e) => setPeriod({ ...period, to: e.target.value })} />
          </Field>
          <Field name="paramsMonthlyTemperatureC" label="Monthly mean temperatures, Jan–Dec (°C)" errors={errors} hint="Twelve numbers, for the device's cold derating; empty: none.">
            <input id="paramsMonthlyTemperatureC" name="monthlyTemperatureC" className="figure" placeholder="-8 -5 2 9 15 21 25 24 18 10 2 -5" />
          </Field>
        </fieldset>
        <p className="text-sm text-night-400">
          Verdict policy of your organisation: go at availability ≥ {formatPercent(policy.goAvailability, 2)} and no dark stretch over {policy.maxDarkStretchHours} h; marginal at ≥{" "}
          {formatPercent(policy.marginalAvailability, 2)}; insufficient data below {policy.minKnownHours} known hours or {formatPercent(policy.minCoverage, 0)} coverage.
        </p>
        {warning && (
          <p role="status" className="rounded border border-amber-glow/60 p-3 text-sm text-amber-glow" data-testid="insufficient-data-warning">
            {warning} (Estimated from the profile's monthly coverage.)
          </p>
        )}
        <button className="btn self-start" type="submit" disabled={busy || profiles.length === 0 || devices.length === 0}>
          {busy ? "Running the study…" : "Run study"}
        </button>
      </Form>
    </div>
  );
}
