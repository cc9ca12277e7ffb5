// Zooming a time chart, in the circuit's time zone: the local calendar months a period spans (for
// the month buttons), the range a URL asks for (a month, a day or week of local dates, or two
// instants, as drag-to-zoom sends), clamped to the period, and day / week / step links from it.
import { addDays, localDate, startOfLocalDay } from "./zoned-time";

export interface MonthRange {
  label: string;
  from: string;
  to: string;
}

/** The zoom a page's URL asks for. `from`/`to`: ISO instants, or local dates (YYYY-MM-DD, `to` inclusive). `month`: YYYY-MM. */
export interface ZoomView {
  from?: string;
  to?: string;
  month?: string;
}

const DATE = /^\d{4}-\d{2}-\d{2}$/;
const MONTH = /^(\d{4})-(\d{2})$/;

/** The local calendar months of `zone` that [start, end) touches, as ISO ranges (at most 240). */
export function monthRanges(start: string, end: string, zone = "UTC"): MonthRange[] {
  const out: MonthRange[] = [];
  let label = localDate(start, zone).slice(0, 7);
  const endMs = Date.parse(end);
  for (let from = monthStart(label, zone); from < endMs && out.length < 240; ) {
    const nextLabel = followingMonth(label);
    const to = monthStart(nextLabel, zone);
    out.push({ label, from: new Date(from).toISOString(), to: new Date(to).toISOString() });
    label = nextLabel;
    from = to;
  }
  return out;
}

function followingMonth(label: string): string {
  const [y, m] = label.split("-").map(Number);
  return m === 12 ? `${y + 1}-01` : `${y}-${String(m + 1).padStart(2, "0")}`;
}

const monthStart = (label: string, zone: string) => startOfLocalDay(`${label}-01`, zone);

/** Epoch milliseconds of a `from`/`to` value: a local date's start (the day after, for an inclusive `to`), or an instant. */
function edge(value: string | undefined, zone: string, inclusiveEnd: boolean): number {
  if (!value) return NaN;
  if (DATE.test(value)) return startOfLocalDay(inclusiveEnd ? addDays(value, 1) : value, zone);
  return Date.parse(value);
}

/** The epoch-second range a zoom asks for inside `whole`; the whole period when absent or invalid. */
export function zoomRange(whole: { start: number; end: number }, view: ZoomView, zone = "UTC"): { start: number; end: number } {
  let from = NaN;
  let to = NaN;
  const month = view.month?.match(MONTH);
  if (month && Number(month[2]) >= 1 && Number(month[2]) <= 12) {
    from = monthStart(view.month!, zone);
    to = monthStart(followingMonth(view.month!), zone);
  } else {
    from = edge(view.from, zone, false);
    to = edge(view.to, zone, true);
  }
  from /= 1000;
  to /= 1000;
  if (!(Number.isFinite(from) && Number.isFinite(to) && to > from)) return whole;
  const start = Math.max(whole.start, from);
  const end = Math.min(whole.end, to);
  return end > start ? { start, end } : whole;
}

export interface ZoomSteps {
  /** The local day and week starting where the current view starts. */
  day: { from: string; to: string };
  week: { from: string; to: string };
  /** The same number of days before / after the current view, when the period reaches there. */
  previous: { from: string; to: string } | null;
  next: { from: string; to: string } | null;
}

/** Day, week and step links (local dates, `to` inclusive) from the range on show. */
export function zoomSteps(range: { start: number; end: number }, whole: { start: number; end: number }, zone = "UTC"): ZoomSteps {
  const first = localDate(range.start * 1000, zone);
  const days = Math.max(1, Math.round((range.end - range.start) / 86_400));
  return {
    day: { from: first, to: first },
    week: { from: first, to: addDays(first, 6) },
    previous: range.start > whole.start ? { from: addDays(first, -days), to: addDays(first, -1) } : null,
    next: range.end < whole.end ? { from: addDays(first, days), to: addDays(first, 2 * days - 1) } : null,
  };
}

/**
 * Time buckets for a chart of `range`: at most 600, and none shorter than the sampling interval
 * (a week of hourly samples in 600 buckets would leave most of them empty, and the band broken).
 */
export function chartBuckets(range: { start: number; end: number }, medianIntervalSeconds: number): number {
  const bySampling = medianIntervalSeconds > 0 ? Math.floor((range.end - range.start) / medianIntervalSeconds) : 600;
  return Math.max(2, Math.min(600, bySampling));
}

/** Night windows a current chart shades at most: a year's ~365 bands add nothing but paint time (and page weight), so they show from about a month down. */
export const MAX_SHADED_WINDOWS = 120;
