import { reactRouter } from "@react-router/dev/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [reactRouter()],
  build: { rolldownOptions: { checks: { pluginTimings: false } } },
  logLevel: "warn",
});
