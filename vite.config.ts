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

/** Module ids of packages, matched whatever the path separator. */
const pkg = (names: string) => new RegExp(`[\\\\/]node_modules[\\\\/](${names})[\\\\/]`);

/**
 * The client's chunks beside the route modules (tests/e2e/page-scripts.spec.ts counts what the pages preload):
 * - shared: what every page runs — React, react-dom, React Router, Vite's preload helper, and our
 *   small modules every case page draws (the frame's badges, headers, error panel, step list, units,
 *   formatting, the chart frame that loads ECharts on demand; none imports anything heavy);
 * - forms: react-hook-form with our field, form hook and save bar (the step pages and sign-in);
 * - tables: TanStack Table, Papa Parse and our table and CSV modules (the step pages and the loads page);
 * - virtual: TanStack Virtual and our row measure for it (the grids, and the distribution page's list of
 *   cases, which has no table).
 * The editable grid, which needs all three, stays a chunk of its own: in tables, it would bring the
 * form and list chunks to the loads page. The bundler's runtime (under 1 KB) cannot be put in a group.
 */
const CHUNK_GROUPS = [
  {
    name: "shared",
    priority: 3,
    test: (id: string) =>
      pkg("react|react-dom|scheduler|react-router").test(id) ||
      /^\0vite\/preload-helper\.js$/.test(id) ||
      /\/app\/(components\/ui\/(?!virtual-rows\.)|components\/case\/(caution|unsaved-guard)\.|components\/forms\/use-saving\.|components\/charts\/chart\.|charts\/theme\.|domain\/(permissions|vocabulary|steps|units)\.|utils\/(format|page-fonts)\.)/.test(id),
  },
  { name: "forms", priority: 2, test: (id: string) => pkg("react-hook-form|@hookform").test(id) || /\/app\/components\/(forms\/(field|use-zod-form)|case\/step-(save-bar|answer))\./.test(id) },
  { name: "virtual", priority: 2, test: (id: string) => pkg("@tanstack[\\\\/](react-)?virtual(-core)?").test(id) || /\/app\/components\/ui\/virtual-rows\./.test(id) },
  { name: "tables", priority: 1, test: (id: string) => pkg("@tanstack[\\\\/](react-)?table(-core)?|papaparse").test(id) || /\/app\/(components\/tables\/data-table|utils\/csv)\./.test(id) },
];

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
            // Each chunk a page preloads is a request before it can hydrate, and over HTTP/1.1's six
            // connections per origin they go out six at a time: fewer, larger chunks on that path. The
            // route modules stay chunks of their own, and what only some pages draw stays out of the rest.
            codeSplitting: { groups: CHUNK_GROUPS },
          },
        },
      },
    },
  },
});
