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

/** Refuses early when the client declares a length over the limit. */
export function checkDeclaredLength(request: Request, maxBytes: number) {
  const declared = Number(request.headers.get("content-length") ?? 0);
  if (declared > maxBytes) throw new BodyTooLargeError(maxBytes, declared);
}

/**
 * The body's chunks, counted as they arrive; throws BodyTooLargeError once the count passes
 * `maxBytes` and cancels the rest of the stream.
 */
export async function* limitedChunks(body: ReadableStream<Uint8Array> | null, maxBytes: number): AsyncGenerator<Uint8Array> {
  if (!body) return;
  const reader = body.getReader();
  let received = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      received += value.byteLength;
      if (received > maxBytes) {
        await reader.cancel().catch(() => {});
        throw new BodyTooLargeError(maxBytes);
      }
      yield value;
    }
  } finally {
    reader.releaseLock();
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
