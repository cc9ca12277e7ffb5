// A crossing's aviation record and the 14 CFR 77.9 notice check it allows (lib/notice/part77).
import type { Crossing } from "../../db/models";
import type { CrossingPlan } from "../../lib/crossings/plan";
import { checkNotice, type NoticeCheckResult } from "../../lib/notice/part77";
import type { AviationRecord } from "../../shared/aviation-record-schemas";
import { db } from "../utils/db.server";
import { audit, type Actor } from "./audit.server";
import { getCrossing } from "./circuits.server";

export async function saveAviationRecord(actor: Actor, crossingId: number, record: AviationRecord): Promise<Crossing> {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, crossingId);
  await sequelize.transaction(async (transaction) => {
    await crossing.update({ aviationRecord: record }, { transaction });
    await audit(actor, "crossing.aviation-record-updated", "crossing", crossingId, { name: crossing.name, ...record }, transaction);
  });
  return crossing;
}

export type NoticeView = { result: NoticeCheckResult; heightAgl: { value: number; unit: "ft" | "m" } } | { result: null; missing: string };

/**
 * The notice check of the crossing: the highest stated support top above the ground or water
 * against 77.9(a), and (b) when the nearest airport or heliport and the site elevation are recorded.
 */
export function crossingNoticeCheck(crossing: Crossing, plan: CrossingPlan): NoticeView {
  const unit = crossing.spanLengthUnit;
  if (crossing.supportHeightA == null && crossing.supportHeightB == null) return { result: null, missing: "State the support heights in the span and marking details to check whether notice to the FAA is required." };
  if (!plan.ok) return { result: null, missing: "The span details do not give a layout yet." };
  const record = crossing.aviationRecord ?? {};
  const heightAgl = { value: Math.max(plan.figures.supportTopA, plan.figures.supportTopB), unit };
  if (record.nearestKind && record.siteElevation === undefined) return { result: null, missing: "Record the site's ground elevation to check against the nearest airport or heliport." };
  const result = checkNotice({
    heightAgl,
    siteElevation: { value: record.siteElevation ?? 0, unit },
    ...(record.nearestKind
      ? {
          nearest: {
            kind: record.nearestKind,
            distance: { value: record.nearestDistance ?? 0, unit },
            ...(record.nearestLongestRunway !== undefined ? { longestRunway: { value: record.nearestLongestRunway, unit } } : {}),
            elevation: { value: record.nearestElevation ?? 0, unit },
          },
        }
      : {}),
  });
  return { result, heightAgl };
}
