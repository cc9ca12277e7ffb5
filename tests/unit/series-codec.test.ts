import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ampsBlobView, decodeAmps, decodeTimes, encodeAmps, encodeTimes } from "../../lib/series-codec";

/** The bytes inside a Node Buffer that starts at an odd offset of its ArrayBuffer, as a driver may return. */
function atOddOffset(bytes: Uint8Array): Buffer {
  const backing = Buffer.alloc(bytes.length + 3);
  backing.set(bytes, 1);
  const view = backing.subarray(1, 1 + bytes.length);
  expect(view.byteOffset % 2).toBe(1);
  return view;
}

describe("series codec", () => {
  it("regular times shrink to a few bytes and decode exactly, even from an odd byte offset", () => {
    const t = Float64Array.from({ length: 35_136 }, (_, k) => 1704067200 + k * 900);
    const bytes = encodeTimes(t);
    expect(bytes.length).toBeLessThan(32);
    expect(decodeTimes(atOddOffset(bytes))).toEqual(t);
  });

  it("irregular times with millisecond parts use deltas; sub-millisecond or unsorted times stay raw", () => {
    const ms = Float64Array.from([1704067200, 1704067200.25, 1704067261.5, 1704070000]);
    expect(decodeTimes(atOddOffset(encodeTimes(ms)))).toEqual(ms);
    const fine = Float64Array.from([1.0000001, 2]);
    const raw = encodeTimes(fine);
    expect(raw[0]).toBe(0);
    expect(raw.length).toBe(1 + 16);
    expect(decodeTimes(atOddOffset(raw))).toEqual(fine);
    const unsorted = Float64Array.from([5, 3]);
    expect(decodeTimes(encodeTimes(unsorted))).toEqual(unsorted);
    expect(decodeTimes(encodeTimes(new Float64Array(0)))).toEqual(new Float64Array(0));
  });

  it("amps are little-endian Float32 and keep NaN", () => {
    const a = Float32Array.from([0, 1.5, NaN, 1234.5, 3.4028234663852886e38]);
    const bytes = encodeAmps(a);
    expect(bytes.length).toBe(20);
    expect(new DataView(bytes.buffer, bytes.byteOffset).getFloat32(4, true)).toBe(1.5);
    const back = decodeAmps(atOddOffset(bytes));
    expect(Array.from(back)).toEqual(Array.from(a));
    expect(back.byteOffset % 4).toBe(0);
  });

  it("the amps blob view holds the same bytes as encodeAmps, also for a part of a larger array", () => {
    const whole = Float32Array.from([9, 0, 1.5, NaN, 1234.5, 7]);
    const part = whole.subarray(1, 5);
    const view = ampsBlobView(part);
    expect(Array.from(view)).toEqual(Array.from(encodeAmps(part)));
    expect(Array.from(decodeAmps(atOddOffset(view)))).toEqual(Array.from(part));
  });

  it("round-trips any series (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ noNaN: true, min: -1e12, max: 1e12 }), { maxLength: 200 }),
        fc.boolean(),
        (values, wholeMs) => {
          const t = Float64Array.from(wholeMs ? values.map((v) => Math.round(v * 1000) / 1000).sort((a, b) => a - b) : values);
          expect(decodeTimes(atOddOffset(encodeTimes(t)))).toEqual(t);
          const a = Float32Array.from(values);
          expect(decodeAmps(atOddOffset(encodeAmps(a)))).toEqual(a);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("rejects blobs of the wrong length", () => {
    expect(() => decodeAmps(new Uint8Array(3))).toThrow(/multiple of 4/);
    expect(() => decodeTimes(Uint8Array.from([0, 1, 2]))).toThrow(/multiple of 8/);
  });
});
