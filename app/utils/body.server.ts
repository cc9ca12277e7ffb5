// Request bodies read with their size limit enforced while the bytes arrive: a body over the
// limit is refused at the first chunk past it (or at once from Content-Length), chunked or not,
// so a 60 MB post never sits whole in memory (docs/input-limits.md).

/** The body was larger than allowed; callers turn it into a 413. */
export class BodyTooLargeError extends Error {
  constructor(
    readonly limitBytes: number,
    readonly declaredBytes?: number,
  ) {
    super(`The body is larger than the limit of ${limitBytes} bytes.`);
  }
}


/**
 * What is still read (and dropped) after a refusal, so the client, which is usually still
 * sending, gets to read the 413 instead of a reset connection. Past this, the connection is cut.
 */
const DISCARD_AFTER_REFUSAL_BYTES = 256 * 1024 * 1024;

/** Reads and drops the rest of a refused body in the background (no memory held), then lets go. */
function discardRest(reader: ReadableStreamDefaultReader<Uint8Array>) {
  void (async () => {
    let dropped = 0;
    try {
      for (;;) {
        const { done, value } = await reader.read();
        if (done) return;
        dropped += value.byteLength;
        if (dropped > DISCARD_AFTER_REFUSAL_BYTES) return void (await reader.cancel());
      }
    } catch {
      // The client went away: nothing left to drop.
    }
  })();
}

/** Drops a body that is refused unread (see DISCARD_AFTER_REFUSAL_BYTES). */
export function discardBody(request: Request) {
  if (request.body && !request.bodyUsed && !request.body.locked) discardRest(request.body.getReader());
}

/** Refuses early when the client declares a length over the limit. */
export function checkDeclaredLength(request: Request, maxBytes: number) {
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > maxBytes) {
    discardBody(request);
    throw new BodyTooLargeError(maxBytes, declared);
  }
}

/**
 * The body's chunks, counted as they arrive; throws BodyTooLargeError as soon as the count
 * passes `maxBytes`. Nothing past the limit is kept: the rest is dropped as it arrives.
 */
export async function* limitedChunks(body: ReadableStream<Uint8Array> | null, maxBytes: number): AsyncGenerator<Uint8Array> {
  if (!body) return;
  const reader = body.getReader();
  let received = 0;
  let finished = false;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) {
        finished = true;
        return;
      }
      received += value.byteLength;
      if (received > maxBytes) {
        finished = true;
        discardRest(reader);
        throw new BodyTooLargeError(maxBytes);
      }
      yield value;
    }
  } finally {
    // A consumer that stops early (an ingest error) leaves the rest to be dropped too.
    if (!finished) discardRest(reader);
  }
}

/** The whole body as bytes, refused past `maxBytes` (declared or counted). */
export async function readLimitedBytes(request: Request, maxBytes: number): Promise<Uint8Array> {
  checkDeclaredLength(request, maxBytes);
  const parts: Uint8Array[] = [];
  let length = 0;
  for await (const chunk of limitedChunks(request.body, maxBytes)) {
    parts.push(chunk);
    length += chunk.byteLength;
  }
  const out = new Uint8Array(length);
  let offset = 0;
  for (const p of parts) {
    out.set(p, offset);
    offset += p.byteLength;
  }
  return out;
}
