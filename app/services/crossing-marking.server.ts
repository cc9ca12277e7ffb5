// A crossing's span and marking details, and the marker layout and span geometry they give.
import type { Circuit, Crossing } from "../../db/models";
import { crossingPlan, type CrossingPlanInput } from "../../lib/crossings/plan";
import { litMarkerSuitability } from "../../lib/markers";
import type { CrossingDetailsInput } from "../../shared/crossing-details-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { crossingDetailsJson, getCircuit, getCrossing, type CrossingDetailColumns } from "./circuits.server";
import { InputError } from "./errors.server";
import { noticeStaleApprovals } from "./reviews.server";
import { ruleTables } from "./rule-book.server";

/** What the layout and drawing are computed from; also sent to the page for the what-if. */
export function planInputOf(crossing: Crossing, circuit: Circuit): CrossingPlanInput {
  return {
    spanLength: { value: crossing.spanLengthValue, unit: crossing.spanLengthUnit },
    voltageKv: circuit.voltageKv,
    details: crossingDetailsJson(crossing),
    kind: crossing.kind,
  };
}

/**
 * Layout (lit as line-powered markers) under the organisation's rule book, geometry,
 * assumptions, and the wires' suitability for lit markers on their own. `rules` goes to the
 * page too, so the what-if in the browser uses the same book.
 */
export async function markingPlan(crossing: Crossing, circuit: Circuit) {
  const rules = await ruleTables(crossing.organisationId);
  const input = planInputOf(crossing, circuit);
  const plan = crossingPlan(input, { lit: true, rules });
  const { details } = input;
  const litSuitability = details.highestWire
    ? litMarkerSuitability({
        ruleSet: details.ruleSet,
        highestWireEnergized: details.highestWire === "phase",
        ...(details.highestWire === "shield" && details.wireSeparation != null ? { verticalSeparation: { value: details.wireSeparation, unit: input.spanLength.unit } } : {}),
        voltageKv: input.voltageKv,
      }, rules)
    : null;
  return { input, plan, litSuitability, rules };
}

// Paths of lib/markers and lib/span issues → the details form's field names.
const FIELD_OF_PATH: Record<string, string> = {
  markerDiameter: "markerDiameterValue",
  "markerDiameter.value": "markerDiameterValue",
  "sag.value": "sagValue",
  attachmentHeightA: "attachmentHeightA",
  attachmentHeightB: "attachmentHeightB",
  spanLength: "form",
  "spanLength.value": "form",
  "wiresAtTop.count": "topWireCount",
  "wiresAtTop.separation.value": "topWireSeparation",
};

function detailsRow(input: CrossingDetailsInput): CrossingDetailColumns {
  return {
    supportHeightA: input.supportHeightA ?? null,
    supportHeightB: input.supportHeightB ?? null,
    attachmentHeightA: input.attachmentHeightA ?? null,
    attachmentHeightB: input.attachmentHeightB ?? null,
    sagKind: input.sagKind ?? null,
    sagValue: input.sagValue ?? null,
    surfaceLevel: input.surfaceLevel ?? null,
    highestWire: input.highestWire ?? null,
    wireSeparation: input.wireSeparation ?? null,
    topWireCount: input.topWireCount ?? null,
    topWireSeparation: input.topWireSeparation ?? null,
    runwayEndDistance: input.runwayEndDistance ?? null,
    runwayEndCriticalArea: input.runwayEndCriticalArea,
    ruleSet: input.ruleSet,
    markerDiameterValue: input.markerDiameterValue ?? null,
    markerDiameterUnit: input.markerDiameterUnit ?? null,
    icaoColour: input.icaoColour,
    litPhase: input.litPhase ?? null,
    costCurrency: input.costCurrency,
  };
}

/** Saves the details after checking that the rules and the geometry accept them together with the span. */
export async function updateCrossingDetails(actor: Actor, id: number, input: CrossingDetailsInput): Promise<Crossing> {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, id);
  const circuit = await getCircuit(actor.organisationId, crossing.circuitId);
  const row = detailsRow(input);
  const trial = { ...planInputOf(crossing, circuit), details: crossingDetailsJson(row) };
  const plan = crossingPlan(trial, { lit: true, rules: await ruleTables(actor.organisationId) });
  if (!plan.ok) {
    const first = plan.errors[0];
    throw new InputError(first.message, FIELD_OF_PATH[first.path] ?? first.path.split(".")[0] ?? "form", 400);
  }
  await sequelize.transaction(async (transaction) => {
    await crossing.update(row, { transaction });
    await audit(actor, "crossing.details-updated", "crossing", id, { ...row }, transaction);
  });
  await noticeStaleApprovals(actor.organisationId, id);
  return crossing;
}
