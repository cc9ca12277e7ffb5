// The time range Duskline accepts (docs/input-limits.md): every timestamp from any format is
// checked against it before it reaches a loop, so a misread epoch (year 33,658) or a typo
// (year 1000) is refused with the row named instead of stalling the month and year loops.
// Browser-safe: no Node APIs.

export const MIN_YEAR = 1900;
export const MAX_YEAR = 2200;
/** Longest analysed period: a history or study period spanning more is refused. */
export const MAX_SPAN_YEARS = 50;

const utcYearStart = (year: number) => {
  const d = new Date(0);
  d.setUTCFullYear(year, 0, 1);
  return d.getTime() / 1000;
};

/** First accepted instant (1900-01-01T00:00:00Z), epoch seconds. */
export const MIN_EPOCH_SECONDS = utcYearStart(MIN_YEAR);
/** First instant past the range (2201-01-01T00:00:00Z), epoch seconds. */
export const END_EPOCH_SECONDS = utcYearStart(MAX_YEAR + 1);
/** 50 Julian years, in seconds. */
export const MAX_SPAN_SECONDS = MAX_SPAN_YEARS * 365.25 * 86400;

export const TIME_RANGE_TEXT = `years ${MIN_YEAR}–${MAX_YEAR} (UTC)`;

/** True for a finite epoch-seconds value within the accepted years. */
export function inTimeRange(seconds: number): boolean {
  return seconds >= MIN_EPOCH_SECONDS && seconds < END_EPOCH_SECONDS;
}

/** The UTC year of an epoch-seconds value, for messages ("year 33658"); NaN when not finite. */
export function utcYearOf(seconds: number): number {
  if (!Number.isFinite(seconds)) return NaN;
  // Date holds ±8.64e15 ms; beyond that, estimate from the mean Gregorian year.
  if (Math.abs(seconds) < 8.64e12) return new Date(seconds * 1000).getUTCFullYear();
  return Math.floor(1970 + seconds / (365.2425 * 86400));
}

/** Why a value is out of range, in words for a message. */
export function outOfRangeText(seconds: number): string {
  const year = utcYearOf(seconds);
  const where = Number.isFinite(year) ? `falls in year ${year}` : "is not a finite time";
  return `${where}; timestamps must fall in the ${TIME_RANGE_TEXT}`;
}

/** A span longer than the limit, in words, or null when it is within it. */
export function spanProblem(startSeconds: number, endSeconds: number): string | null {
  const span = endSeconds - startSeconds;
  if (!(span > MAX_SPAN_SECONDS)) return null;
  return `The data spans ${(span / (365.25 * 86400)).toFixed(1)} years; the analysed period is limited to ${MAX_SPAN_YEARS} years.`;
}
