import { DeviceProfile } from "../../db/models";
import { compileDevice, DeviceError } from "../../lib/engine";
import { comparisonRow } from "../../lib/engine/harvest-curve";
import { splitDeviceProfile, type DeviceProfileInput } from "../../shared/device-forms";
import type { Device } from "../../shared/study-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { InputError, NotFoundError } from "./errors.server";

export function deviceProfileJson(d: DeviceProfile) {
  return { id: d.id, name: d.name, note: d.note, spec: d.spec, retired: d.retired, updatedAt: d.updatedAt.toISOString() };
}

export async function listDeviceProfiles(organisationId: number, { includeRetired = true } = {}) {
  db();
  const where = includeRetired ? { organisationId } : { organisationId, retired: false };
  return DeviceProfile.findAll({ where, order: [["retired", "ASC"], ["name", "ASC"]] });
}

export async function getDeviceProfile(organisationId: number, id: number) {
  db();
  const d = await DeviceProfile.findOne({ where: { id, organisationId } });
  if (!d) throw new NotFoundError(`Device profile ${id}`);
  return d;
}

/** The engine's own checks (expression, power never negative, …) as a field error. */
export function checkDevice(spec: Device) {
  try {
    compileDevice(spec);
  } catch (error) {
    if (error instanceof DeviceError) throw new InputError(error.message, error.path.join(".") || "harvestW", 400);
    throw error;
  }
}

async function assertUniqueName(organisationId: number, name: string, exceptId?: number) {
  const other = await DeviceProfile.findOne({ where: { organisationId, name } });
  if (other && other.id !== exceptId) throw new InputError(`A device profile named "${name}" already exists.`, "name");
}

export async function createDeviceProfile(actor: Actor, profile: DeviceProfileInput) {
  const sequelize = db();
  const input = splitDeviceProfile(profile);
  checkDevice(input.spec);
  await assertUniqueName(actor.organisationId, input.name);
  return sequelize.transaction(async (transaction) => {
    const d = await DeviceProfile.create({ organisationId: actor.organisationId, name: input.name, note: input.note, spec: input.spec }, { transaction });
    await audit(actor, "device-profile.created", "device-profile", d.id, { name: d.name }, transaction);
    return d;
  });
}

export async function updateDeviceProfile(actor: Actor, id: number, profile: DeviceProfileInput) {
  const sequelize = db();
  const input = splitDeviceProfile(profile);
  const d = await getDeviceProfile(actor.organisationId, id);
  checkDevice(input.spec);
  await assertUniqueName(actor.organisationId, input.name, id);
  await sequelize.transaction(async (transaction) => {
    await d.update({ name: input.name, note: input.note, spec: input.spec }, { transaction });
    await audit(actor, "device-profile.updated", "device-profile", id, { name: input.name, spec: input.spec }, transaction);
  });
  return d;
}

export async function duplicateDeviceProfile(actor: Actor, id: number) {
  const d = await getDeviceProfile(actor.organisationId, id);
  let name = `${d.name} (copy)`;
  for (let n = 2; await DeviceProfile.findOne({ where: { organisationId: actor.organisationId, name } }); n++) name = `${d.name} (copy ${n})`;
  return createDeviceProfile(actor, { ...d.spec, name, note: d.note });
}

export async function setDeviceProfileRetired(actor: Actor, id: number, retired: boolean) {
  const sequelize = db();
  const d = await getDeviceProfile(actor.organisationId, id);
  await sequelize.transaction(async (transaction) => {
    await d.update({ retired }, { transaction });
    await audit(actor, retired ? "device-profile.retired" : "device-profile.restored", "device-profile", id, null, transaction);
  });
  return d;
}

/** At most this many device profiles on one comparison chart (more lines are unreadable). */
export const COMPARE_MAX = 6;

/**
 * The profiles chosen for a side-by-side comparison (ids from the page's query, unknown ones
 * ignored), each with its harvest at the comparison currents and the current that carries its load.
 */
export function compareDeviceProfiles(devices: ReturnType<typeof deviceProfileJson>[], ids: string[]) {
  const wanted = new Set(ids.map(Number).filter((n) => Number.isInteger(n) && n > 0));
  return devices
    .filter((d) => wanted.has(d.id))
    .slice(0, COMPARE_MAX)
    .map((d) => ({ id: d.id, name: d.name, spec: d.spec, ...comparisonRow(d.spec) }));
}
