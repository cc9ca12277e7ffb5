import { SAFETY_CAUTION } from "../../shared/safety";

/** The caution every results page carries (product brief §1). */
export function SafetyCaution() {
  return (
    <aside role="note" aria-label="Safety caution" className="rounded-lg border border-amber-glow/50 bg-amber-glow/10 px-4 py-3 text-sm text-night-100">
      <strong className="text-amber-glow">{SAFETY_CAUTION.lead}</strong> {SAFETY_CAUTION.body}
    </aside>
  );
}
