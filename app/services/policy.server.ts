import { OrganisationPolicy } from "../../db/models";
import { DEFAULT_POLICY, type Policy } from "../../shared/study-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { noticeStaleApprovals } from "./reviews.server";

/** The organisation's verdict policy: its saved values over the defaults of docs/computation.md. */
export async function getPolicy(organisationId: number): Promise<Policy> {
  db();
  const row = await OrganisationPolicy.findByPk(organisationId);
  return { ...DEFAULT_POLICY, ...(row?.policy ?? {}) };
}

export async function savePolicy(actor: Actor, policy: Policy): Promise<void> {
  const sequelize = db();
  await sequelize.transaction(async (transaction) => {
    const row = await OrganisationPolicy.findByPk(actor.organisationId, { transaction });
    const before = row?.policy ?? DEFAULT_POLICY;
    if (row) await row.update({ policy, updatedBy: actor.id }, { transaction });
    else await OrganisationPolicy.create({ organisationId: actor.organisationId, policy, updatedBy: actor.id }, { transaction });
    await audit(actor, "policy.updated", "organisation", actor.organisationId, { before, after: policy }, transaction);
  });
  await noticeStaleApprovals(actor.organisationId);
}
