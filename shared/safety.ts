/** The caution every results page and report carries (product brief §1), in one place. */
export const SAFETY_CAUTION = {
  lead: "Planning aid only.",
  body:
    "Duskline's results support a decision; they do not make it. The governing rule set, local codes, the aviation authority's determination and licensed engineering judgement take precedence. Any work on or near energized lines follows your utility's own safe work practice.",
};
