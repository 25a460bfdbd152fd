import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { afterEach, describe, expect, it } from "vitest";
import { PRECOMPRESS_MIN_BYTES, precompressDir } from "./precompress";

let dir: string | undefined;
afterEach(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
  dir = undefined;
});

const script = Array.from({ length: 300 }, (_, i) => `export const value${i} = ${i} * Math.PI; // line ${i}`).join("\n");

describe("precompressDir", () => {
  it("stores a brotli and a gzip copy beside each compressible file, which decompress to the file", async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "precompress-"));
    fs.writeFileSync(path.join(dir, "entry-Ab1.js"), script);
    fs.writeFileSync(path.join(dir, "app-Cd2.css"), `.a{color:red}\n`.repeat(200));
    fs.mkdirSync(path.join(dir, "nested"));
    fs.writeFileSync(path.join(dir, "nested", "data-Ef3.json"), JSON.stringify(Array.from({ length: 200 }, (_, i) => ({ i }))));

    const totals = await precompressDir(dir);

    expect(totals.files).toBe(3);
    for (const name of ["entry-Ab1.js", "app-Cd2.css", "nested/data-Ef3.json"]) {
      const plain = fs.readFileSync(path.join(dir, name));
      const br = fs.readFileSync(path.join(dir, `${name}.br`));
      const gz = fs.readFileSync(path.join(dir, `${name}.gz`));
      expect(zlib.brotliDecompressSync(br).equals(plain)).toBe(true);
      expect(zlib.gunzipSync(gz).equals(plain)).toBe(true);
      expect(br.length).toBeLessThan(plain.length);
      expect(gz.length).toBeLessThan(plain.length);
    }
  });

  it("leaves alone files compressed already (fonts) and files too small to gain", async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "precompress-"));
    fs.writeFileSync(path.join(dir, "font-Gh4.woff2"), Buffer.alloc(8192, 7));
    fs.writeFileSync(path.join(dir, "tiny-Ij5.js"), "x".repeat(PRECOMPRESS_MIN_BYTES - 1));

    const totals = await precompressDir(dir);

    expect(totals.files).toBe(0);
    expect(fs.readdirSync(dir).sort()).toEqual(["font-Gh4.woff2", "tiny-Ij5.js"]);
  });
});
