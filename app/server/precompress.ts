/**
 * A build step (vite.config.ts runs it once the client is built): a brotli copy at the highest
 * quality (`.br`) and a gzip copy at the highest level (`.gz`) beside each compressible client
 * asset, so the server sends stored bytes (clientAssets in app/server/http.ts) instead of
 * compressing every script and the stylesheet again for every request, on the cores the browser
 * needs for the page.
 */
import fs from "node:fs/promises";
import path from "node:path";
import { promisify } from "node:util";
import zlib from "node:zlib";

const brotli = promisify(zlib.brotliCompress);
const gzip = promisify(zlib.gzip);

/** Text and WebAssembly compress well; fonts (woff2) and images are compressed already. */
const COMPRESSIBLE = /\.(?:js|mjs|css|json|svg|wasm|map|txt|html)$/;
/** Below this the compressed copy saves less than a packet (the compression middleware's threshold too). */
export const PRECOMPRESS_MIN_BYTES = 1024;

/**
 * Writes `<file>.br` and `<file>.gz` beside every compressible file of `dir` of at least
 * PRECOMPRESS_MIN_BYTES, each only where it is smaller than the file. Returns the files compressed
 * and their sizes in bytes (plain, brotli, gzip), for the build's log.
 */
export async function precompressDir(dir: string): Promise<{ files: number; bytes: number; brotliBytes: number; gzipBytes: number }> {
  const names = (await fs.readdir(dir, { recursive: true, withFileTypes: true })).filter((e) => e.isFile() && COMPRESSIBLE.test(e.name)).map((e) => path.join(e.parentPath, e.name));
  const totals = { files: 0, bytes: 0, brotliBytes: 0, gzipBytes: 0 };
  await Promise.all(
    names.map(async (file) => {
      const plain = await fs.readFile(file);
      if (plain.length < PRECOMPRESS_MIN_BYTES) return;
      const [br, gz] = await Promise.all([
        brotli(plain, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: zlib.constants.BROTLI_MAX_QUALITY, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: plain.length } }),
        gzip(plain, { level: zlib.constants.Z_BEST_COMPRESSION }),
      ]);
      if (br.length < plain.length) await fs.writeFile(`${file}.br`, br);
      if (gz.length < plain.length) await fs.writeFile(`${file}.gz`, gz);
      totals.files += 1;
      totals.bytes += plain.length;
      totals.brotliBytes += Math.min(br.length, plain.length);
      totals.gzipBytes += Math.min(gz.length, plain.length);
    }),
  );
  return totals;
}
