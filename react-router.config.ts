import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // The whole route manifest as one immutable, cached asset instead of the "lazy" default, which
  // computes a partial manifest on every page render (matching each parent path against all
  // routes) and inlines it, and then asks /__manifest as links appear on the page.
  routeDiscovery: { mode: "initial" },
  future: {
    v8_middleware: true,
    v8_viteEnvironmentApi: true,
    // Each route's client code split by export, so a page downloads only what it renders.
    v8_splitRouteModules: true,
    v8_trailingSlashAwareDataRequests: true,
    // Not yet: loaders would see the raw data-request URL (with its ".data"), and the sign-in
    // redirect (requireUser) builds its return address from the request's path.
    v8_passThroughRequests: false,
  },
} satisfies Config;
