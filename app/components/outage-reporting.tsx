import { Link } from "react-router";
import type { RuleReference } from "../../shared/marker-schemas";
import { RuleStatus } from "./rule-status";

/** Beside a study's reportable outages: what the operator must do for each, with the rule and its status. */
export function OutageReporting({ count, rule }: { count: number; rule: RuleReference }) {
  return (
    <p className="text-sm text-night-200" data-testid="outage-reporting">
      {count > 0
        ? `${count === 1 ? "The reportable outage is" : `Each of the ${count} reportable outages is`} a light outage of more than 30 minutes: ${rule.rule.charAt(0).toLowerCase()}${rule.rule.slice(1)}. `
        : `No reportable outage in this period. ${rule.rule}. `}
      <span className="text-night-400">
        Source: <Link to={`/rules/${rule.key}`}>{rule.section}</Link> — <RuleStatus source={rule} />.
      </span>
    </p>
  );
}
