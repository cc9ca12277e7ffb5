import { Link } from "react-router";
import type { Route } from "./+types/rules";
import { hasRole, requireUser } from "~/utils/auth.server";
import { ruleBookEntries } from "~/services/rule-book.server";
import { RuleStatus } from "~/components/rule-status";
import { valuesInWords } from "../../lib/rulebook/book";
import { RULE_SET_LABELS } from "../../shared/crossing-details-schemas";
import { citation } from "../../shared/rule-book";

export async function loader({ context }: Route.LoaderArgs) {
  const user = await requireUser(context);
  const entries = await ruleBookEntries(user.organisationId);
  return {
    canConfirm: hasRole(user, ["consultant"]),
    rules: entries.map((e) => ({ ruleSet: e.ruleSet, source: e.source, values: valuesInWords(e.values), citation: citation(e.source) })),
  };
}

export default function RuleBook({ loaderData }: Route.ComponentProps) {
  const { rules, canConfirm } = loaderData;
  return (
    <div className="flex flex-col gap-4">
      <title>Rule book · Duskline</title>
      <h1>Rule book</h1>
      <p className="max-w-3xl text-sm text-night-200">
        The marking rules every layout in your organisation uses, with the document, edition and paragraph each comes from. Duskline ships them with the status they were checked to; an
        administrator or consultant confirms a rule against their own copy of the current edition, or corrects its value (the old value stays in the rule's history). Changing a value that an
        approved crossing relied on makes that approval out of date.
      </p>
      {(["faa", "icao"] as const).map((set) => (
        <section key={set} className="card flex flex-col gap-2" aria-labelledby={`rules-${set}`}>
          <h2 id={`rules-${set}`}>{RULE_SET_LABELS[set]}</h2>
          <table>
            <thead>
              <tr>
                <th scope="col">Rule</th>
                <th scope="col">Value</th>
                <th scope="col">Source</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {rules
                .filter((r) => r.ruleSet === set)
                .map((r) => (
                  <tr key={r.source.key} id={r.source.key}>
                    <td>
                      <Link to={`/rules/${r.source.key}`} className="font-semibold">
                        {r.source.title}
                      </Link>
                      <p className="text-xs text-night-400">{r.source.rule}</p>
                    </td>
                    <td className="figure text-sm">{r.values || "—"}</td>
                    <td className="whitespace-nowrap text-sm">{r.citation}</td>
                    <td>
                      <RuleStatus source={r.source} />
                      {canConfirm && (
                        <p>
                          <Link to={`/rules/${r.source.key}`} className="text-xs">
                            Confirm or correct
                          </Link>
                        </p>
                      )}
                    </td>
                  </tr>
                ))}
            </tbody>
          </table>
        </section>
      ))}
    </div>
  );
}
