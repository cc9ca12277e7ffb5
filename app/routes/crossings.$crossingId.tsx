import { useState } from "react";
import { Link } from "react-router";
import { reliedReferences, supportLightsInUse } from "../../lib/crossings/plan";
import type { Route } from "./+types/crossings.$crossingId";
import { hasRole, requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { circuitJson, crossingJson, getCrossing } from "~/services/circuits.server";
import { CROSSING_KIND_LABELS } from "../../shared/circuit-schemas";
import { crossingStudyRows } from "~/services/studies.server";
import { crossingMarkingAndOptions } from "~/services/lighting-options.server";
import { CrossingStudies } from "~/components/crossing-studies";
import { MarkerPlan } from "~/components/marker-plan";
import { OptionsComparison } from "~/components/lighting-options";
import { SafetyCaution } from "~/components/safety-caution";
import { ReviewPanel } from "~/components/review-panel";
import { RuleBookNotice } from "~/components/rule-book-notice";
import { AviationRecordPanel } from "~/components/aviation-record";
import { TemperatureNormalsPanel } from "~/components/temperature-normals";
import { crossingNoticeCheck } from "~/services/aviation-record.server";
import { reviewOf } from "~/services/reviews.server";
import { availableMoves, whoMayMove } from "../../lib/review/machine";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const crossing = await orNotFound(getCrossing(user.organisationId, pageId(params.crossingId)));
  const studies = await crossingStudyRows(user.organisationId, crossing.id);
  const { circuit, marking, options } = await crossingMarkingAndOptions(user.organisationId, crossing);
  const review = await reviewOf(user.organisationId, crossing);
  return {
    review,
    reviewMoves: availableMoves(review.state, user.role),
    whoMay: whoMayMove(review.state),
    crossing: crossingJson(crossing),
    circuit: circuitJson(circuit),
    canEdit: hasRole(user, ["engineer"]),
    canPlan: hasRole(user, ["engineer", "consultant"]),
    studies,
    marking,
    options,
    aviation: { record: crossing.aviationRecord ?? null, notice: crossingNoticeCheck(crossing, marking.plan) },
    temperatureNormals: crossing.temperatureNormals ?? null,
  };
}

export default function CrossingPage({ loaderData }: Route.ComponentProps) {
  const { crossing, circuit, canEdit, canPlan, studies, marking, options, review, reviewMoves, whoMay, aviation, temperatureNormals } = loaderData;
  const surface = crossing.kind === "river" || crossing.kind === "lake" ? "water" : "ground";
  // Support-structure lights: the user's switch, on by default where an option prices them or lit markers do not suit the wires.
  const [supportsLit, setSupportsLit] = useState(() => supportLightsInUse(marking.litSuitability, options.options.map((o) => o.kind)));
  return (
    <div className="flex flex-col gap-6">
      <title>{`${crossing.name} · Duskline`}</title>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-night-400">
            <Link to="/circuits">Circuits</Link> / <Link to={`/circuits/${circuit.id}`}>{circuit.name}</Link> /
          </p>
          <h1>{crossing.name}</h1>
          <p className="figure mt-1 text-night-200">
            {CROSSING_KIND_LABELS[crossing.kind]} · span {crossing.spanLength.value} {crossing.spanLength.unit} · {crossing.lat.toFixed(4)}, {crossing.lon.toFixed(4)} ·{" "}
            {circuit.voltageKv} kV
          </p>
        </div>
        {canEdit && (
          <Link to={`/crossings/${crossing.id}/edit`} className="btn-quiet">
            Edit crossing
          </Link>
        )}
      </div>
      <SafetyCaution />
      <RuleBookNotice references={reliedReferences(marking.plan, marking.litSuitability, supportsLit)} />
      <MarkerPlan
        crossingId={crossing.id}
        input={marking.input}
        rules={marking.rules}
        plan={marking.plan}
        wires={marking.litSuitability}
        surface={surface}
        canEdit={canPlan}
        supportsLit={supportsLit}
        onSupportsLitChange={setSupportsLit}
      />
      <AviationRecordPanel crossingId={crossing.id} record={aviation.record} notice={aviation.notice} canEdit={canPlan} />
      <TemperatureNormalsPanel crossingId={crossing.id} normals={temperatureNormals} canEdit={canPlan} />
      <OptionsComparison crossingId={crossing.id} view={options} canEdit={canPlan} />
      <CrossingStudies crossingId={crossing.id} studies={studies} canRun={canEdit} />
      <ReviewPanel
        crossingId={crossing.id}
        review={review}
        moves={reviewMoves}
        options={options.options.map((o) => ({ id: o.id, name: o.name }))}
        recommended={options.comparison.recommendation?.name ?? null}
        whoMay={whoMay}
      />
    </div>
  );
}
