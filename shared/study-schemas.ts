// Inputs and results of a feasibility study (issue 4; docs/computation.md and README.md).
// One set of schemas validates the study form, the stored study and POST /api/v1/feasibility,
// and generates the OpenAPI document (z.toJSONSchema). Messages are shown to users as written.
import { z } from "zod";
import { ingestOptionsSchema, timeZoneSchema, TIMESTAMP_RANGE_DESCRIPTION } from "./ingest-options";

const finite = (what: string) => z.number({ error: `${what} must be a number.` }).finite(`${what} must be a finite number.`);

// ---------------------------------------------------------------- device profile

/** One point of a storage's cold derating curve (docs/computation.md "Cold-weather storage"). */
export const coldPointSchema = z.object({
  tempC: finite("Derating temperature").min(-60, "Derating temperatures must be between −60 and 60 °C.").max(60, "Derating temperatures must be between −60 and 60 °C."),
  usableFraction: finite("Usable fraction").gt(0, "Usable fraction must be above 0.").max(1, "Usable fraction cannot exceed 1."),
});
export type ColdPoint = z.output<typeof coldPointSchema>;

/** One row of a harvest curve typed from a datasheet (docs/computation.md "Harvest curve from a table"). */
export const harvestPointSchema = z.object({
  currentA: finite("The current of each row"),
  watts: finite("The power of each row"),
});
export type HarvestPoint = z.output<typeof harvestPointSchema>;
export const HARVEST_POINTS_MAX = 200;

/** Row-named checks of a harvest table: currents rise from row to row, nothing negative. */
function checkHarvestPoints(points: readonly HarvestPoint[], ctx: z.RefinementCtx) {
  points.forEach((p, i) => {
    const row = `Row ${i + 1}`;
    if (p.currentA < 0) ctx.addIssue({ code: "custom", path: ["harvestPoints", i, "currentA"], message: `${row}: the current cannot be negative (${p.currentA} A).` });
    else if (i > 0 && p.currentA <= points[i - 1].currentA) {
      ctx.addIssue({ code: "custom", path: ["harvestPoints", i, "currentA"], message: `${row}: currents must increase from one row to the next (${p.currentA} A after ${points[i - 1].currentA} A).` });
    }
    if (p.watts < 0) ctx.addIssue({ code: "custom", path: ["harvestPoints", i, "watts"], message: `${row}: the power cannot be negative (${p.watts} W).` });
  });
}

export const deviceSchema = z
  .object({
    minCurrentA: finite("Minimum operating current").min(0, "Minimum operating current cannot be negative."),
    maxCurrentA: finite("Maximum current").positive("Maximum current must be above zero."),
    harvestW: z
      .string({ error: "Enter the harvest power as an expression in I, e.g. min(0.004 * I^2, 15)." })
      .trim()
      .min(1, "Enter the harvest power as an expression in I, e.g. min(0.004 * I^2, 15).")
      .max(500, "The harvest expression is too long (500 characters at most).")
      .optional(),
    /** The harvest curve as datasheet rows (current, watts), instead of harvestW: linear between rows. */
    harvestPoints: z
      .array(harvestPointSchema, { error: "The harvest table must be a list of {currentA, watts} rows." })
      .min(2, "The harvest table needs at least two rows (current, watts).")
      .max(HARVEST_POINTS_MAX, `The harvest table takes at most ${HARVEST_POINTS_MAX} rows.`)
      .optional(),
    loadW: finite("Load").positive("Load must be above zero watts."),
    standbyW: finite("Standby draw").min(0, "Standby draw cannot be negative.").default(0),
    storageWh: finite("Storage").min(0, "Storage cannot be negative (0 means none).").default(0),
    chargeEfficiency: finite("Charge efficiency")
      .gt(0, "Charge efficiency must be above 0.")
      .max(1, "Charge efficiency cannot exceed 1 (100 %).")
      .default(0.9),
    selfDischargePctPerDay: finite("Self-discharge")
      .min(0, "Self-discharge cannot be negative.")
      .lt(100, "Self-discharge must be below 100 % per day.")
      .default(0),
    initialCharge: finite("Initial charge")
      .min(0, "Initial charge must be between 0 and 1.")
      .max(1, "Initial charge must be between 0 and 1.")
      .default(1),
    lifeYears: finite("Service life").positive("Service life must be above zero years.").default(20),
    /** Hysteresis: the harvester switches on at this current and drops out below minCurrentA. Absent: minCurrentA. */
    turnOnCurrentA: finite("Turn-on current").min(0, "Turn-on current cannot be negative.").optional(),
    /** Cold-weather storage: usable share of the storage (and of its charge acceptance) by temperature. */
    coldDerating: z
      .array(coldPointSchema, { error: "Cold derating must be a list of {tempC, usableFraction} points." })
      .min(2, "Cold derating needs at least two points (°C, usable fraction).")
      .max(24, "Cold derating takes at most 24 points.")
      .optional(),
  })
  // Run even when other fields fail, so a body missing the harvest names it beside the rest.
  .superRefine(
    (d, ctx) => {
      if (typeof d !== "object" || d === null) return;
      if (d.harvestW === undefined && d.harvestPoints === undefined) {
        ctx.addIssue({ code: "custom", path: ["harvestW"], message: "Give the harvest power as an expression in I (harvestW) or as a table of rows (harvestPoints)." });
      } else if (d.harvestW !== undefined && d.harvestPoints !== undefined) {
        ctx.addIssue({ code: "custom", path: ["harvestPoints"], message: "Give the harvest power as an expression (harvestW) or as a table (harvestPoints), not both." });
      }
    },
    { when: () => true },
  )
  .superRefine((d, ctx) => {
    if (d.harvestPoints) checkHarvestPoints(d.harvestPoints, ctx);
  })
  .refine((d) => d.minCurrentA < d.maxCurrentA, {
    path: ["maxCurrentA"],
    message: "Maximum current must be above the minimum operating current.",
  })
  .refine((d) => d.turnOnCurrentA === undefined || d.turnOnCurrentA >= d.minCurrentA, {
    path: ["turnOnCurrentA"],
    message: "Turn-on current cannot be below the minimum (drop-out) current.",
  })
  .refine((d) => !d.coldDerating || d.coldDerating.every((p, i) => i === 0 || p.tempC > d.coldDerating![i - 1].tempC), {
    path: ["coldDerating"],
    message: "Cold derating temperatures must rise from one point to the next.",
  });

export type Device = z.output<typeof deviceSchema>;
export type DeviceInput = z.input<typeof deviceSchema>;

// ---------------------------------------------------------------- schedule and policy

export const DEFAULT_SUN_ALTITUDE_DEG = -0.833;

export const scheduleSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({
      kind: z.literal("night"),
      sunAltitudeDeg: finite("Sun altitude")
        .min(-18, "Sun altitude must be between −18° and +10°.")
        .max(10, "Sun altitude must be between −18° and +10°.")
        .default(DEFAULT_SUN_ALTITUDE_DEG),
    }),
    z.object({ kind: z.literal("always") }),
  ],
  { error: 'Schedule kind must be "night" or "always".' },
);
export type Schedule = z.output<typeof scheduleSchema>;

const share = (what: string) =>
  finite(what).min(0, `${what} must be between 0 and 1.`).max(1, `${what} must be between 0 and 1.`);

const policyFields = {
  minKnownHours: finite("Minimum known hours").min(0, "Minimum known hours cannot be negative."),
  minCoverage: share("Minimum coverage"),
  goAvailability: share("Go availability"),
  maxDarkStretchHours: finite("Longest allowed dark stretch").min(0, "Longest allowed dark stretch cannot be negative."),
  marginalAvailability: share("Marginal availability"),
};

const marginalNotAboveGo = {
  path: ["marginalAvailability"],
  message: "Marginal availability cannot be above the go availability.",
};

export const policySchema = z
  .object({
    minKnownHours: policyFields.minKnownHours.default(8000),
    minCoverage: policyFields.minCoverage.default(0.9),
    goAvailability: policyFields.goAvailability.default(0.999),
    maxDarkStretchHours: policyFields.maxDarkStretchHours.default(0.5),
    marginalAvailability: policyFields.marginalAvailability.default(0.99),
  })
  .refine((p) => p.marginalAvailability <= p.goAvailability, marginalNotAboveGo);
export type Policy = z.output<typeof policySchema>;
export const DEFAULT_POLICY: Policy = policySchema.parse({});

/** The policy fields an API caller or a study may override; the rest come from the organisation. */
export const policyOverridesSchema = z.object({
  minKnownHours: policyFields.minKnownHours.optional(),
  minCoverage: policyFields.minCoverage.optional(),
  goAvailability: policyFields.goAvailability.optional(),
  maxDarkStretchHours: policyFields.maxDarkStretchHours.optional(),
  marginalAvailability: policyFields.marginalAvailability.optional(),
});
export type PolicyOverrides = z.output<typeof policyOverridesSchema>;

// ---------------------------------------------------------------- study parameters

export const PHASE_CHOICES = ["A", "B", "C", "min"] as const;
export const INTERPOLATIONS = ["linear", "step"] as const;
export type Interpolation = (typeof INTERPOLATIONS)[number];

const isoInstant = (what: string) =>
  z.iso.datetime({ offset: true, error: `${what} must be an ISO 8601 date-time with a zone, e.g. 2025-01-01T00:00:00Z.` });

/** Years accepted for a period bound (lib/ingest/time-range.ts holds the same bounds). */
const PERIOD_YEARS = { min: 1900, max: 2200 };
const periodInstant = (what: string) =>
  isoInstant(what)
    .refine(
      (v) => {
        const year = new Date(v).getUTCFullYear();
        return year >= PERIOD_YEARS.min && year <= PERIOD_YEARS.max;
      },
      `${what} must fall in the years ${PERIOD_YEARS.min}–${PERIOD_YEARS.max} (UTC).`,
    )
    .describe(`ISO 8601 instant with a zone, in the years ${PERIOD_YEARS.min}–${PERIOD_YEARS.max} (UTC); the period is at most 50 years.`);

const maxGapMinutes = finite("Maximum gap")
  .positive("Maximum gap must be above zero minutes.")
  .max(60 * 24 * 31, "Maximum gap cannot exceed 31 days.");
const loadScale = finite("Load scale factor")
  .positive("Load scale factor must be above zero.")
  .max(1000, "Load scale factor cannot exceed 1000.");
const ratingA = finite("Normal rating").positive("Normal rating must be above 0 A.");
const timeZone = timeZoneSchema;
const phase = z.enum(PHASE_CHOICES, { error: "Phase must be A, B, C or min (the lowest phase at each time)." });
const interpolation = z.enum(INTERPOLATIONS, { error: 'Interpolation must be "linear" or "step".' });

export const monthlyTemperatureC = z
  .array(finite("Monthly temperature").min(-60, "Monthly temperatures must be between −60 and 60 °C.").max(60, "Monthly temperatures must be between −60 and 60 °C."))
  .length(12, "Give twelve monthly temperatures, January to December (°C).")
  .describe("mean temperature per calendar month, January to December (°C, months of the study's calendar: local with a time zone, else UTC)");
/** Recorded mean temperature per UTC month ("YYYY-MM" → °C), from a temperature column of the load CSV. */
export const recordedTemperatureC = z
  .record(
    z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, "Months of recorded temperatures are written YYYY-MM."),
    finite("Recorded temperature").min(-60, "Recorded temperatures must be between −60 and 60 °C.").max(60, "Recorded temperatures must be between −60 and 60 °C."),
  )
  .describe("mean recorded temperature per UTC month (YYYY-MM → °C), from the load CSV's temperature column; in the months it covers it takes precedence over monthlyTemperatureC");
export const switchedOutSchema = z
  .array(
    z
      .object({ name: z.string().trim().min(1, "Name each switched-out period.").max(200, "A period name has at most 200 characters."), start: periodInstant("Switch-out start"), end: periodInstant("Switch-out end") })
      .refine((p) => Date.parse(p.start) < Date.parse(p.end), { path: ["end"], message: "A switched-out period must end after it starts." }),
  )
  .max(100, "At most 100 switched-out periods.")
  .describe("named periods with the line switched out: samples inside read 0 A");

export const studyParamsSchema = z
  .object({
    phase: phase.default("A"),
    interpolation: interpolation.default("linear"),
    /** Absent: 3 × the median sampling interval (docs/computation.md). */
    maxGapMinutes: maxGapMinutes.optional(),
    loadScale: loadScale.default(1),
    periodStart: periodInstant("Period start").optional(),
    periodEnd: periodInstant("Period end").optional(),
    /** Absent: 10 × the device's maximum current. */
    plausibilityCapA: finite("Plausibility cap").positive("Plausibility cap must be above zero.").optional(),
    /** The circuit's normal rating: the hours above it are reported beside those above the device maximum. */
    ratingA: ratingA.optional(),
    /** The circuit's IANA time zone: the hour × month grid counts its local clock time. Absent: local mean solar time. */
    timeZone: timeZone.optional(),
    /** The crossing's mean temperature per calendar month (Jan…Dec, °C), for cold-weather storage. */
    monthlyTemperatureC: monthlyTemperatureC.optional(),
    /** Recorded monthly means from the load profile's temperature column (docs/computation.md "Cold-weather storage"). */
    recordedTemperatureC: recordedTemperatureC.optional(),
    /** Periods the line is switched out (no current), as a what-if. */
    switchedOut: switchedOutSchema.optional(),
  })
  .refine((p) => !p.periodStart || !p.periodEnd || Date.parse(p.periodStart) < Date.parse(p.periodEnd), {
    path: ["periodEnd"],
    message: "Period end must be after period start.",
  });
export type StudyParams = z.output<typeof studyParamsSchema>;

export const locationSchema = z.object({
  lat: finite("Latitude").min(-90, "Latitude must be between −90 and 90.").max(90, "Latitude must be between −90 and 90."),
  lon: finite("Longitude")
    .min(-180, "Longitude must be between −180 and 180.")
    .max(180, "Longitude must be between −180 and 180."),
});
export type Location = z.output<typeof locationSchema>;

// ---------------------------------------------------------------- POST /api/v1/feasibility

/** One sample: [ISO 8601 time with zone, amperes]; null marks a missing value (dropped and counted). */
export const sampleTupleSchema = z.tuple([
  isoInstant("Sample time").describe(TIMESTAMP_RANGE_DESCRIPTION),
  z.number({ error: "Sample current must be a number of amperes or null." }).nullable(),
]);

export const MAX_API_SAMPLES = 2_000_000;

/**
 * The load history and study settings of a stateless request (feasibility, optimiser): samples or
 * CSV, where, when and how. The device (or the candidates) come beside it.
 */
export const statelessStudyFields = {
  samples: z
    .array(sampleTupleSchema)
    .min(2, "Send at least two samples.")
    .max(MAX_API_SAMPLES, `Send at most ${MAX_API_SAMPLES.toLocaleString("en")} samples.`)
    .optional()
    .describe(TIMESTAMP_RANGE_DESCRIPTION),
  csv: z.string().min(1, "The CSV text is empty.").optional().describe(TIMESTAMP_RANGE_DESCRIPTION),
  csvOptions: ingestOptionsSchema.optional(),
  location: locationSchema,
  schedule: scheduleSchema.default({ kind: "night", sunAltitudeDeg: DEFAULT_SUN_ALTITUDE_DEG }),
  interpolation: interpolation.default("linear"),
  maxGapMinutes: maxGapMinutes.optional(),
  policy: policyOverridesSchema.default({}),
  phase: phase.default("A"),
  loadScale: loadScale.default(1),
  periodStart: periodInstant("Period start").optional(),
  periodEnd: periodInstant("Period end").optional(),
  ratingA: ratingA.optional().describe("the circuit's normal rating (A); hours above it are reported as current.rating"),
  timeZone: timeZone.optional().describe("IANA time zone of the crossing: the hour × month grid counts its local clock time (daylight saving included); absent: local mean solar time from the longitude"),
  monthlyTemperatureC: monthlyTemperatureC.optional(),
  switchedOut: switchedOutSchema.optional(),
};

/** Exactly one of samples and csv, and csv with its options. */
export function oneLoadSource(body: { samples?: unknown; csv?: unknown; csvOptions?: unknown }, ctx: z.RefinementCtx): void {
  if (body.samples === undefined && body.csv === undefined) {
    ctx.addIssue({ code: "custom", path: ["samples"], message: "Send either samples or csv." });
  }
  if (body.samples !== undefined && body.csv !== undefined) {
    ctx.addIssue({ code: "custom", path: ["csv"], message: "Send either samples or csv, not both." });
  }
  if (body.csv !== undefined && body.csvOptions === undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["csvOptions"],
      message: "csvOptions must say which columns hold the time and the current.",
    });
  }
}

export const feasibilityRequestSchema = z
  .object({
    ...statelessStudyFields,
    device: deviceSchema,
    async: z
      .boolean()
      .optional()
      .describe("true: run as a job (202 with Location of the job, the results at its resultUrl); false: answer in this request whatever the size; absent: a job from 200,000 samples or 8,000,000 characters of CSV"),
  })
  .superRefine(oneLoadSource);
export type FeasibilityRequest = z.output<typeof feasibilityRequestSchema>;

// ---------------------------------------------------------------- results

const hours = z.number().describe("hours");
const isoTime = z.string().describe("ISO 8601 instant (UTC)");

/** The figures docs/computation.md defines, over one period (the whole study, a month or a year). */
export const periodFiguresSchema = z.object({
  totalHours: hours,
  knownHours: hours,
  unknownHours: hours,
  coverage: z.number().nullable().describe("knownHours / totalHours"),
  hoursAtOrAboveMin: hours,
  hoursBelowMin: hours,
  hoursAboveMax: hours,
  requiredHours: hours,
  requiredKnownHours: hours,
  requiredUnknownHours: hours.describe("requiredHours − requiredKnownHours: required time with no known current, so lit + dark + unknown = required"),
  litHours: hours,
  darkHours: hours,
  availability: z.number().nullable().describe("litHours / requiredKnownHours; null when no required time is known"),
  longestDarkStretchHours: hours,
  darkEvents: z.number().int().describe("maximal dark stretches (counted in the month or year they start)"),
  reportableOutages: z.number().int().describe("dark stretches longer than 30 minutes (47 CFR 17.48)"),
});
export type PeriodFigures = z.output<typeof periodFiguresSchema>;

export const VERDICT_STATUSES = ["go", "marginal", "no-go", "insufficient-data"] as const;
export type VerdictStatus = (typeof VERDICT_STATUSES)[number];

export const verdictSchema = z.object({
  status: z.enum(VERDICT_STATUSES),
  reasons: z.array(z.string()),
  basis: z.object({
    kind: z.enum(["whole-period", "worst-complete-year"]),
    label: z.string(),
    start: isoTime,
    end: isoTime,
    year: z.number().int().optional(),
  }),
});
export type Verdict = z.output<typeof verdictSchema>;

export const darkStretchSchema = z.object({ start: isoTime, end: isoTime, hours });

export const NIGHT_STATUSES = ["lit", "partly", "dark", "unknown", "none"] as const;
export type NightStatus = (typeof NIGHT_STATUSES)[number];

/** lib/engine/nights.ts: one entry per night (local solar noon to noon, dated by its evening). */
export const nightCalendarSchema = z
  .object({
    first: z.string().describe("date (YYYY-MM-DD, local mean solar time) of the first night's evening"),
    requiredMinutes: z.array(z.number()).describe("required (light-on) minutes of each night"),
    darkMinutes: z.array(z.number()).describe("dark minutes of each night"),
    unknownMinutes: z.array(z.number()).describe("required minutes with no known current, each night"),
  })
  .describe("the night-by-night calendar; absent from studies run before it existed");
export type NightCalendar = z.output<typeof nightCalendarSchema>;

export const studyResultSchema = z.object({
  engineVersion: z.number().int(),
  settings: z.object({
    interpolation: interpolation,
    maxGapSeconds: z.number(),
    maxGapSource: z.enum(["given", "3 × median interval"]),
    medianIntervalSeconds: z.number(),
    loadScale: z.number(),
    plausibilityCapA: z.number(),
    samplesUsed: z.number().int(),
    samplesAboveCap: z.number().int().describe("samples dropped because they exceed the plausibility cap"),
    schedule: scheduleSchema,
    location: locationSchema,
  }),
  period: z.object({
    start: isoTime,
    end: isoTime,
    totalHours: hours,
    knownHours: hours,
    unknownHours: hours,
    coverage: z.number().nullable(),
  }),
  current: z.object({
    hoursAtOrAboveMin: hours,
    hoursBelowMin: hours,
    hoursAboveMax: hours.describe("known hours above the device's maximum current"),
    exceeded: z
      .object({
        p10A: z.number().describe("current exceeded 10 % of the known time"),
        p50A: z.number().describe("current exceeded 50 % of the known time (the time-weighted median)"),
        p90A: z.number().describe("current exceeded 90 % of the known time"),
      })
      .nullable()
      .describe("currents exceeded 10 / 50 / 90 % of the known time, interpolated on the load-duration curve; null when no time is known"),
    rating: z
      .object({ ratingA: z.number(), hoursAbove: hours })
      .nullable()
      .describe("the circuit's normal rating and the known hours above it; null when none was given"),
  }),
  lighting: z.object({
    requiredHours: hours,
    requiredKnownHours: hours,
    litHours: hours,
    darkHours: hours,
    availability: z.number().nullable(),
    longestDarkStretchHours: hours,
    darkEvents: z.number().int(),
    reportableOutages: z.number().int(),
    darkStretches: z.array(darkStretchSchema).describe("the longest dark stretches, longest first (at most 50)"),
  }),
  monthly: z.array(periodFiguresSchema.extend({ month: z.string().describe("YYYY-MM: a month of the circuit's local calendar when the study has a time zone (params.timeZone), else a UTC month") })),
  yearly: z.array(
    periodFiguresSchema.extend({
      year: z.number().int(),
      complete: z.boolean().describe("the analysed period covers the whole calendar year"),
    }),
  ),
  coldCost: z
    .object({
      darkHours: hours,
      darkHoursWithoutDerating: hours,
      extraDarkHours: hours,
      availabilityWithoutDerating: z.number().nullable(),
      byMonth: z.array(z.object({ month: z.string().describe("YYYY-MM, as in monthly"), temperatureC: z.number().nullable().describe("null: no temperature known for that month (no derating)"), extraDarkHours: hours })),
    })
    .nullable()
    .optional()
    .describe("what the cold months cost: the same study without the device's cold derating, compared (only with monthlyTemperatureC and a derating curve)"),
  hourMonthBelowMin: z.object({
    timeBasis: z.string(),
    /** 24 rows (hour 0–23) × 12 columns (January–December): share of known time below the minimum current. */
    share: z.array(z.array(z.number().nullable())),
  }),
  loadDuration: z.array(z.object({ currentA: z.number(), shareExceeded: z.number() })),
  storage: z
    .object({
      storageWh: z.number(),
      minChargeWh: z.number(),
      minChargeAt: isoTime.nullable(),
      worstWeek: z
        .object({
          start: isoTime,
          end: isoTime,
          basis: z.string(),
          points: z.array(z.object({ t: isoTime, chargeWh: z.number() })),
        })
        .nullable(),
    })
    .nullable(),
  annualised: z
    .object({
      label: z.string(),
      factor: z.number(),
      darkHours: z.number(),
      darkEvents: z.number(),
      reportableOutages: z.number(),
      hoursBelowMin: z.number(),
    })
    .nullable(),
  verdict: verdictSchema,
  nights: nightCalendarSchema.optional(),
});
export type StudyResult = z.output<typeof studyResultSchema>;

export const feasibilityResponseSchema = studyResultSchema.extend({
  quality: z.record(z.string(), z.unknown()).describe("the ingest quality report of the samples or CSV"),
});
export type FeasibilityResponse = z.output<typeof feasibilityResponseSchema>;
