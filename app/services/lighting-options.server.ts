// Lighting options of a crossing: storage, demo starting figures, and the side-by-side
// comparison (life-cycle cost from lib/costs) with the recommendation.
import type { Crossing, Study } from "../../db/models";
import { LightingOption } from "../../db/models";
import { compareOptions, DEMO_DEFAULTS_LABEL, demoOption, presentValueOfOption } from "../../lib/costs";
import type { Feasibility, InstallationMethod, LightingOption as CostedOption, OptionKind } from "../../shared/cost-schemas";
import type { CrossingPlan } from "../../lib/crossings/plan";
import { layoutCounts, unitsOf, type LayoutCounts, type UnitsSource } from "../../lib/costs/units";
import type { LitMarkerSuitability } from "../../shared/marker-schemas";
import type { LightingOptionFormInput, LightingOptionValues } from "../../shared/lighting-option-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { getCircuit, getCrossing } from "./circuits.server";
import { markingPlan } from "./crossing-marking.server";
import { InputError, NotFoundError } from "./errors.server";
import { latestStudyOfCrossing } from "./studies.server";
import { noticeStaleApprovals } from "./reviews.server";

export { DEMO_DEFAULTS_LABEL };
export type { LayoutCounts };

export function optionValues(o: LightingOption): LightingOptionValues {
  return {
    id: o.id,
    name: o.name,
    kind: o.kind,
    units: o.units,
    unitPrice: o.unitPrice,
    installationMethod: o.installationMethod,
    mobilisation: o.mobilisation,
    ratePerHour: o.ratePerHour,
    minutesPerUnit: o.minutesPerUnit,
    outageNeeded: o.outageNeeded,
    outageCost: o.outageCost,
    annualMaintenance: o.annualMaintenance,
    serviceLifeYears: o.serviceLifeYears,
    horizonYears: o.horizonYears,
    // Stored as a fraction; shown in per cent without binary noise (0.07 → 7, not 7.000000000000001).
    discountRatePercent: Math.round(o.discountRate * 100 * 1e6) / 1e6,
    feasibilityStatus: o.feasibilityStatus,
    feasibilityJustification: o.feasibilityJustification,
  };
}

/**
 * Starting figures for a new option: the invented demo defaults of lib/costs for its kind and
 * method (labelled as such on the page). Units are left empty, so marker kinds follow the marker
 * layout's count and lights on the supports the support-light layout's.
 */
export function newOptionValues(kind: OptionKind, method: InstallationMethod | undefined, counts: LayoutCounts): LightingOptionValues {
  const demo = demoOption({ kind, units: unitsOf(kind, null, counts).units, method });
  return {
    name: demo.kind === "line-powered" ? "Line-powered lit markers" : demo.kind === "solar" ? "Solar lit markers" : demo.kind === "unlit" ? "Unlit spheres" : "Lights on the supports",
    kind,
    units: null,
    unitPrice: demo.unitPrice,
    installationMethod: demo.installation.method,
    mobilisation: demo.installation.mobilisation,
    ratePerHour: demo.installation.ratePerHour,
    minutesPerUnit: demo.installation.minutesPerUnit,
    outageNeeded: demo.outage.needed,
    outageCost: demo.outage.cost,
    // Per unit in the demo table; stated here for the current unit count.
    annualMaintenance: demo.annualMaintenance,
    serviceLifeYears: demo.serviceLifeYears,
    horizonYears: demo.horizonYears,
    discountRatePercent: demo.discountRate * 100,
    feasibilityStatus: null,
    feasibilityJustification: null,
  };
}

export async function listOptions(organisationId: number, crossingId: number) {
  db();
  return LightingOption.findAll({ where: { organisationId, crossingId }, order: [["createdAt", "ASC"], ["id", "ASC"]] });
}

export async function getOption(organisationId: number, crossingId: number, id: number): Promise<LightingOption> {
  db();
  const option = await LightingOption.findOne({ where: { id, organisationId, crossingId } });
  if (!option) throw new NotFoundError(`Lighting option ${id}`);
  return option;
}

async function assertUniqueName(crossingId: number, name: string, exceptId?: number) {
  const other = await LightingOption.findOne({ where: { crossingId, name } });
  if (other && other.id !== exceptId) throw new InputError(`This crossing already has an option named "${name}".`, "name");
}

function optionRow(input: LightingOptionFormInput) {
  const lineFed = input.kind === "line-powered";
  return {
    kind: input.kind,
    name: input.name,
    units: input.units ?? null,
    unitPrice: input.unitPrice,
    installationMethod: input.installationMethod,
    mobilisation: input.mobilisation,
    ratePerHour: input.ratePerHour,
    minutesPerUnit: input.minutesPerUnit,
    outageNeeded: input.outageNeeded,
    outageCost: input.outageNeeded ? input.outageCost : 0,
    annualMaintenance: input.annualMaintenance,
    serviceLifeYears: input.serviceLifeYears,
    horizonYears: input.horizonYears,
    discountRate: input.discountRatePercent / 100,
    // Line-powered feasibility always comes from the latest study, never from the form.
    feasibilityStatus: lineFed ? null : (input.feasibilityStatus ?? null),
    feasibilityJustification: lineFed ? null : (input.feasibilityJustification ?? null),
  };
}

export async function createOption(actor: Actor & { id: number | null }, crossingId: number, input: LightingOptionFormInput) {
  const sequelize = db();
  await getCrossing(actor.organisationId, crossingId);
  await assertUniqueName(crossingId, input.name);
  return sequelize.transaction(async (transaction) => {
    const option = await LightingOption.create({ organisationId: actor.organisationId, crossingId, ...optionRow(input), createdBy: actor.id }, { transaction });
    await audit(actor, "lighting-option.created", "lighting-option", option.id, { crossingId, ...optionRow(input) }, transaction);
    return option;
  });
}

export async function updateOption(actor: Actor, crossingId: number, id: number, input: LightingOptionFormInput) {
  const sequelize = db();
  const option = await getOption(actor.organisationId, crossingId, id);
  await assertUniqueName(crossingId, input.name, id);
  await sequelize.transaction(async (transaction) => {
    await option.update(optionRow(input), { transaction });
    await audit(actor, "lighting-option.updated", "lighting-option", id, { crossingId, ...optionRow(input) }, transaction);
  });
  await noticeStaleApprovals(actor.organisationId, crossingId);
  return option;
}

export async function deleteOption(actor: Actor, crossingId: number, id: number) {
  const sequelize = db();
  const option = await getOption(actor.organisationId, crossingId, id);
  await sequelize.transaction(async (transaction) => {
    await option.destroy({ transaction });
    await audit(actor, "lighting-option.deleted", "lighting-option", id, { crossingId, name: option.name }, transaction);
  });
  await noticeStaleApprovals(actor.organisationId, crossingId);
}

const VERDICT_WORDS: Record<Study["verdict"], string> = { go: "go", marginal: "marginal", "no-go": "no-go", "insufficient-data": "insufficient data" };

/**
 * Line-powered options are rated by the crossing's latest feasibility study; wires that do not
 * suit lit markers make them no-go whatever the study says.
 */
export function lineFedFeasibility(study: Pick<Study, "id" | "verdict" | "createdAt"> | null, wires: LitMarkerSuitability | null): Feasibility & { studyId: number | null } {
  const fromStudy = study
    ? `Latest feasibility study #${study.id} (${study.createdAt.toISOString().slice(0, 10)}): ${VERDICT_WORDS[study.verdict]}.`
    : "No feasibility study of this crossing yet: run one to rate line-powered lit markers.";
  if (wires && !wires.suitable) {
    const why = wires.reasons.filter((r) => /not suitable|not energized|provides lighted/.test(r)).join(" ") || wires.reasons.join(" ");
    return { status: "no-go", justification: `The wires do not suit lit markers: ${why} ${fromStudy}`, studyId: study?.id ?? null };
  }
  return { status: study?.verdict ?? "unknown", justification: fromStudy, studyId: study?.id ?? null };
}

export interface ComparedOption extends LightingOptionValues {
  id: number;
  effectiveUnits: number;
  /** True when the units follow a layout (markers or support lights) rather than being stated. */
  unitsFromLayout: boolean;
  unitsSource: UnitsSource;
  /** Where the units come from, in words ("support-light layout: 2 structures × 3 levels × 1 light per level = 6 …"). */
  unitsBasis: string;
  feasibility: Feasibility;
  studyId: number | null;
}

/** Options of a crossing costed and compared, with the cumulative cost per option for the chart. */
export async function crossingOptionsView(
  organisationId: number,
  crossing: Crossing,
  marking: { plan: CrossingPlan; litSuitability: LitMarkerSuitability | null },
) {
  const [rows, study] = await Promise.all([listOptions(organisationId, crossing.id), latestStudyOfCrossing(organisationId, crossing.id)]);
  const lineFed = lineFedFeasibility(study, marking.litSuitability);
  const currency = crossing.costCurrency ?? "USD";
  const counts = layoutCounts(marking.plan);
  const options: ComparedOption[] = rows.map((row) => {
    const values = optionValues(row);
    const units = unitsOf(row.kind, row.units, counts);
    const feasibility: Feasibility =
      row.kind === "line-powered"
        ? { status: lineFed.status, justification: lineFed.justification }
        : { status: row.feasibilityStatus ?? "unknown", justification: row.feasibilityJustification || "Not stated." };
    return { ...values, id: row.id, effectiveUnits: units.units, unitsFromLayout: units.source !== "stated", unitsSource: units.source, unitsBasis: units.basis, feasibility, studyId: row.kind === "line-powered" ? lineFed.studyId : null };
  });
  const costed: CostedOption[] = options.map((o) => ({
    id: String(o.id),
    name: o.name,
    kind: o.kind,
    units: o.effectiveUnits,
    unitPrice: o.unitPrice,
    installation: { method: o.installationMethod, mobilisation: o.mobilisation, ratePerHour: o.ratePerHour, minutesPerUnit: o.minutesPerUnit },
    outage: { needed: o.outageNeeded, cost: o.outageNeeded ? o.outageCost : 0 },
    annualMaintenance: o.annualMaintenance,
    serviceLifeYears: o.serviceLifeYears,
    horizonYears: o.horizonYears,
    discountRate: o.discountRatePercent / 100,
    feasibility: o.feasibility,
  }));
  const comparison = compareOptions(costed, { currency });
  if (options.some((o) => o.unitsFromLayout) && !marking.plan.ok) {
    comparison.warnings.push("The marker and support-light layouts could not be computed, so options that follow them are costed for one unit; fix the span and marking details.");
  }
  // Cumulative present value by year, one series per option, for the chart.
  const cumulative = costed.map((o) => presentValueOfOption(o).cumulativeByYear);
  const horizon = Math.max(0, ...costed.map((o) => o.horizonYears));
  const chartRows = Array.from({ length: horizon + 1 }, (_, year) => {
    const row: Record<string, number> = { year };
    cumulative.forEach((series, i) => {
      const point = series[year];
      if (point) row[`o${i}`] = Math.round(point.discounted);
    });
    return row;
  });
  return {
    currency,
    options,
    comparison,
    chart: { rows: chartRows, series: options.map((o, i) => ({ key: `o${i}`, label: o.name })) },
    latestStudy: study ? { id: study.id, verdict: study.verdict, createdAt: study.createdAt.toISOString() } : null,
    demoLabel: DEMO_DEFAULTS_LABEL,
  };
}
/** A crossing's marking plan and its options compared: what the crossing page and the API show. */
export async function crossingMarkingAndOptions(organisationId: number, crossing: Crossing) {
  const circuit = await getCircuit(organisationId, crossing.circuitId);
  const marking = await markingPlan(crossing, circuit);
  const options = await crossingOptionsView(organisationId, crossing, marking);
  return { circuit, marking, options };
}

/** What the option form shows beside its fields: the layout's count, how line-powered options are rated, the currency. */
export async function optionFormContext(organisationId: number, crossing: Crossing) {
  const circuit = await getCircuit(organisationId, crossing.circuitId);
  const { plan, litSuitability } = await markingPlan(crossing, circuit);
  const { studyId: _studyId, ...lineFed } = lineFedFeasibility(await latestStudyOfCrossing(organisationId, crossing.id), litSuitability);
  return { counts: layoutCounts(plan), lineFedFeasibility: lineFed, currency: crossing.costCurrency ?? "USD", demoLabel: DEMO_DEFAULTS_LABEL };
}

export type CrossingOptionsView = Awaited<ReturnType<typeof crossingOptionsView>>;
