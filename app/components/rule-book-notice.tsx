import { Link } from "react-router";
import type { RuleReference } from "../../shared/marker-schemas";
import { editionFindings } from "../../shared/rule-book";

/**
 * Said once near the top of a crossing: the rules its layout rests on that nobody has confirmed
 * yet (with a link to confirm the first), and replaced or mixed editions among the rules cited.
 */
export function RuleBookNotice({ references }: { references: RuleReference[] }) {
  const unique = [...new Map(references.map((r) => [r.key, r])).values()];
  const unconfirmed = unique.filter((r) => r.status === "unconfirmed" && !r.confirmedBy);
  const editions = editionFindings(unique.filter((r) => !r.confirmedBy));
  if (!unconfirmed.length && !editions.length) return null;
  return (
    <div role="note" className="rounded-md border border-verdict-marginal/60 px-3 py-2 text-sm" data-testid="rule-book-notice">
      {unconfirmed.length > 0 && (
        <p>
          <span className="font-semibold text-verdict-marginal">{`This layout rests on ${unconfirmed.length === 1 ? "an unconfirmed rule" : `${unconfirmed.length} unconfirmed rules`}: `}</span>
          {unconfirmed.map((r) => `${r.title} (${r.section})`).join("; ")}.{" "}
          <Link to={`/rules/${unconfirmed[0].key}`}>{unconfirmed.length === 1 ? "Confirm it in the rule book" : "Confirm them in the rule book"}</Link>.
        </p>
      )}
      {editions.map((e) => (
        <p key={e} className="text-night-200">
          {e}
        </p>
      ))}
    </div>
  );
}
