// Zooming a time chart: the calendar months a period spans (for links), and the range a
// link asks for, clamped to the period.

export interface MonthRange {
  label: string;
  from: string;
  to: string;
}

/** The UTC calendar months that [start, end) touches, as ISO ranges (at most 240). */
export function monthRanges(start: string, end: string): MonthRange[] {
  const out: MonthRange[] = [];
  const s = new Date(start);
  const cursor = new Date(Date.UTC(s.getUTCFullYear(), s.getUTCMonth(), 1));
  while (cursor.toISOString() < end && out.length < 240) {
    const next = new Date(Date.UTC(cursor.getUTCFullYear(), cursor.getUTCMonth() + 1, 1));
    out.push({ label: cursor.toISOString().slice(0, 7), from: cursor.toISOString(), to: next.toISOString() });
    cursor.setTime(next.getTime());
  }
  return out;
}

/** The epoch-second range of a `from`/`to` zoom inside `whole`; the whole period when absent or invalid. */
export function zoomRange(whole: { start: number; end: number }, view: { from?: string; to?: string }): { start: number; end: number } {
  const from = view.from ? Date.parse(view.from) / 1000 : NaN;
  const to = view.to ? Date.parse(view.to) / 1000 : NaN;
  if (!(Number.isFinite(from) && Number.isFinite(to) && to > from)) return whole;
  return { start: Math.max(whole.start, from), end: Math.min(whole.end, to) };
}
