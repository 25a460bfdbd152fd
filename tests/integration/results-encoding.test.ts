import zlib from "node:zlib";
import { desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { caseResults } from "~/db/schema";
import { forgetDerivedForTests } from "~/services/analysis.server";
import { loader as resultsLoader } from "~/routes/api/v1/case-results";
import { request, routeArgs, seededDemoCase } from "./helpers";
import { startHttpApp } from "./http-harness";

// The results document is large (megabytes for a large case) and the same for the same input: it is
// compressed once and kept, not again for every answer. What goes out decompresses to the document.

let caseId = "";
let cookie = "";

beforeAll(async () => {
  ({ caseId, cookie } = await seededDemoCase());
});

const ask = async (acceptEncoding?: string) =>
  (await resultsLoader((await routeArgs(request(`/api/v1/cases/${caseId}/results`, { cookie, headers: acceptEncoding ? { "Accept-Encoding": acceptEncoding } : {} }), { caseId })) as never)) as Response;

describe("the results document as the client takes it", () => {
  it("is answered brotli- or gzip-compressed as asked, decompressing to the plain document, compressed once", async () => {
    const plain = await ask();
    expect(plain.status).toBe(200);
    expect(plain.headers.get("Content-Encoding")).toBeNull();
    const document = Buffer.from(await plain.arrayBuffer());
    expect(JSON.parse(document.toString("utf8"))).toHaveProperty("cases");

    const brotli = vi.spyOn(zlib, "brotliCompress");
    const br = await ask("gzip, deflate, br");
    expect(br.headers.get("Content-Encoding")).toBe("br");
    expect(br.headers.get("Vary")).toBe("Accept-Encoding");
    const brBody = Buffer.from(await br.arrayBuffer());
    expect(brBody.length).toBeLessThan(document.length);
    expect(zlib.brotliDecompressSync(brBody).equals(document)).toBe(true);
    // Asked again: the same bytes, not compressed again.
    const calls = brotli.mock.calls.length;
    const again = await ask("br");
    expect(Buffer.from(await again.arrayBuffer()).equals(brBody)).toBe(true);
    expect(brotli.mock.calls.length).toBe(calls);
    brotli.mockRestore();

    const gz = await ask("gzip");
    expect(gz.headers.get("Content-Encoding")).toBe("gzip");
    expect(zlib.gunzipSync(Buffer.from(await gz.arrayBuffer())).equals(document)).toBe(true);
    // Each representation has its own tag, so a client's kept copy is matched to what it holds.
    expect(new Set([plain.headers.get("ETag"), br.headers.get("ETag"), gz.headers.get("ETag")]).size).toBe(3);
    // Refused or unknown codings: the plain document.
    expect((await ask("br;q=0, gzip;q=0")).headers.get("Content-Encoding")).toBeNull();
    expect((await ask("compress")).headers.get("Content-Encoding")).toBeNull();
  });

  it("goes out over HTTP as the route compressed it, once (the compression middleware leaves it)", async () => {
    const app = await startHttpApp();
    try {
      const res = await app.get(`/api/v1/cases/${caseId}/results`, { Cookie: cookie, "Accept-Encoding": "br" });
      expect(res.status).toBe(200);
      expect(res.headers.get("Content-Encoding")).toBe("br");
      // fetch undoes one brotli layer: a second one, by the middleware, would leave no JSON here.
      const plain = Buffer.from(await (await ask()).arrayBuffer());
      expect(Buffer.from(await res.arrayBuffer()).equals(plain)).toBe(true);
    } finally {
      await app.close();
    }
  });
});

describe("the results document kept with the stored result", () => {
  it("is stored brotli-compressed once, and a web process that has built nothing answers it from there", async () => {
    const plain = Buffer.from(await (await ask()).arrayBuffer());
    const [row] = await db.select({ documentBr: caseResults.documentBr }).from(caseResults).where(eq(caseResults.caseId, caseId)).orderBy(desc(caseResults.computedAt)).limit(1);
    expect(row?.documentBr).toBeInstanceOf(Buffer);
    expect(zlib.brotliDecompressSync(row!.documentBr!).equals(plain)).toBe(true);
    // As a process just started: nothing kept in memory. The answer is the stored bytes themselves.
    forgetDerivedForTests();
    const stringify = vi.spyOn(JSON, "stringify");
    const br = await ask("br");
    expect(br.headers.get("Content-Encoding")).toBe("br");
    expect(Buffer.from(await br.arrayBuffer()).equals(row!.documentBr!)).toBe(true);
    // Nothing of the result was serialised again (a document is megabytes for a large case).
    expect(stringify.mock.calls.filter(([v]) => typeof v === "object" && v !== null && "cases" in v)).toHaveLength(0);
    stringify.mockRestore();
  });
});
