// Life-cycle cost of one lighting option: present value and equivalent annual cost.
// Conventions: equipment, installation and any outage at year 0; maintenance at the end of
// each year 1..horizon; at every whole multiple of the service life strictly inside the
// horizon the equipment is bought and installed again (with its outage, since the same work
// is repeated); no salvage value for life left at the horizon.
// mathjs has no time-value-of-money functions, so the factors are written out here.
import type { LightingOption, OptionCost } from "../../shared/cost-schemas";

function checkRateAndPeriods(i: number, n: number): void {
  if (!(i >= 0) || !Number.isFinite(i)) throw new RangeError(`Discount rate must be ≥ 0, got ${i}`);
  if (!(n > 0) || !Number.isFinite(n)) throw new RangeError(`Number of periods must be > 0, got ${n}`);
}

/** Below this rate the closed forms lose precision ((1+i)^n − 1 cancels); a series expansion is used. */
const TINY_RATE = 1e-9;

/** Series factor P/A = ((1+i)^n − 1) / (i(1+i)^n), n when i = 0. */
function seriesFactor(i: number, n: number): number {
  if (i < TINY_RATE) return n * (1 - (i * (n + 1)) / 2);
  // expm1/log1p keep (1+i)^n − 1 accurate for small rates.
  return -Math.expm1(-n * Math.log1p(i)) / i;
}

/** Capital recovery factor A/P = i(1+i)^n / ((1+i)^n − 1); 1/n when i = 0. */
export function crf(i: number, n: number): number {
  checkRateAndPeriods(i, n);
  return 1 / seriesFactor(i, n);
}

/** Present worth of a uniform end-of-year series: P = A((1+i)^n − 1) / (i(1+i)^n); A·n when i = 0. */
export function presentWorthOfSeries(annualAmount: number, i: number, n: number): number {
  checkRateAndPeriods(i, n);
  return annualAmount * seriesFactor(i, n);
}

/** Present worth of a single amount paid at year t: F / (1+i)^t. */
export function presentWorthOfAmount(amount: number, i: number, t: number): number {
  return amount / Math.pow(1 + i, t);
}

/** Mobilisation plus working hours for every unit. */
export function installationCost(option: Pick<LightingOption, "units" | "installation">): number {
  const { mobilisation, ratePerHour, minutesPerUnit } = option.installation;
  return mobilisation + ratePerHour * ((minutesPerUnit * option.units) / 60);
}

/** Whole multiples of the service life strictly inside the horizon (life 15, horizon 40 → 15, 30). */
export function replacementYears(serviceLifeYears: number, horizonYears: number): number[] {
  const years: number[] = [];
  for (let year = serviceLifeYears; year < horizonYears; year += serviceLifeYears) years.push(year);
  return years;
}

export function presentValueOfOption(option: LightingOption): OptionCost {
  const i = option.discountRate;
  const horizon = option.horizonYears;
  const capital = option.units * option.unitPrice;
  const installation = installationCost(option);
  const outage = option.outage.needed ? option.outage.cost : 0;
  const initial = capital + installation + outage;

  const maintenancePV = presentWorthOfSeries(option.annualMaintenance, i, horizon);
  const replacements = replacementYears(option.serviceLifeYears, horizon);
  const replacementsPV = replacements.reduce((sum, year) => sum + presentWorthOfAmount(initial, i, year), 0);
  const totalPV = initial + maintenancePV + replacementsPV;

  const replacementSet = new Set(replacements);
  const cumulativeByYear: OptionCost["cumulativeByYear"] = [{ year: 0, nominal: initial, discounted: initial }];
  let nominal = initial;
  let discounted = initial;
  for (let year = 1; year <= horizon; year++) {
    const spend = option.annualMaintenance + (replacementSet.has(year) ? initial : 0);
    nominal += spend;
    discounted += presentWorthOfAmount(spend, i, year);
    cumulativeByYear.push({ year, nominal, discounted });
  }

  return {
    capital,
    installation,
    outage,
    maintenancePV,
    replacementsPV,
    replacementYears: replacements,
    totalPV,
    equivalentAnnualCost: totalPV * crf(i, horizon),
    cumulativeByYear,
  };
}
