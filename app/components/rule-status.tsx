import type { RuleSource } from "../../shared/rule-book";
import { needsConfirmation, statusWords } from "../../shared/rule-book";

/** A rule's status in plain words, tinted by how sure it is (never "from memory"). */
export function RuleStatus({ source }: { source: RuleSource }) {
  const tone = source.confirmedBy
    ? "text-verdict-go"
    : needsConfirmation(source)
      ? "text-verdict-marginal"
      : source.status === "published"
        ? "text-verdict-go"
        : "text-night-200";
  return (
    <span className={`text-sm ${tone}`} data-testid={`rule-status-${source.key}`}>
      {statusWords(source)}
    </span>
  );
}
