import http from "node:http";
import type { AddressInfo } from "node:net";
import zlib from "node:zlib";
import express, { type Response } from "express";
import { afterEach, describe, expect, it, vi } from "vitest";
import { ANSWER_BROTLI_WINDOW_BITS, answerCompression, sendBody } from "./http";

// sendBody behind the app's compression of answers (app/server/http.ts), over a socket.

let server: http.Server | undefined;

afterEach(async () => {
  vi.restoreAllMocks();
  server?.closeAllConnections();
  await new Promise((resolve) => server?.close(resolve));
  server = undefined;
});

async function serve(route: (res: Response) => Promise<void>): Promise<string> {
  const app = express();
  app.use(answerCompression());
  app.get("/", (_req, res) => void route(res));
  server = http.createServer(app);
  await new Promise<void>((resolve) => server!.listen(0, "127.0.0.1", resolve));
  return `http://127.0.0.1:${(server.address() as AddressInfo).port}/`;
}

/** GET with brotli accepted; calls onText with the decompressed text so far, as it arrives. */
function getBrotli(url: string, onText: (text: string) => void = () => {}): Promise<{ encoding: string | undefined; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers: { "Accept-Encoding": "br" } }, (res) => {
        const out: Buffer[] = [];
        const inflate = zlib.createBrotliDecompress();
        inflate.on("data", (b: Buffer) => (out.push(b), onText(Buffer.concat(out).toString("latin1"))));
        inflate.on("end", () => resolve({ encoding: res.headers["content-encoding"], body: Buffer.concat(out) }));
        inflate.on("error", reject);
        res.pipe(inflate);
      })
      .on("error", reject);
  });
}

/** GET with the given Accept-Encoding; the body as it came over the wire. */
function getRaw(url: string, acceptEncoding: string): Promise<{ encoding: string | undefined; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(url, { headers: { "Accept-Encoding": acceptEncoding } }, (res) => {
        const out: Buffer[] = [];
        res.on("data", (b: Buffer) => out.push(b));
        res.on("end", () => resolve({ encoding: res.headers["content-encoding"], body: Buffer.concat(out) }));
        res.on("error", reject);
      })
      .on("error", reject);
  });
}

/** The sliding window's size (WBITS) a brotli stream declares in its first bits, least significant first (RFC 7932, section 9.1). */
function windowBits(stream: Buffer): number {
  const bits = stream[0]! | (stream[1]! << 8);
  if ((bits & 1) === 0) return 16;
  const n = (bits >> 1) & 7;
  if (n !== 0) return 17 + n;
  const m = (bits >> 4) & 7;
  if (m === 1) return Number.NaN; // reserved in RFC 7932
  return m === 0 ? 17 : 8 + m;
}

describe("the compression of answers made per request", () => {
  const page = `<!DOCTYPE html><table>${Array.from({ length: 2000 }, (_, i) => `<tr><td>C${i}</td><td>${(1 + i / 1000).toFixed(3)}</td></tr>`).join("")}</table>`;
  const servePage = () =>
    serve(async (res) => {
      res.type("text/html").end(page);
    });

  it("writes brotli with an 18-bit window, not the encoder's 22-bit default (the window the stream's header declares, RFC 7932 section 9.1)", async () => {
    // Why (app/server/http.ts): each encoder with the default window made V8 run full collections.
    const answer = await getRaw(await servePage(), "gzip, deflate, br, zstd");
    expect(answer.encoding).toBe("br");
    expect(ANSWER_BROTLI_WINDOW_BITS).toBe(18);
    expect(windowBits(answer.body)).toBe(18);
    expect(zlib.brotliDecompressSync(answer.body).toString()).toBe(page);
    // The header reader checked on the encoder's default, which declares 22.
    expect(windowBits(zlib.brotliCompressSync(Buffer.from(page)))).toBe(22);
  });

  it("sends gzip to a client that does not accept brotli", async () => {
    const answer = await getRaw(await servePage(), "gzip");
    expect(answer.encoding).toBe("gzip");
    expect(zlib.gunzipSync(answer.body).toString()).toBe(page);
  });
});

describe("sending a streamed answer through the compression middleware", () => {
  it("keeps at most one drain listener on the compressor however often it waits for the socket", async () => {
    const compressors: zlib.BrotliCompress[] = [];
    const create = zlib.createBrotliCompress;
    vi.spyOn(zlib, "createBrotliCompress").mockImplementation((options) => {
      const made = create(options);
      compressors.push(made);
      return made;
    });
    const warnings: Error[] = [];
    const onWarning = (w: Error) => warnings.push(w);
    process.on("warning", onWarning);

    // 40 chunks of 64 KiB that do not compress: every write is more than the compressor's buffer
    // holds, so each one waits for "drain" (counted below, so the test knows it exercised that).
    const chunks = Array.from({ length: 40 }, (_, i) => {
      const b = Buffer.alloc(65536);
      let x = i + 1;
      for (let j = 0; j < b.length; j++) b[j] = (x = (x * 1103515245 + 12345) >>> 0) >>> 24;
      return b;
    });
    let waits = 0;
    const url = await serve(async (res) => {
      const write = res.write.bind(res) as (chunk: Uint8Array) => boolean;
      res.write = ((chunk: Uint8Array) => {
        const more = write(chunk);
        if (!more) waits++;
        return more;
      }) as Response["write"];
      res.type("text/html");
      let i = 0;
      const body = new ReadableStream<Uint8Array>({
        pull(controller) {
          if (i < chunks.length) controller.enqueue(new Uint8Array(chunks[i++]!));
          else controller.close();
        },
      });
      await sendBody(body, res);
    });
    const answer = await getBrotli(url);
    process.off("warning", onWarning);

    expect(answer.encoding).toBe("br");
    expect(answer.body.equals(Buffer.concat(chunks))).toBe(true);
    expect(waits).toBeGreaterThan(10);
    expect(compressors).toHaveLength(1);
    expect(compressors[0]!.listenerCount("drain")).toBeLessThanOrEqual(1);
    expect(warnings.filter((w) => w.name === "MaxListenersExceededWarning")).toEqual([]);
  });

  it("sends what is written before waiting for the rest of the stream (a page's streamed parts arrive as they are ready)", async () => {
    let firstArrived!: () => void;
    const arrived = new Promise<void>((resolve) => (firstArrived = resolve));
    const first = `<p>shell</p>${"<i>row</i>".repeat(300)}`;
    const url = await serve(async (res) => {
      res.type("text/html");
      let step = 0;
      const body = new ReadableStream<Uint8Array>({
        async pull(controller) {
          step++;
          if (step === 1) controller.enqueue(Buffer.from(first));
          // The rest is produced only once the client has decompressed the first part: without a
          // flush it would sit in the compressor and this would never resolve.
          else if (step === 2) await arrived.then(() => controller.enqueue(Buffer.from("<p>later</p>")));
          else controller.close();
        },
      });
      await sendBody(body, res);
    });
    const answer = await getBrotli(url, (text) => {
      if (text.includes(first)) firstArrived();
    });
    expect(answer.encoding).toBe("br");
    expect(answer.body.toString()).toBe(`${first}<p>later</p>`);
  });
});
