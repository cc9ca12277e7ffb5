// Compact binary form of a load profile's arrays for MariaDB BLOBs.
//
// Times: one format byte, then
//   0 = raw Float64 little-endian epoch seconds;
//   1 = run-length deltas: the first time in whole milliseconds (Float64 LE), the count,
//       then (delta ms, repeat) pairs as unsigned LEB128 varints. Regular sampling, the
//       usual case, shrinks to a few bytes per run of equal steps.
//   Format 1 is used when every time is a whole millisecond and the series ascends.
// Amps: raw Float32 little-endian (NaN marks an invalid phase sample).
// Decoding copies, so a Buffer at any byte offset (as the MariaDB driver returns) is fine.

const TIMES_RAW = 0;
const TIMES_DELTA_RUNS = 1;

const LITTLE_ENDIAN_HOST = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** A fresh, aligned copy of `length` bytes from `bytes` starting at `offset`. */
function alignedCopy(bytes: Uint8Array, offset: number, length: number): ArrayBuffer {
  const copy = new Uint8Array(length);
  copy.set(bytes.subarray(offset, offset + length));
  return copy.buffer;
}

function encodeFloats(values: Float64Array | Float32Array, prefix: number[]): Uint8Array {
  const width = values.BYTES_PER_ELEMENT;
  const out = new Uint8Array(prefix.length + values.length * width);
  out.set(prefix);
  if (LITTLE_ENDIAN_HOST) {
    out.set(new Uint8Array(values.buffer, values.byteOffset, values.byteLength), prefix.length);
  } else {
    const view = new DataView(out.buffer, prefix.length);
    for (let i = 0; i < values.length; i++) {
      if (width === 8) view.setFloat64(i * 8, values[i], true);
      else view.setFloat32(i * 4, values[i], true);
    }
  }
  return out;
}

function decodeFloat64(bytes: Uint8Array, offset: number): Float64Array {
  const length = bytes.length - offset;
  if (length % 8 !== 0) throw new Error(`Times blob has ${length} bytes, not a multiple of 8.`);
  const buffer = alignedCopy(bytes, offset, length);
  if (LITTLE_ENDIAN_HOST) return new Float64Array(buffer);
  const view = new DataView(buffer);
  const out = new Float64Array(length / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}

/** A growing byte buffer (a plain number[] would cost 8+ bytes per byte). */
class ByteWriter {
  bytes = new Uint8Array(256);
  length = 0;

  push(byte: number): void {
    if (this.length === this.bytes.length) {
      const grown = new Uint8Array(this.bytes.length * 2);
      grown.set(this.bytes);
      this.bytes = grown;
    }
    this.bytes[this.length++] = byte;
  }
}

/** Unsigned LEB128 for integers up to 2^53 (arithmetic, not 32-bit shifts). */
function writeVarint(out: ByteWriter, value: number): void {
  let v = value;
  while (v >= 128) {
    out.push((v % 128) | 128);
    v = Math.floor(v / 128);
  }
  out.push(v);
}

function readVarint(bytes: Uint8Array, state: { pos: number }): number {
  let value = 0;
  let scale = 1;
  for (;;) {
    if (state.pos >= bytes.length) throw new Error("Times blob ends inside a number.");
    const b = bytes[state.pos++];
    value += (b & 127) * scale;
    if (b < 128) return value;
    scale *= 128;
  }
}

export function encodeTimes(t: Float64Array): Uint8Array {
  let wholeMsAscending = t.length > 0;
  for (let i = 0; i < t.length && wholeMsAscending; i++) {
    const ms = Math.round(t[i] * 1000);
    // (−0 would come back as 0 through the deltas: keep it raw.)
    if (ms / 1000 !== t[i] || Object.is(t[i], -0) || !Number.isSafeInteger(ms) || (i > 0 && t[i] < t[i - 1])) wholeMsAscending = false;
  }
  if (!wholeMsAscending) return encodeFloats(t, [TIMES_RAW]);

  const body = new ByteWriter();
  writeVarint(body, t.length);
  let previous = Math.round(t[0] * 1000);
  let runDelta = -1;
  let runLength = 0;
  for (let i = 1; i < t.length; i++) {
    const ms = Math.round(t[i] * 1000);
    const delta = ms - previous;
    previous = ms;
    if (delta === runDelta) runLength++;
    else {
      if (runLength > 0) {
        writeVarint(body, runDelta);
        writeVarint(body, runLength);
      }
      runDelta = delta;
      runLength = 1;
    }
  }
  if (runLength > 0) {
    writeVarint(body, runDelta);
    writeVarint(body, runLength);
  }
  const out = new Uint8Array(1 + 8 + body.length);
  out[0] = TIMES_DELTA_RUNS;
  new DataView(out.buffer).setFloat64(1, Math.round(t[0] * 1000), true);
  out.set(body.bytes.subarray(0, body.length), 9);
  return out;
}

export function decodeTimes(bytes: Uint8Array): Float64Array {
  if (bytes.length === 0) return new Float64Array(0);
  const format = bytes[0];
  if (format === TIMES_RAW) return decodeFloat64(bytes, 1);
  if (format !== TIMES_DELTA_RUNS) throw new Error(`Unknown times blob format ${format}.`);
  const header = new DataView(alignedCopy(bytes, 1, 8));
  let ms = header.getFloat64(0, true);
  const state = { pos: 9 };
  const n = readVarint(bytes, state);
  const out = new Float64Array(n);
  if (n === 0) return out;
  out[0] = ms / 1000;
  let i = 1;
  while (i < n) {
    const delta = readVarint(bytes, state);
    const repeat = readVarint(bytes, state);
    if (i + repeat > n) throw new Error("Times blob holds more samples than its count.");
    for (let r = 0; r < repeat; r++) {
      ms += delta;
      out[i++] = ms / 1000;
    }
  }
  return out;
}

export function encodeAmps(a: Float32Array): Uint8Array {
  return encodeFloats(a, []);
}

/**
 * `encodeAmps` without the copy where the host is little-endian: the blob is then a view of
 * `a`'s own bytes, for writing at once (a year of minutes is 2 MB a phase); `a` must not change
 * while the view is in use.
 */
export function ampsBlobView(a: Float32Array): Uint8Array {
  return LITTLE_ENDIAN_HOST ? new Uint8Array(a.buffer, a.byteOffset, a.byteLength) : encodeAmps(a);
}

export function decodeAmps(bytes: Uint8Array): Float32Array {
  if (bytes.length % 4 !== 0) throw new Error(`Amps blob has ${bytes.length} bytes, not a multiple of 4.`);
  const buffer = alignedCopy(bytes, 0, bytes.length);
  if (LITTLE_ENDIAN_HOST) return new Float32Array(buffer);
  const view = new DataView(buffer);
  const out = new Float32Array(bytes.length / 4);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat32(i * 4, true);
  return out;
}
