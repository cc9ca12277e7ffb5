import { Form, Link, redirect, type ShouldRevalidateFunctionArgs } from "react-router";
import { useMemo } from "react";
import type { Route } from "./+types/studies.$studyId";
import { hasRole, requireRole, requireUser } from "~/utils/auth.server";
import { orNotFound, pageId, parseForm, readForm, withInputErrors } from "~/utils/forms.server";
import { rerunStudy, studyPage, whatIf } from "~/services/studies.server";
import { FormMessage } from "~/components/forms";
import { SafetyCaution } from "~/components/safety-caution";
import { OutageReporting } from "~/components/outage-reporting";
import { VerdictBadge } from "~/components/verdict-badge";
import { ChartsShownBanner, useWhatIf, WhatIfPanel } from "~/components/what-if-panel";
import { monthlyRowsOf, StudyResultCharts } from "~/components/study-result-charts";
import { whatIfSchema } from "../../shared/study-forms";
import { switchedOutFromText } from "../../shared/optimise-forms";
import { NightCalendarGrid } from "~/components/night-calendar";
import { ReportLinks } from "~/components/report-links";
import { ChartFrame, CHART_COLOURS } from "~/components/charts/chart-frame";
import { CurrentTimeline } from "~/components/charts/current-timeline";
import { monthRanges, zoomSteps } from "../../shared/zoom";
import { formatAvailability, formatHours, formatNumber, formatPercent, roundToTotal } from "../../shared/format";
import { formatLocal, localDate } from "../../shared/zoned-time";
import { LocalTime } from "~/components/local-time";
import { useDragZoom, ZoomControls } from "~/components/charts/zoom-controls";
import { zoomQuery } from "~/utils/zoom-query";
import { fromJsonText } from "../../shared/json-text";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const { phase: _phase, ...query } = zoomQuery(new URL(request.url));
  const page = await orNotFound(studyPage(user.organisationId, pageId(params.studyId), query));
  return { ...page, query, canRun: hasRole(user, ["engineer"]) };
}

/**
 * `intent=what-if` recomputes the study with other figures for any reader (nothing saved, as
 * POST /api/v1/studies/{id}/what-if); otherwise the study is re-run with the current device
 * profile and policy, and the old run stays readable.
 */
export async function action({ request, params, context }: Route.ActionArgs) {
  const fields = await readForm(request);
  if (fields.intent === "what-if") {
    const reader = await requireUser(context);
    const form = parseForm(whatIfSchema, { ...fields, switchedOut: switchedOutFromText(fields.switchedOut) });
    if (!form.ok) return form.response;
    const answer = await withInputErrors(() => orNotFound(whatIf(reader.organisationId, pageId(params.studyId), form.value)));
    if (!answer.ok) return answer.response;
    return { whatIf: answer.value };
  }
  const user = await requireRole(context, "engineer");
  const rerun = await withInputErrors(() => orNotFound(rerunStudy(user, pageId(params.studyId))));
  if (!rerun.ok) return rerun.response;
  throw redirect(rerun.value.job ? `/jobs/${rerun.value.job.id}` : `/studies/${rerun.value.study.id}`);
}

/** A what-if changes nothing saved: the page's data is not loaded again after one. */
export function shouldRevalidate({ formData, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return formData?.get("intent") === "what-if" ? false : defaultShouldRevalidate;
}

export default function StudyResults({ loaderData, actionData }: Route.ComponentProps) {
  const { crossing, circuit, timeline, nightsShaded, canRun, stale, timeZone, range, whole, query, outageRule } = loaderData;
  const study = useMemo(() => fromJsonText(loaderData.study), [loaderData.study]);
  const onZoom = useDragZoom(`/studies/${study.id}`);
  const whatIfState = useWhatIf();
  const { inputs, results: r } = study;
  const L = r.lighting;
  const device = inputs.device;
  const unknownRequired = Math.max(0, L.requiredHours - L.requiredKnownHours);
  const monthlyRows = monthlyRowsOf(r.monthly);
  const shareAtMin = r.period.knownHours > 0 ? r.current.hoursAtOrAboveMin / r.period.knownHours : null;
  const rating = r.current.rating ?? null;
  const darkShare = L.requiredKnownHours > 0 ? L.darkHours / L.requiredKnownHours : 0;
  const solvers = study.results.solvers;
  const worstWeek = r.storage?.worstWeek;
  return (
    <div className="flex flex-col gap-6">
      <title>{`Study ${study.id} · ${crossing?.name ?? ""} · Duskline`}</title>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-night-400">
            <Link to="/circuits">Circuits</Link> / {circuit && <Link to={`/circuits/${circuit.id}`}>{circuit.name}</Link>} /{" "}
            {crossing && <Link to={`/crossings/${crossing.id}`}>{crossing.name}</Link>} /
          </p>
          <h1>Feasibility study {study.id}</h1>
          <p className="mt-1 text-sm text-night-200">
            Run <LocalTime iso={study.createdAt} zone={timeZone} /> in <span className="figure">{formatNumber(study.runMs)} ms</span> · device <strong>{inputs.deviceProfile.name}</strong> · load profile{" "}
            <strong>{inputs.profile.name}</strong>
            {inputs.profile.version !== undefined && (
              <span title={inputs.profile.fingerprint ? `SHA-256 of the samples: ${inputs.profile.fingerprint}` : undefined}> (data version {inputs.profile.version})</span>
            )}{" "}
            · phase {inputs.params.phase} · {inputs.schedule.kind === "night" ? `night (sun below ${inputs.schedule.sunAltitudeDeg}°)` : "always on"} ·{" "}
            {r.settings.interpolation} interpolation · max gap {formatNumber(r.settings.maxGapSeconds / 60, 1)} min ({r.settings.maxGapSource})
            {r.settings.loadScale !== 1 && ` · load scaled × ${r.settings.loadScale}`}
          </p>
          <p className="text-xs text-night-400">Times in {timeZone} (the circuit's time zone); hover a time for UTC. API results and exports are in UTC.</p>
        </div>
        <div className="no-print flex flex-wrap gap-2">
          <ReportLinks studyId={study.id} />
          {canRun && crossing && (
            <Link to={`/crossings/${crossing.id}/studies/new`} className="btn-quiet">
              Run again with other inputs
            </Link>
          )}
        </div>
      </div>

      <SafetyCaution />

      {actionData && "message" in actionData && (
        <FormMessage tone="error">
          {actionData.message} {"errors" in actionData && Object.values(actionData.errors ?? {}).flat().join(" ")}
        </FormMessage>
      )}
      {stale.length > 0 && (
        <div role="status" className="card flex flex-wrap items-center justify-between gap-3 border-amber-glow/50">
          <p className="text-sm">
            <strong className="text-amber-glow">Inputs changed.</strong> This run stays as it was, but {stale.join("; ")}.
          </p>
          {canRun && study.profileId && study.deviceProfileId && (
            <Form method="post">
              <button className="btn" type="submit">
                Run again with current inputs
              </button>
            </Form>
          )}
        </div>
      )}

      <section className="card flex flex-col gap-2" aria-labelledby="verdict-heading">
        <div className="flex flex-wrap items-center gap-3">
          <h2 id="verdict-heading">Verdict</h2>
          <VerdictBadge status={r.verdict.status} large />
          <span className="text-sm text-night-400">judged on {r.verdict.basis.label}</span>
        </div>
        <ul className="list-disc pl-6 text-night-100">
          {r.verdict.reasons.map((x) => (
            <li key={x}>{x}</li>
          ))}
        </ul>
        <p className="text-xs text-night-400">
          Policy: go at ≥ {formatPercent(inputs.policy.goAvailability, 2)} with no dark stretch over {inputs.policy.maxDarkStretchHours} h; marginal at ≥{" "}
          {formatPercent(inputs.policy.marginalAvailability, 2)}; at least {formatNumber(inputs.policy.minKnownHours)} known hours and {formatPercent(inputs.policy.minCoverage, 0)} coverage.
        </p>
      </section>

      <section className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4" aria-label="Summary figures">
        <Figure
          label="Availability (lit / required known hours, rounded down)"
          value={formatAvailability(L.availability)}
          note={darkShare > 0 && darkShare < 0.0001 ? "< 0.01 % of the required known time dark" : undefined}
          accent
        />
        <Figure label="Required hours: lit / dark / unknown" value={roundToTotal([L.litHours, L.darkHours, unknownRequired], 1).map((h) => formatNumber(h, 1)).join(" / ")} />
        <Figure label="Longest dark stretch" value={formatHours(L.longestDarkStretchHours, 2)} />
        <Figure label="Dark events · reportable (> 30 min)" value={`${L.darkEvents} · ${L.reportableOutages}`} />
        <Figure label="Data coverage (known / total hours)" value={r.period.coverage == null ? "—" : formatPercent(r.period.coverage, 1)} />
        <Figure label={`Hours at or above ${device.minCurrentA} A`} value={`${formatHours(r.current.hoursAtOrAboveMin)}${shareAtMin == null ? "" : ` (${formatPercent(shareAtMin, 1)})`}`} />
        {rating ? (
          <Figure
            label={`Hours above the circuit's ${formatNumber(rating.ratingA)} A normal rating`}
            value={formatHours(rating.hoursAbove)}
            note={rating.ratingA !== device.maxCurrentA ? `Above the device's ${formatNumber(device.maxCurrentA)} A maximum: ${formatHours(r.current.hoursAboveMax)}` : undefined}
          />
        ) : (
          <Figure label={`Hours above the device's ${formatNumber(device.maxCurrentA)} A maximum`} value={formatHours(r.current.hoursAboveMax)} note="The circuit has no normal rating on record." />
        )}
        <Figure label={`Analysed period (${timeZone})`} value={`${formatLocal(r.period.start, timeZone)} → ${formatLocal(r.period.end, timeZone)}`} small />
      </section>
      <OutageReporting count={L.reportableOutages} rule={outageRule} />
      {r.annualised && (
        <p className="text-sm text-night-200">
          {r.annualised.label}: about {formatHours(r.annualised.darkHours)} dark, {formatNumber(r.annualised.reportableOutages, 1)} reportable outages and{" "}
          {formatHours(r.annualised.hoursBelowMin)} below the minimum current per year.
        </p>
      )}

      {r.yearly.length > 1 && (
        <section className="card overflow-x-auto" aria-labelledby="years-heading">
          <h2 id="years-heading" className="mb-2">
            By calendar year
          </h2>
          <table>
            <thead>
              <tr>
                <th scope="col">Year</th>
                <th scope="col">Complete</th>
                <th scope="col">Hours ≥ min current</th>
                <th scope="col">Availability</th>
                <th scope="col">Dark hours</th>
                <th scope="col">Longest dark</th>
                <th scope="col">Coverage</th>
              </tr>
            </thead>
            <tbody>
              {r.yearly.map((y) => (
                <tr key={y.year}>
                  <td className="figure">{y.year}</td>
                  <td>{y.complete ? "yes" : "part"}</td>
                  <td className="figure">{formatHours(y.hoursAtOrAboveMin)}</td>
                  <td className="figure">{formatAvailability(y.availability)}</td>
                  <td className="figure">{formatHours(y.darkHours)}</td>
                  <td className="figure">{formatHours(y.longestDarkStretchHours, 2)}</td>
                  <td className="figure">{y.coverage == null ? "—" : formatPercent(y.coverage, 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}

      <WhatIfPanel
        whatIf={whatIfState}
        devices={loaderData.deviceChoices}
        savedDevice={{ id: study.deviceProfileId, name: inputs.deviceProfile.name }}
        minCurrentA={device.minCurrentA}
        storageWh={device.storageWh}
        loadScale={r.settings.loadScale}
        disabled={study.profileId ? undefined : "The load profile of this study was deleted, so it cannot be recomputed."}
      />

      <ChartsShownBanner whatIf={whatIfState} />
      {whatIfState.shown ? (
        <StudyResultCharts r={whatIfState.shown.charts} device={whatIfState.shown.device} timeZone={timeZone} whatIf />
      ) : (
        <StudyResultCharts r={r} device={device} timeZone={timeZone} />
      )}

      {timeline ? (
        <>
          <ChartFrame
            title={`Current over time, phase ${inputs.params.phase}`}
            height={320}
            summary={`${formatLocal(timeline.start, timeZone)} to ${formatLocal(timeline.end, timeZone)}: lowest and highest current per ${formatNumber(timeline.bucketSeconds / 3600, 2)} h bucket; ${timeline.unknown.length} unknown stretch(es) shaded grey${nightsShaded ? ", required (night) windows shaded navy" : ""}; dashed line at the ${device.minCurrentA} A minimum.`}
          >
            <CurrentTimeline data={timeline} timeZone={timeZone} onZoom={onZoom} thresholds={[{ value: device.minCurrentA, label: `min ${device.minCurrentA} A`, colour: CHART_COLOURS.nogo }]} />
          </ChartFrame>
          <ZoomControls
            path={`/studies/${study.id}`}
            query={query}
            timeZone={timeZone}
            months={monthRanges(r.period.start, r.period.end, timeZone)}
            steps={zoomSteps(range, whole, timeZone)}
            shownDates={{ from: localDate(range.start * 1000, timeZone), to: localDate(range.end * 1000 - 1, timeZone) }}
            extra={worstWeek ? [{ label: "Worst week", from: worstWeek.start, to: worstWeek.end }] : []}
          />
        </>
      ) : (
        <p className="card text-night-400">The load profile of this study was deleted; the current chart is not available. The saved figures above stay valid.</p>
      )}

      {r.coldCost && (
        <section className="card flex flex-col gap-2 overflow-x-auto" aria-labelledby="cold-heading">
          <h2 id="cold-heading">What the cold months cost</h2>
          <p data-testid="cold-cost">
            With the device's cold derating at the study's temperatures (recorded monthly means where the load profile has them, else the monthly normals): {formatHours(r.coldCost.darkHours)} dark; without it {formatHours(r.coldCost.darkHoursWithoutDerating)}{" "}
            (availability {formatAvailability(r.coldCost.availabilityWithoutDerating)}). The cold costs {formatHours(r.coldCost.extraDarkHours)} of darkness.
          </p>
          <table>
            <thead>
              <tr>
                <th scope="col">Month</th>
                <th scope="col">Mean °C</th>
                <th scope="col">Extra dark</th>
              </tr>
            </thead>
            <tbody>
              {r.coldCost.byMonth
                .filter((m) => m.extraDarkHours > 0)
                .map((m) => (
                  <tr key={m.month}>
                    <td>{m.month}</td>
                    <td className="figure">{m.temperatureC}</td>
                    <td className="figure">{formatHours(m.extraDarkHours)}</td>
                  </tr>
                ))}
            </tbody>
          </table>
        </section>
      )}

      <NightCalendarGrid
        calendar={r.nights}
        solarOffsetSeconds={r.settings.location.lon * 240}
        traceHref={study.profileId ? (n) => `/studies/${study.id}?from=${n.start}&to=${n.end}` : undefined}
      />

      <section className="card" aria-labelledby="solver-heading">
        <h2 id="solver-heading" className="mb-2">
          What it would take to reach go
        </h2>
        <table>
          <tbody>
            <tr>
              <th scope="row">Smallest storage that reaches go</th>
              <td className="figure">{solvers.minStorage.reachable ? `${formatNumber(solvers.minStorage.value ?? 0, 0)} Wh (± ${solvers.minStorage.tolerance} Wh)` : "not reachable"}</td>
              <td className="text-sm text-night-200">{solvers.minStorage.reason}</td>
            </tr>
            <tr>
              <th scope="row">Largest minimum operating current that still reaches go</th>
              <td className="figure">{solvers.maxMinCurrent.reachable ? `${formatNumber(solvers.maxMinCurrent.value ?? 0, 1)} A (± ${solvers.maxMinCurrent.tolerance} A)` : "not reachable"}</td>
              <td className="text-sm text-night-200">{solvers.maxMinCurrent.reason}</td>
            </tr>
          </tbody>
        </table>
      </section>

      <section className="card overflow-x-auto" aria-labelledby="dark-heading">
        <h2 id="dark-heading" className="mb-2">
          Longest dark stretches
        </h2>
        {L.darkStretches.length === 0 ? (
          <p className="text-night-400">The light would never have been dark in the known required time.</p>
        ) : (
          <table>
            <thead>
              <tr>
                <th scope="col">From</th>
                <th scope="col">To</th>
                <th scope="col">Length</th>
                <th scope="col">Reportable</th>
              </tr>
            </thead>
            <tbody>
              {L.darkStretches.slice(0, 20).map((d) => (
                <tr key={d.start}>
                  <td>
                    <LocalTime iso={d.start} zone={timeZone} />
                  </td>
                  <td>
                    <LocalTime iso={d.end} zone={timeZone} />
                  </td>
                  <td className="figure">{formatHours(d.hours, 2)}</td>
                  <td>{d.hours > 0.5 ? "yes (> 30 min)" : "no"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section className="card overflow-x-auto" aria-labelledby="months-heading">
        <h2 id="months-heading" className="mb-2">
          Monthly figures
        </h2>
        <p className="mb-2 text-sm text-night-200">Required hours = lit + dark + unknown (required time with no known current); hours rounded so each row adds up.</p>
        <table>
          <thead>
            <tr>
              <th scope="col">Month</th>
              <th scope="col">Known h</th>
              <th scope="col">≥ min h</th>
              <th scope="col">Required h</th>
              <th scope="col">Lit h</th>
              <th scope="col">Dark h</th>
              <th scope="col">Unknown h</th>
              <th scope="col">Availability</th>
              <th scope="col">Longest dark</th>
              <th scope="col">Reportable</th>
            </tr>
          </thead>
          <tbody>
            {r.monthly.map((m, i) => (
              <tr key={m.month}>
                <td className="figure">{m.month}</td>
                <td className="figure">{formatNumber(m.knownHours, 1)}</td>
                <td className="figure">{formatNumber(m.hoursAtOrAboveMin, 1)}</td>
                <td className="figure">{formatNumber(monthlyRows[i].required, 1)}</td>
                <td className="figure">{formatNumber(monthlyRows[i].lit, 1)}</td>
                <td className="figure">{formatNumber(monthlyRows[i].dark, 1)}</td>
                <td className="figure">{formatNumber(monthlyRows[i].unknown, 1)}</td>
                <td className="figure">{formatAvailability(m.availability, 2)}</td>
                <td className="figure">{formatHours(m.longestDarkStretchHours, 2)}</td>
                <td className="figure">{m.reportableOutages}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </div>
  );
}

function Figure({ label, value, note, accent = false, small = false }: { label: string; value: string; note?: string; accent?: boolean; small?: boolean }) {
  return (
    <div className="card">
      <p className="text-sm text-night-400">{label}</p>
      <p className={`figure mt-1 ${small ? "text-base" : "text-2xl"} ${accent ? "text-amber-glow" : ""}`}>{value}</p>
      {note && <p className="mt-1 text-xs text-night-200">{note}</p>}
    </div>
  );
}
