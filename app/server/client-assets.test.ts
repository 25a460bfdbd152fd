import fs from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clientAssets, createApp } from "./http";

// The client assets served as the app serves them (app/server/http.ts: createApp with its
// compression middleware, clientAssets on /assets), from a folder laid out as the build leaves it:
// each compressible file with a brotli and a gzip copy beside it (app/server/precompress.ts).

let dir: string;
let server: http.Server;
let base: string;
// A stylesheet well over the compression middleware's 1 KiB threshold.
const css = Array.from({ length: 400 }, (_, i) => `.rule-${i}{margin:${i % 7}px;color:#${(i * 2654435761).toString(16).slice(-6).padStart(6, "0")}}`).join("\n");
// Stored copies at the highest settings, as the build writes them: the middleware's own, made per
// request (brotli quality 4), would be other bytes.
const cssBr = zlib.brotliCompressSync(Buffer.from(css), { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 11 } });
const cssGz = zlib.gzipSync(Buffer.from(css), { level: 9 });
const font = Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 31) % 256));

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "client-assets-"));
  fs.writeFileSync(path.join(dir, "app-AbC123.css"), css);
  fs.writeFileSync(path.join(dir, "app-AbC123.css.br"), cssBr);
  fs.writeFileSync(path.join(dir, "app-AbC123.css.gz"), cssGz);
  fs.writeFileSync(path.join(dir, "font-XyZ.woff2"), font);
  server = http.createServer(createApp({ origin: "http://127.0.0.1", dev: false }, (app) => app.use("/assets", clientAssets(dir))));
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  server.closeAllConnections();
  await new Promise((resolve) => server.close(resolve));
  fs.rmSync(dir, { recursive: true, force: true });
});

/** A request whose body is read as the bytes on the wire (fetch would decompress it). */
function get(p: string, headers: Record<string, string> = {}, method = "GET"): Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    const req = http.request(base + p, { method, headers }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      res.on("error", reject);
    });
    req.on("error", reject);
    req.end();
  });
}

const IMMUTABLE = "public, max-age=31536000, immutable";

describe("client assets", () => {
  it("sends the stored brotli file to a browser that accepts brotli", async () => {
    // Chromium's header: gzip first, all at the same weight; brotli is the smaller and is preferred.
    const res = await get("/assets/app-AbC123.css", { "Accept-Encoding": "gzip, deflate, br, zstd" });
    expect(res.status).toBe(200);
    expect(res.headers["content-encoding"]).toBe("br");
    expect(res.body.equals(cssBr)).toBe(true);
    expect(res.headers["content-length"]).toBe(String(cssBr.length));
    expect(res.headers["content-type"]?.toLowerCase()).toBe("text/css; charset=utf-8");
    expect(res.headers["vary"]).toMatch(/Accept-Encoding/i);
    expect(res.headers["cache-control"]).toBe(IMMUTABLE);
  });

  it("sends the stored gzip file where brotli is not accepted", async () => {
    const res = await get("/assets/app-AbC123.css", { "Accept-Encoding": "gzip, br;q=0" });
    expect(res.headers["content-encoding"]).toBe("gzip");
    expect(res.body.equals(cssGz)).toBe(true);
    expect(res.headers["content-type"]?.toLowerCase()).toBe("text/css; charset=utf-8");
    expect(res.headers["cache-control"]).toBe(IMMUTABLE);
  });

  it("sends the plain file to a client that accepts no compression", async () => {
    for (const headers of [{}, { "Accept-Encoding": "identity" }] as Record<string, string>[]) {
      const res = await get("/assets/app-AbC123.css", headers);
      expect(res.headers["content-encoding"]).toBeUndefined();
      expect(res.body.toString()).toBe(css);
      expect(res.headers["content-type"]?.toLowerCase()).toBe("text/css; charset=utf-8");
      expect(res.headers["vary"]).toMatch(/Accept-Encoding/i);
      expect(res.headers["cache-control"]).toBe(IMMUTABLE);
    }
  });

  it("answers HEAD with the stored file's headers and no body", async () => {
    const res = await get("/assets/app-AbC123.css", { "Accept-Encoding": "br" }, "HEAD");
    expect(res.headers["content-encoding"]).toBe("br");
    expect(res.headers["content-length"]).toBe(String(cssBr.length));
    expect(res.body.length).toBe(0);
  });

  it("sends a file without stored copies (a font, compressed already) as it is", async () => {
    const res = await get("/assets/font-XyZ.woff2", { "Accept-Encoding": "gzip, deflate, br, zstd" });
    expect(res.headers["content-encoding"]).toBeUndefined();
    expect(res.body.equals(font)).toBe(true);
    expect(res.headers["content-type"]).toBe("font/woff2");
    expect(res.headers["cache-control"]).toBe(IMMUTABLE);
  });

  it("passes a name that is not an asset on (the app answers it), and never serves outside the folder", async () => {
    const missing = await get("/assets/none-000.js", { "Accept-Encoding": "br" });
    expect(missing.status).toBe(404);
    expect(missing.headers["content-encoding"]).toBeUndefined();
    const outside = await get("/assets/..%2f..%2fetc%2fpasswd", { "Accept-Encoding": "br" });
    expect([400, 403, 404]).toContain(outside.status);
    expect(outside.body.toString()).not.toContain("root:");
  });
});
