import { Form, Link, redirect } from "react-router";
import type { Route } from "./+types/profiles.$profileId";
import { hasRole, requireRole, requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { deleteProfile, getProfile, profileOverview } from "~/services/profiles.server";
import { circuitTimeZone, getCircuit } from "~/services/circuits.server";
import { LocalTime } from "~/components/local-time";
import { useDragZoom, ZoomControls } from "~/components/charts/zoom-controls";
import { zoomQuery } from "~/utils/zoom-query";
import { ChartFrame, CHART_COLOURS } from "~/components/charts/chart-frame";
import { SafetyCaution } from "~/components/safety-caution";
import { ProfileUpload } from "~/components/profile-upload";
import { getEnv } from "~/utils/env.server";
import { CurrentTimeline } from "~/components/charts/current-timeline";
import { unpackTimeline } from "../../shared/packed-timeline";
import { CategoryBars } from "~/components/charts/bars";
import { GapTimeline } from "~/components/charts/gap-timeline";
import { monthRanges, zoomSteps } from "../../shared/zoom";
import { formatHours, formatNumber, formatPercent } from "../../shared/format";
import { formatLocal, localDate } from "../../shared/zoned-time";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const query = zoomQuery(new URL(request.url));
  const id = pageId(params.profileId);
  const circuit = await getCircuit(user.organisationId, (await orNotFound(getProfile(user.organisationId, id))).circuitId);
  const timeZone = await circuitTimeZone(circuit);
  const overview = await orNotFound(profileOverview(user.organisationId, id, query, timeZone));
  return {
    ...overview,
    query,
    timeZone,
    circuitName: circuit.name,
    circuit: { id: circuit.id, phases: circuit.phases, voltageKv: circuit.voltageKv },
    uploadMaxBytes: getEnv().UPLOAD_MAX_BYTES,
    canEdit: hasRole(user, ["engineer"]),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireRole(context, "engineer");
  const circuitId = await orNotFound(deleteProfile(user, pageId(params.profileId)));
  throw redirect(`/circuits/${circuitId}`);
}

const REASON_LABELS: Record<string, string> = {
  missing: "No current value",
  "not-a-number": "Current not a number",
  negative: "Negative current",
  "above-cap": "Above the plausibility cap",
  "bad-quality": "Quality flag not good",
  "missing-timestamp": "No timestamp",
  "bad-timestamp": "Timestamp not readable",
  "nonexistent-local-time": "Local time skipped by a daylight-saving change",
};

export default function ProfilePage({ loaderData }: Route.ComponentProps) {
  const { profile, chart, gaps, phase, phases, canEdit, circuitName, timeZone, range, whole, query } = loaderData;
  const q = profile.quality;
  const invalidTotal = Object.values(q.invalid ?? {}).reduce((a, b) => a + (b ?? 0), 0);
  const path = `/profiles/${profile.id}`;
  const onZoom = useDragZoom(path);
  return (
    <div className="flex flex-col gap-6">
      <title>{`${profile.name} · Duskline`}</title>
      <div>
        <p className="text-sm text-night-400">
          <Link to="/circuits">Circuits</Link> / <Link to={`/circuits/${profile.circuitId}`}>{circuitName}</Link> /
        </p>
        <h1>{profile.name}</h1>
        <p className="figure mt-1 text-night-200">
          <LocalTime iso={profile.start} zone={timeZone} /> → <LocalTime iso={profile.end} zone={timeZone} /> · phases {profile.phases.join(", ")} · {formatNumber(profile.samples)} samples · data version{" "}
          {profile.dataVersion}
        </p>
        <p className="text-xs text-night-400">Times in {timeZone} (the circuit's time zone); hover a time for UTC.</p>
      </div>

      <SafetyCaution />

      <section className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4" aria-label="Quality summary">
        <div className="card">
          <p className="text-sm text-night-400">Coverage (known time)</p>
          <p className="figure text-2xl text-amber-glow">{formatPercent(q.coverage, 1)}</p>
        </div>
        <div className="card">
          <p className="text-sm text-night-400">Rows read / kept</p>
          <p className="figure text-2xl">
            {formatNumber(q.rowsRead)} / {formatNumber(q.validSamples)}
          </p>
        </div>
        <div className="card">
          <p className="text-sm text-night-400">Median interval</p>
          <p className="figure text-2xl">{formatNumber(q.medianIntervalSeconds / 60, 1)} min</p>
        </div>
        <div className="card">
          <p className="text-sm text-night-400">Gaps (unknown time)</p>
          <p className="figure text-2xl">
            {q.gaps.count} · {formatHours(q.gaps.hours)}
          </p>
        </div>
      </section>

      {q.conversion && (
        <p className="card text-sm text-night-100">
          <strong>Converted from power.</strong> {q.conversion}
        </p>
      )}

      {q.warnings && q.warnings.length > 0 && (
        <ul className="card list-disc pl-8 text-sm text-amber-glow">
          {q.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      )}

      <ChartFrame
        title={`Current over time — phase ${phase === "min" ? "minimum of phases" : phase}`}
        height={300}
        summary={`${unpackTimeline(chart).filter((p) => p.minA != null).length} of ${chart.buckets} time buckets hold samples, from ${formatLocal(chart.start, timeZone)} to ${formatLocal(chart.end, timeZone)}; ${chart.unknown.length} unknown stretch(es) shaded grey. Each bucket spans ${formatNumber(chart.bucketSeconds / 3600, 2)} h and shows the lowest and highest current in it.`}
      >
        <CurrentTimeline data={chart} timeZone={timeZone} onZoom={onZoom} />
      </ChartFrame>
      <ZoomControls
        path={path}
        query={query}
        timeZone={timeZone}
        months={monthRanges(profile.start, profile.end, timeZone)}
        steps={zoomSteps(range, whole, timeZone)}
        shownDates={{ from: localDate(range.start * 1000, timeZone), to: localDate(range.end * 1000 - 1, timeZone) }}
        phases={phases.length > 1 ? [...phases, "min"].map((p) => ({ value: p, label: p === "min" ? "Min of phases" : `Phase ${p}` })) : undefined}
        selectedPhase={phase}
      />

      <figure className="card flex flex-col gap-2">
        <figcaption className="font-semibold">Gaps, flatlines and zero-current stretches on a timeline</figcaption>
        <GapTimeline start={profile.start} end={profile.end} unknown={gaps} flatlines={q.flatlines} zeros={q.zeroStretches} timeZone={timeZone} />
        <p className="text-sm text-night-200">
          {gaps.length} unknown stretch(es) of phase {phase === "min" ? "min" : phase} (longer than 3 × the median interval), {q.flatlines.length} flatline(s) and {q.zeroStretches.length}{" "}
          zero-current stretch(es) between <LocalTime iso={profile.start} zone={timeZone} /> and <LocalTime iso={profile.end} zone={timeZone} />.
        </p>
      </figure>

      <ChartFrame
        title="Coverage by month"
        summary={q.monthlyCoverage.map((m) => `${m.month}: ${formatPercent(m.coverage, 1)}`).join("; ")}
      >
        <CategoryBars rows={q.monthlyCoverage.map((m) => ({ month: m.month, coverage: Math.round(m.coverage * 1000) / 10 }))} category="month" unit=" %" series={[{ key: "coverage", label: "Coverage", colour: CHART_COLOURS.amber }]} />
      </ChartFrame>

      <div className="grid gap-4 lg:grid-cols-2">
        <section className="card" aria-labelledby="dropped-heading">
          <h2 id="dropped-heading" className="mb-2">
            Dropped and corrected rows
          </h2>
          <table>
            <tbody>
              {Object.entries(q.invalid ?? {}).map(([reason, count]) => (
                <tr key={reason}>
                  <td>{REASON_LABELS[reason] ?? reason}</td>
                  <td className="figure text-right">{formatNumber(count ?? 0)}</td>
                </tr>
              ))}
              <tr>
                <td>Duplicate timestamps (first kept)</td>
                <td className="figure text-right">{formatNumber(q.duplicates)}</td>
              </tr>
              <tr>
                <td>Rows out of time order (sorted)</td>
                <td className="figure text-right">{formatNumber(q.outOfOrder)}</td>
              </tr>
              <tr>
                <th scope="row">Invalid rows in all</th>
                <td className="figure text-right">{formatNumber(invalidTotal)}</td>
              </tr>
            </tbody>
          </table>
        </section>
        <section className="card" aria-labelledby="gaps-heading">
          <h2 id="gaps-heading" className="mb-2">
            Longest gaps
          </h2>
          <StretchTable rows={q.gaps.longest} empty="No gaps longer than the max-gap rule." timeZone={timeZone} />
        </section>
        <section className="card" aria-labelledby="flat-heading">
          <h2 id="flat-heading" className="mb-2">
            Flatlines (stuck sensor?)
          </h2>
          <StretchTable rows={q.flatlines.map((f) => ({ ...f, note: `${formatNumber(f.valueA, 1)} A on ${f.phase}` }))} empty="No flatlines found." timeZone={timeZone} />
        </section>
        <section className="card" aria-labelledby="zero-heading">
          <h2 id="zero-heading" className="mb-2">
            Zero-current stretches (line out?)
          </h2>
          <StretchTable rows={q.zeroStretches} empty="No zero-current stretches." timeZone={timeZone} />
        </section>
      </div>

      {canEdit && (
        <ProfileUpload
          key={`${profile.id}-${profile.dataVersion}`}
          circuitId={loaderData.circuit.id}
          phases={profile.phases.length}
          maxBytes={loaderData.uploadMaxBytes}
          voltageKv={loaderData.circuit.voltageKv}
          existingProfileId={profile.id}
          timeZone={timeZone}
        />
      )}
      {canEdit && (
        <Form method="post" className="no-print" onSubmit={(e) => !confirm(`Delete profile ${profile.name}? Studies that used it keep their saved results.`) && e.preventDefault()}>
          <button className="btn-quiet text-verdict-nogo" type="submit">
            Delete this profile
          </button>
        </Form>
      )}
    </div>
  );
}

function StretchTable({ rows, empty, timeZone }: { rows: { start: string; end: string; hours: number; note?: string }[]; empty: string; timeZone: string }) {
  if (rows.length === 0) return <p className="text-sm text-night-400">{empty}</p>;
  return (
    <table>
      <thead>
        <tr>
          <th scope="col">From</th>
          <th scope="col">To</th>
          <th scope="col">Length</th>
          {rows.some((r) => r.note) && <th scope="col">Value</th>}
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.start}>
            <td>
              <LocalTime iso={r.start} zone={timeZone} />
            </td>
            <td>
              <LocalTime iso={r.end} zone={timeZone} />
            </td>
            <td className="figure">{formatHours(r.hours)}</td>
            {r.note && <td className="figure">{r.note}</td>}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
