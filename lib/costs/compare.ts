// Side-by-side comparison of lighting options and the recommendation: the cheapest option
// whose feasibility is `go`. Options are ranked by equivalent annual cost, which orders them
// exactly as present value does when all share a horizon and discount rate, and stays fair
// when they do not.
import type {
  LightingOption,
  OptionComparison,
  OptionComparisonRow,
} from "../../shared/cost-schemas";
import { presentValueOfOption } from "./lifecycle";

export interface CompareOptionsSettings {
  /** ISO 4217 code for amounts printed in reasons (default USD). */
  currency?: string;
  locale?: string;
}

export function compareOptions(options: readonly LightingOption[], settings: CompareOptionsSettings = {}): OptionComparison {
  const money = new Intl.NumberFormat(settings.locale ?? "en-US", {
    style: "currency",
    currency: settings.currency ?? "USD",
    maximumFractionDigits: 0,
  });
  const percent = new Intl.NumberFormat(settings.locale ?? "en-US", { style: "percent", maximumFractionDigits: 2 });
  const warnings: string[] = [];

  const sameBasis =
    options.length > 0 &&
    options.every((o) => o.horizonYears === options[0].horizonYears && o.discountRate === options[0].discountRate);
  if (options.length > 1 && !sameBasis) {
    warnings.push(
      "Options use different horizons or discount rates; they are compared by equivalent annual cost, and their present values are not directly comparable.",
    );
  }

  const costed = options.map((option, index) => ({ option, index, cost: presentValueOfOption(option) }));
  const byCost = [...costed].sort((x, y) => x.cost.equivalentAnnualCost - y.cost.equivalentAnnualCost || x.index - y.index);
  const rankOf = new Map(byCost.map((entry, position) => [entry.index, position + 1]));
  const goOptions = byCost.filter((entry) => entry.option.feasibility.status === "go");
  const chosen = goOptions[0];

  const describeCost = (entry: (typeof costed)[number]) =>
    `present value ${money.format(entry.cost.totalPV)}, equivalent annual cost ${money.format(entry.cost.equivalentAnnualCost)} per year over ${entry.option.horizonYears} years at ${percent.format(entry.option.discountRate)}`;

  let recommendation: OptionComparison["recommendation"] = null;
  if (chosen) {
    const reasons = [`${chosen.option.name} is the cheapest option rated go: ${describeCost(chosen)}.`];
    const runnerUp = goOptions[1];
    if (runnerUp) {
      const saving = runnerUp.cost.equivalentAnnualCost - chosen.cost.equivalentAnnualCost;
      reasons.push(
        `It costs ${money.format(saving)} per year less than ${runnerUp.option.name}, the next option rated go.`,
      );
    } else {
      reasons.push("It is the only option rated go.");
    }
    for (const cheaper of byCost.slice(0, byCost.indexOf(chosen))) {
      reasons.push(
        `${cheaper.option.name} is cheaper (${money.format(cheaper.cost.equivalentAnnualCost)} per year) but rated ${cheaper.option.feasibility.status}: ${cheaper.option.feasibility.justification}`,
      );
    }
    if (chosen.cost.replacementYears.length > 0) {
      reasons.push(
        `Its equipment is replaced in year${chosen.cost.replacementYears.length > 1 ? "s" : ""} ${chosen.cost.replacementYears.join(", ")} (service life ${chosen.option.serviceLifeYears} years).`,
      );
    }
    recommendation = { index: chosen.index, id: chosen.option.id, name: chosen.option.name, reasons };
  } else if (options.length > 0) {
    const cheapest = byCost[0];
    warnings.push(
      `No option is rated go, so none is recommended. The cheapest is ${cheapest.option.name} (${cheapest.option.feasibility.status}): ${describeCost(cheapest)}. Resolve feasibility before choosing.`,
    );
  } else {
    warnings.push("No options to compare.");
  }

  const rows: OptionComparisonRow[] = costed.map(({ option, index, cost }) => {
    const { cumulativeByYear: _cumulative, ...figures } = cost;
    return {
      ...figures,
      index,
      id: option.id,
      name: option.name,
      kind: option.kind,
      method: option.installation.method,
      feasibility: option.feasibility,
      horizonYears: option.horizonYears,
      discountRate: option.discountRate,
      costRank: rankOf.get(index) ?? index + 1,
      recommended: chosen?.index === index,
    };
  });

  return { rows, basis: sameBasis ? "present-value" : "equivalent-annual-cost", recommendation, warnings };
}
