import { defaultRuleSetAt } from "../../lib/geo/rule-set";
import { Circuit, Crossing, LoadProfile, Organisation } from "../../db/models";
import type { CircuitInput, CrossingInput } from "../../shared/circuit-schemas";
import type { CrossingDetails } from "../../shared/crossing-details-schemas";
import type { Transaction } from "sequelize";
import { db, inTransaction } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { InputError, NotFoundError } from "./errors.server";
import { noticeStaleApprovals } from "./reviews.server";

export function circuitJson(c: Circuit) {
  return {
    id: c.id,
    name: c.name,
    voltageKv: c.voltageKv,
    phases: c.phases,
    normalRatingA: c.normalRatingA,
    notes: c.notes,
    /** The circuit's own IANA time zone; null: the organisation's. */
    timeZone: c.timeZone ?? null,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

export function crossingJson(x: Crossing) {
  return {
    id: x.id,
    circuitId: x.circuitId,
    name: x.name,
    lat: x.lat,
    lon: x.lon,
    spanLength: { value: x.spanLengthValue, unit: x.spanLengthUnit },
    kind: x.kind,
    details: crossingDetailsJson(x),
    createdAt: x.createdAt.toISOString(),
    updatedAt: x.updatedAt.toISOString(),
  };
}

export type CrossingDetailColumns = Pick<
  Crossing,
  | "supportHeightA" | "supportHeightB" | "attachmentHeightA" | "attachmentHeightB" | "sagKind" | "sagValue" | "surfaceLevel" | "highestWire"
  | "wireSeparation" | "topWireCount" | "topWireSeparation" | "runwayEndDistance" | "runwayEndCriticalArea" | "ruleSet" | "markerDiameterValue" | "markerDiameterUnit" | "icaoColour"
  | "litPhase" | "costCurrency"
>;

/** Span and marking details; lengths in the span's unit, null where not stated. */
export function crossingDetailsJson(x: CrossingDetailColumns): CrossingDetails {
  return {
    supportHeightA: x.supportHeightA ?? null,
    supportHeightB: x.supportHeightB ?? null,
    attachmentHeightA: x.attachmentHeightA ?? null,
    attachmentHeightB: x.attachmentHeightB ?? null,
    sagKind: x.sagKind ?? null,
    sagValue: x.sagValue ?? null,
    surfaceLevel: x.surfaceLevel ?? null,
    highestWire: x.highestWire ?? null,
    wireSeparation: x.wireSeparation ?? null,
    topWireCount: x.topWireCount ?? null,
    topWireSeparation: x.topWireSeparation ?? null,
    runwayEndDistance: x.runwayEndDistance ?? null,
    runwayEndCriticalArea: Boolean(x.runwayEndCriticalArea),
    ruleSet: x.ruleSet ?? "faa",
    markerDiameter: x.markerDiameterValue != null && x.markerDiameterUnit ? { value: x.markerDiameterValue, unit: x.markerDiameterUnit } : null,
    icaoColour: x.icaoColour ?? "red",
    litPhase: x.litPhase ?? null,
    costCurrency: x.costCurrency ?? "USD",
  };
}

export async function listCircuits(organisationId: number) {
  db();
  const circuits = await Circuit.findAll({ where: { organisationId }, order: [["name", "ASC"]] });
  const [crossingCounts, profileCounts] = await Promise.all([
    Crossing.count({ where: { organisationId }, group: ["circuitId"] }),
    LoadProfile.count({ where: { organisationId }, group: ["circuitId"] }),
  ]);
  const byCircuit = (rows: { circuitId?: number; count: number }[]) => new Map(rows.map((r) => [r.circuitId, r.count]));
  const crossings = byCircuit(crossingCounts as unknown as { circuitId: number; count: number }[]);
  const profiles = byCircuit(profileCounts as unknown as { circuitId: number; count: number }[]);
  return circuits.map((c) => ({ ...circuitJson(c), crossings: crossings.get(c.id) ?? 0, profiles: profiles.get(c.id) ?? 0 }));
}

/** The time zone a circuit's times are shown in: its own, else its organisation's. */
export async function circuitTimeZone(circuit: Pick<Circuit, "organisationId" | "timeZone">): Promise<string> {
  if (circuit.timeZone) return circuit.timeZone;
  return organisationTimeZone(circuit.organisationId);
}

export async function organisationTimeZone(organisationId: number): Promise<string> {
  db();
  const organisation = await Organisation.findByPk(organisationId, { attributes: ["timeZone"] });
  return organisation?.timeZone ?? "UTC";
}

/** Sets the organisation's time zone (circuits without their own follow it). */
export async function setOrganisationTimeZone(actor: Actor, timeZone: string) {
  const sequelize = db();
  await sequelize.transaction(async (transaction) => {
    const organisation = await Organisation.findByPk(actor.organisationId, { transaction });
    if (!organisation) throw new NotFoundError(`Organisation ${actor.organisationId}`);
    const before = organisation.timeZone;
    await organisation.update({ timeZone }, { transaction });
    await audit(actor, "organisation.time-zone-changed", "organisation", actor.organisationId, { from: before, to: timeZone }, transaction);
  });
}

export async function getCircuit(organisationId: number, id: number): Promise<Circuit> {
  db();
  const circuit = await Circuit.findOne({ where: { id, organisationId } });
  if (!circuit) throw new NotFoundError(`Circuit ${id}`);
  return circuit;
}

async function assertUniqueName(organisationId: number, name: string, exceptId?: number) {
  const other = await Circuit.findOne({ where: { organisationId, name } });
  if (other && other.id !== exceptId) throw new InputError(`A circuit named "${name}" already exists.`, "name");
}

export async function createCircuit(actor: Actor, input: CircuitInput, outer?: Transaction) {
  db();
  await assertUniqueName(actor.organisationId, input.name);
  return inTransaction(outer, async (transaction) => {
    const c = await Circuit.create(
      { organisationId: actor.organisationId, name: input.name, voltageKv: input.voltageKv, phases: input.phases, normalRatingA: input.normalRatingA ?? null, notes: input.notes ?? null, timeZone: input.timeZone ?? null },
      { transaction },
    );
    await audit(actor, "circuit.created", "circuit", c.id, { name: c.name }, transaction);
    return c;
  });
}

export async function updateCircuit(actor: Actor, id: number, input: CircuitInput) {
  const sequelize = db();
  const circuit = await getCircuit(actor.organisationId, id);
  await assertUniqueName(actor.organisationId, input.name, id);
  await sequelize.transaction(async (transaction) => {
    await circuit.update({ ...input, normalRatingA: input.normalRatingA ?? null, notes: input.notes ?? null, timeZone: input.timeZone ?? null }, { transaction });
    await audit(actor, "circuit.updated", "circuit", id, { ...input }, transaction);
  });
  return circuit;
}

export async function deleteCircuit(actor: Actor, id: number) {
  const sequelize = db();
  const circuit = await getCircuit(actor.organisationId, id);
  await sequelize.transaction(async (transaction) => {
    await circuit.destroy({ transaction });
    await audit(actor, "circuit.deleted", "circuit", id, { name: circuit.name }, transaction);
  });
}

export async function listCrossings(organisationId: number, circuitId: number) {
  db();
  await getCircuit(organisationId, circuitId);
  return Crossing.findAll({ where: { organisationId, circuitId }, order: [["name", "ASC"]] });
}

export async function getCrossing(organisationId: number, id: number): Promise<Crossing> {
  db();
  const crossing = await Crossing.findOne({ where: { id, organisationId } });
  if (!crossing) throw new NotFoundError(`Crossing ${id}`);
  return crossing;
}

async function assertUniqueCrossing(circuitId: number, name: string, exceptId?: number) {
  const other = await Crossing.findOne({ where: { circuitId, name } });
  if (other && other.id !== exceptId) throw new InputError(`This circuit already has a crossing named "${name}".`, "name");
}

function crossingRow(input: CrossingInput) {
  return { name: input.name, lat: input.lat, lon: input.lon, spanLengthValue: input.spanLength.value, spanLengthUnit: input.spanLength.unit, kind: input.kind };
}

export async function createCrossing(actor: Actor, circuitId: number, input: CrossingInput, outer?: Transaction) {
  db();
  await getCircuit(actor.organisationId, circuitId);
  await assertUniqueCrossing(circuitId, input.name);
  return inTransaction(outer, async (transaction) => {
    const ruleSet = input.ruleSet ? { ruleSet: input.ruleSet, reason: "Rule set chosen when the crossing was created." } : defaultRuleSetAt(input.lat, input.lon);
    const x = await Crossing.create({ organisationId: actor.organisationId, circuitId, ...crossingRow(input), ruleSet: ruleSet.ruleSet }, { transaction });
    await audit(actor, "crossing.created", "crossing", x.id, { name: x.name, circuitId, ruleSet: ruleSet.ruleSet, ruleSetReason: ruleSet.reason }, transaction);
    return x;
  });
}

export async function updateCrossing(actor: Actor, id: number, input: CrossingInput) {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, id);
  await assertUniqueCrossing(crossing.circuitId, input.name, id);
  await sequelize.transaction(async (transaction) => {
    await crossing.update(crossingRow(input), { transaction });
    await audit(actor, "crossing.updated", "crossing", id, { ...input }, transaction);
  });
  await noticeStaleApprovals(actor.organisationId, id);
  return crossing;
}

export async function deleteCrossing(actor: Actor, id: number) {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, id);
  await sequelize.transaction(async (transaction) => {
    await crossing.destroy({ transaction });
    await audit(actor, "crossing.deleted", "crossing", id, { name: crossing.name }, transaction);
  });
  return crossing.circuitId;
}
