import type { Config } from "@react-router/dev/config";

// The peer page of the load benchmark (tests/bench/load.ts): the same framework, version and
// future flags as the app, nothing else.
export default {
  ssr: true,
  future: { v8_middleware: true, v8_viteEnvironmentApi: true, v8_splitRouteModules: true, v8_trailingSlashAwareDataRequests: true, v8_passThroughRequests: false },
} satisfies Config;
