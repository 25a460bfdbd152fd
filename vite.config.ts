import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
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
