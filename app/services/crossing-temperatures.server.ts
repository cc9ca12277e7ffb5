// A crossing's monthly normal temperatures (docs/computation.md "Cold-weather storage"): entered on
// the crossing page, audited, and used by its studies and the optimiser unless a run gives its own.
import type { Crossing } from "../../db/models";
import type { TemperatureNormals } from "../../shared/temperature-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { getCrossing } from "./circuits.server";

/** Sets (or, with null, clears) the normals in one transaction with their audit entry. */
export async function saveTemperatureNormals(actor: Actor, crossingId: number, normals: TemperatureNormals | null): Promise<Crossing> {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, crossingId);
  await sequelize.transaction(async (transaction) => {
    await crossing.update({ temperatureNormals: normals }, { transaction });
    await audit(actor, "crossing.temperature-normals-updated", "crossing", crossingId, { name: crossing.name, monthlyC: normals?.monthlyC ?? null, source: normals?.source ?? null }, transaction);
  });
  return crossing;
}
