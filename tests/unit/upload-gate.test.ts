// The upload gate (app/utils/upload-gate.server.ts): large bodies run a few at a time per
// process, the next ones wait, and past the queue the answer is 503 with Retry-After.
import { EventEmitter } from "node:events";
import type { IncomingMessage, ServerResponse } from "node:http";
import { describe, expect, it } from "vitest";
import { createServer, type Server } from "node:http";
import { connect, type AddressInfo } from "node:net";
import { createUploadGate, hasLargeBody, LARGE_BODY_BYTES, MIN_UPLOAD_BYTES_PER_SECOND, uploadGateOptionsFromEnv } from "../../app/utils/upload-gate.server";

function fakeRequest(headers: Record<string, string>): IncomingMessage {
  return Object.assign(new EventEmitter(), { headers, destroyed: false }) as unknown as IncomingMessage;
}

class FakeResponse extends EventEmitter {
  statusCode = 200;
  destroyed = false;
  headers: Record<string, string> = {};
  body = "";
  setHeader(name: string, value: string) {
    this.headers[name.toLowerCase()] = value;
  }
  end(body = "") {
    this.body = body;
    this.emit("close");
  }
}

const upload = () => fakeRequest({ "content-length": String(LARGE_BODY_BYTES + 1) });
const tick = () => new Promise((r) => setTimeout(r, 0));

describe("upload gate", () => {
  it("counts bodies over the threshold, or of unknown length, as large", () => {
    expect(hasLargeBody(fakeRequest({ "content-length": String(LARGE_BODY_BYTES) }))).toBe(false);
    expect(hasLargeBody(fakeRequest({ "content-length": String(LARGE_BODY_BYTES + 1) }))).toBe(true);
    expect(hasLargeBody(fakeRequest({ "transfer-encoding": "chunked" }))).toBe(true);
    expect(hasLargeBody(fakeRequest({}))).toBe(false);
  });

  it("lets two uploads run, queues the third until one answers, and refuses past the queue", async () => {
    const gate = createUploadGate({ concurrency: 2, queue: 1 });
    const started: number[] = [];
    const responses = Array.from({ length: 4 }, () => new FakeResponse());
    responses.forEach((res, i) => gate(upload(), res as unknown as ServerResponse, () => started.push(i)));
    await tick();
    expect(started).toEqual([0, 1]);
    expect(gate.counts()).toEqual({ active: 2, waiting: 1 });
    // The fourth found two running and one waiting: refused at once, told when to retry.
    expect(responses[3].statusCode).toBe(503);
    expect(responses[3].headers["retry-after"]).toBe("10");
    expect(JSON.parse(responses[3].body).title).toBe("Too many uploads at once");

    responses[0].end("done");
    await tick();
    await tick();
    expect(started).toEqual([0, 1, 2]);
    expect(gate.counts()).toEqual({ active: 2, waiting: 0 });
  });

  it("never holds small requests", async () => {
    const gate = createUploadGate({ concurrency: 1, queue: 0 });
    let passed = 0;
    gate(upload(), new FakeResponse() as unknown as ServerResponse, () => passed++);
    await tick();
    gate(fakeRequest({ "content-length": "200" }), new FakeResponse() as unknown as ServerResponse, () => passed++);
    gate(fakeRequest({}), new FakeResponse() as unknown as ServerResponse, () => passed++);
    expect(passed).toBe(3);
  });

  it("reads its limits from the environment and refuses nonsense", () => {
    expect(uploadGateOptionsFromEnv({})).toEqual({ concurrency: 1, queue: 50, minBytesPerSecond: MIN_UPLOAD_BYTES_PER_SECOND });
    expect(uploadGateOptionsFromEnv({ UPLOAD_CONCURRENCY: "3", UPLOAD_QUEUE: "0", UPLOAD_MIN_BYTES_PER_SECOND: "0" })).toEqual({ concurrency: 3, queue: 0, minBytesPerSecond: 0 });
    expect(() => uploadGateOptionsFromEnv({ UPLOAD_MIN_BYTES_PER_SECOND: "-1" })).toThrow(/UPLOAD_MIN_BYTES_PER_SECOND/);
    expect(() => uploadGateOptionsFromEnv({ UPLOAD_CONCURRENCY: "0" })).toThrow(/UPLOAD_CONCURRENCY/);
    expect(() => uploadGateOptionsFromEnv({ UPLOAD_QUEUE: "two" })).toThrow(/UPLOAD_QUEUE/);
  });

  // Without the check the slow sender would hold the only turn for 80 minutes (4 MB at 1 kB/s).
  it("answers 408 to a sender slower than the minimum rate and passes its turn on; a prompt upload is not cut", { timeout: 30_000 }, async () => {
    // One turn, 20 kB/s over 200 ms windows; the app answers 201 once it has the whole body.
    const gate = createUploadGate({ concurrency: 1, queue: 5, minBytesPerSecond: 20_000, rateWindowMs: 200 });
    const server: Server = createServer((req, res) => gate(req, res, () => {
      let bytes = 0;
      req.on("data", (chunk: Buffer) => (bytes += chunk.length));
      req.on("end", () => res.writeHead(201, { "content-type": "text/plain" }).end(`got ${bytes}`));
    }));
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    const port = (server.address() as AddressInfo).port;
    const size = LARGE_BODY_BYTES + 1;
    try {
      // The slow sender: headers, then 100 bytes every 100 ms (1 kB/s).
      const slow = connect(port, "127.0.0.1");
      let slowAnswer = "";
      slow.on("data", (d) => (slowAnswer += d));
      slow.on("error", () => {});
      const slowClosed = new Promise((r) => slow.on("close", r));
      slow.write(`POST /up HTTP/1.1\r\nHost: x\r\nContent-Length: ${size}\r\n\r\n`);
      const trickle = setInterval(() => slow.writable && slow.write("x".repeat(100)), 100);
      await new Promise((r) => setTimeout(r, 50));
      // A prompt upload queued behind it gets its turn once the slow one is cut, and is answered whole.
      const prompt = await fetch(`http://127.0.0.1:${port}/up`, { method: "POST", body: Buffer.alloc(size, 97) });
      expect(prompt.status).toBe(201);
      expect(await prompt.text()).toBe(`got ${size}`);
      await slowClosed;
      clearInterval(trickle);
      expect(slowAnswer).toMatch(/^HTTP\/1\.1 408 /);
      expect(slowAnswer).toContain('"title":"Upload too slow"');
      expect(gate.counts()).toEqual({ active: 0, waiting: 0 });
    } finally {
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
    }
  });
});
