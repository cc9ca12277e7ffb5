// A long streamed body through compression to a slow reader: React Router's writer waits for
// "drain" after every full write; with one listener per response (app/utils/drain-listener.server.ts)
// no listener piles up on the zlib stream (no MaxListenersExceededWarning) and every byte arrives.
import { randomBytes } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { gunzipSync } from "node:zlib";
import compression from "compression";
import express from "express";
import { writeReadableStreamToWritable } from "@react-router/node";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { oneDrainListener } from "../../app/utils/drain-listener.server";

// Random bytes do not compress, so the zlib stream's buffer fills as fast as it is written.
const body = randomBytes(3 * 1024 * 1024);
let server: http.Server;
let port: number;
const warnings: Error[] = [];
const onWarning = (w: Error) => warnings.push(w);

beforeAll(async () => {
  const app = express();
  app.use(compression({ filter: () => true }));
  app.use(oneDrainListener);
  app.get("/long", (_req, res) => {
    res.setHeader("Content-Type", "application/octet-stream");
    const stream = new ReadableStream<Uint8Array>({
      start(controller) {
        for (let at = 0; at < body.length; at += 16 * 1024) controller.enqueue(body.subarray(at, at + 16 * 1024));
        controller.close();
      },
    });
    void writeReadableStreamToWritable(stream, res);
  });
  server = app.listen(0, "127.0.0.1");
  await new Promise((resolve) => server.once("listening", resolve));
  port = (server.address() as AddressInfo).port;
  process.on("warning", onWarning);
});

afterAll(() => {
  process.off("warning", onWarning);
  server.close();
});

/** Reads the response a little at a time, so the server keeps waiting for "drain". */
function slowGet(): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    http.get({ host: "127.0.0.1", port, path: "/long", headers: { "accept-encoding": "gzip" } }, (res) => {
      const chunks: Buffer[] = [];
      res.pause();
      const timer = setInterval(() => {
        const chunk = res.read(64 * 1024) ?? res.read();
        if (chunk) chunks.push(chunk);
      }, 2);
      res.on("end", () => {
        clearInterval(timer);
        resolve(Buffer.concat(chunks));
      });
      res.on("error", reject);
    }).on("error", reject);
  });
}

describe("drain listeners under compression", () => {
  it("a long body to a slow reader arrives whole, with no listener left piling up", async () => {
    const received = await slowGet();
    expect(gunzipSync(received).equals(body)).toBe(true);
    await new Promise((resolve) => setImmediate(resolve));
    expect(warnings.filter((w) => w.name === "MaxListenersExceededWarning")).toEqual([]);
  });
});
