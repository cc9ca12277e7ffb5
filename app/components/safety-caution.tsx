/** The caution every results page carries (product brief §1). */
export function SafetyCaution() {
  return (
    <aside role="note" aria-label="Safety caution" className="rounded-lg border border-amber-glow/50 bg-amber-glow/10 px-4 py-3 text-sm text-night-100">
      <strong className="text-amber-glow">Planning aid only.</strong> Duskline's results support a decision; they do not make it. The governing
      rule set, local codes, the aviation authority's determination and licensed engineering judgement take precedence. Any work on or
      near energized lines follows your utility's own safe work practice.
    </aside>
  );
}
