// Storage of the streaming ingest's samples: times and per-phase currents in growing typed
// arrays (no row objects), then sorted by time (stable) with repeated times dropped, as the
// exact-size arrays of a ProfileSeries.
import type { Phase, ProfileSeries } from "../series";

const INITIAL_CAPACITY = 1 << 14;

export class SampleBuffer {
  count = 0;
  private capacity = INITIAL_CAPACITY;
  private times = new Float64Array(INITIAL_CAPACITY);
  private amps: Float32Array[];

  constructor(private readonly phases: readonly Phase[]) {
    this.amps = phases.map(() => new Float32Array(INITIAL_CAPACITY));
  }

  /** One sample: its time (s) and each phase's current from `values` (NaN: not valid). */
  push(time: number, values: Float32Array): void {
    if (this.count === this.capacity) this.grow();
    const i = this.count++;
    this.times[i] = time;
    for (let k = 0; k < this.amps.length; k++) this.amps[k][i] = values[k];
  }

  /**
   * The series, sorted if `unordered` (stable, so the first of equal times is the first in the
   * file), repeated times dropped if `repeats`; the growth buffers are released.
   */
  finish(unordered: boolean, repeats: boolean): { series: ProfileSeries; duplicates: number } {
    const { count, times, amps, phases } = this;
    this.times = new Float64Array(0);
    this.amps = [];
    if (!unordered && !repeats) {
      // Already sorted and unique: exact-size copies release the growth capacity, unless little
      // is unused (arrays sized from the file's length): then views, sparing a copy of each.
      const keep = (a: Float64Array | Float32Array) => (count >= this.capacity * 0.9 ? a.subarray(0, count) : a.slice(0, count));
      const out: Partial<Record<Phase, Float32Array>> = {};
      phases.forEach((p, k) => (out[p] = keep(amps[k]) as Float32Array));
      return { series: { t: keep(times) as Float64Array, phases: out }, duplicates: 0 };
    }
    let order: Uint32Array | null = null;
    if (unordered) {
      order = new Uint32Array(count);
      for (let i = 0; i < count; i++) order[i] = i;
      order.sort((a, b) => times[a] - times[b] || a - b);
    }
    // Count kept samples first so the output arrays are allocated once, exactly sized.
    let kept = 0;
    let last = NaN;
    for (let j = 0; j < count; j++) {
      const v = times[order ? order[j] : j];
      if (v !== last) kept++;
      last = v;
    }
    const t = new Float64Array(kept);
    const out: Partial<Record<Phase, Float32Array>> = {};
    const columns = phases.map((p) => (out[p] = new Float32Array(kept)));
    let k = 0;
    last = NaN;
    for (let j = 0; j < count; j++) {
      const i = order ? order[j] : j;
      const v = times[i];
      if (v === last) continue;
      last = v;
      t[k] = v;
      for (let c = 0; c < columns.length; c++) columns[c][k] = amps[c][i];
      k++;
    }
    return { series: { t, phases: out }, duplicates: count - kept };
  }

  /** Room for `samples` in all, allocated at once (a size known ahead spares the doublings). */
  reserve(samples: number): void {
    if (samples > this.capacity) this.resize(samples);
  }

  private grow() {
    this.resize(this.capacity * 2);
  }

  private resize(capacity: number) {
    this.capacity = capacity;
    const t = new Float64Array(this.capacity);
    t.set(this.times);
    this.times = t;
    this.amps = this.amps.map((a) => {
      const b = new Float32Array(this.capacity);
      b.set(a);
      return b;
    });
  }
}
