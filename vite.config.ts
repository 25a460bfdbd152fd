import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import path from "node:path";
import { defineConfig, type Plugin } from "vite";
// With its extension: Vite warns on every build about a relative import without one (its coming
// native config loader, Node's, resolves none).
import { precompressDir } from "./app/server/precompress.ts";

/**
 * After the whole build (the client's assets, and the route manifest React Router writes among them
 * during the server build): a brotli and a gzip copy beside each compressible client asset, which
 * the server sends as they are (app/server/http.ts, clientAssets).
 */
function precompressClientAssets(): Plugin {
  return {
    name: "spanwright:precompress-client-assets",
    apply: "build",
    buildApp: {
      order: "post",
      async handler(builder) {
        const client = builder.environments.client;
        if (!client) return;
        const dir = path.resolve(client.config.root, client.config.build.outDir, client.config.build.assetsDir);
        const t = await precompressDir(dir);
        const kib = (n: number) => `${(n / 1024).toFixed(0)} KiB`;
        client.logger.info(`precompressed ${t.files} client assets: ${kib(t.bytes)} → brotli ${kib(t.brotliBytes)}, gzip ${kib(t.gzipBytes)}`);
      },
    },
  };
}

export default defineConfig({
  plugins: [tailwindcss(), reactRouter(), precompressClientAssets()],
  resolve: { tsconfigPaths: true },
  server: { host: "127.0.0.1" },
  // The bundler's report of its plugins' timings is for tuning the build, not for every start.
  // The chart chunk (echarts/core with the parts used, ~555 kB, ~190 kB compressed) is the one
  // chunk above Vite's default 500 kB warning; it loads only where a chart is drawn.
  build: { rolldownOptions: { checks: { pluginTimings: false } }, chunkSizeWarningLimit: 600 },
  environments: {
    client: {
      build: {
        rolldownOptions: {
          output: {
            // The small modules every case page draws (the frame's badges, headers, error panel, step
            // list, units, formatting; none imports anything heavy) in one chunk instead of ten of a
            // few hundred bytes each: a page is one request over HTTP/1.1's six connections, not ten.
            codeSplitting: { groups: [{ name: "shared", test: /\/app\/(components\/ui\/|components\/case\/(caution|unsaved-guard)\.|components\/forms\/use-saving\.|domain\/(permissions|vocabulary|steps|units)\.|utils\/format\.)/ }] },
          },
        },
      },
    },
  },
});
