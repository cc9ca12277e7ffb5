// How many units a lighting option is costed for: the number stated on the option, or the count
// of the layout it follows — markers for marker options, the support-light layout's lights
// (structures × levels × lights per level) for lights on the supports — with where it came from.
import type { CrossingPlan } from "../crossings/plan";
import type { OptionKind } from "../../shared/cost-schemas";

/** What an option with no stated units is counted by: markers of the layout, or lights on the supports. */
export interface LayoutCounts {
  markers: number | null;
  supportLights: { total: number; basis: string } | null;
}

/** The counts a crossing's plan gives (null where the plan could not be made). */
export function layoutCounts(plan: CrossingPlan): LayoutCounts {
  return plan.ok ? { markers: plan.layout.count, supportLights: { total: plan.supportLights.count.total, basis: plan.supportLights.count.basis } } : { markers: null, supportLights: null };
}

export type UnitsSource = "stated" | "marker layout" | "support lights";

/** An option's units: the stated number, or the count of the layout it follows, with where it came from in words. */
export function unitsOf(kind: OptionKind, stated: number | null, counts: LayoutCounts): { units: number; source: UnitsSource; basis: string } {
  if (stated != null) return { units: stated, source: "stated", basis: "stated for this option" };
  if (kind === "structure-supply") {
    return counts.supportLights
      ? { units: counts.supportLights.total, source: "support lights", basis: `support-light layout: ${counts.supportLights.basis}` }
      : { units: 1, source: "support lights", basis: "support-light layout not available (fix the span details): costed for one light" };
  }
  return counts.markers != null
    ? { units: counts.markers, source: "marker layout", basis: `marker layout: ${counts.markers} markers` }
    : { units: 1, source: "marker layout", basis: "marker layout not available (fix the span details): costed for one marker" };
}

