import path from "node:path";
import { createServer as createHttpServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { ServerBuild } from "react-router";
import { createServer, type ViteDevServer } from "vite";
import { createApp, reactRouterHandler } from "~/server/http";

/**
 * The real Express application of app/server/http.ts serving the app through React Router in
 * production mode (errors sanitised as deployed), over HTTP on a free loopback port.
 */
export interface HttpApp {
  base: string;
  get(path: string, headers?: Record<string, string>): Promise<Response>;
  postForm(path: string, fields: Record<string, string> | URLSearchParams, headers?: Record<string, string>): Promise<Response>;
  close(): Promise<void>;
}

export async function startHttpApp(opts: { trustProxy?: string } = {}): Promise<HttpApp> {
  const vite: ViteDevServer = await createServer({ configFile: path.resolve("vite.config.ts"), server: { middlewareMode: true, hmr: false, ws: false }, appType: "custom", logLevel: "error" });
  const build = (await vite.ssrLoadModule("virtual:react-router/server-build")) as ServerBuild;
  // The origin is known once the port is: listen first, then hand the requests to the application.
  const server: Server = createHttpServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const app = createApp({ origin: base, dev: false, trustProxy: opts.trustProxy }, (a) => a.all("/{*splat}", reactRouterHandler({ build, origin: base, mode: "production" })));
  server.on("request", app);
  return {
    base,
    get: (p, headers = {}) => fetch(base + p, { headers, redirect: "manual" }),
    postForm: (p, fields, headers = {}) =>
      fetch(base + p, { method: "POST", body: fields instanceof URLSearchParams ? fields : new URLSearchParams(fields), headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: base, ...headers }, redirect: "manual" }),
    async close() {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
      // The modules Vite loaded hold their own pool on this file's database: close it before the database is dropped.
      const client = (await vite.ssrLoadModule("/app/db/client.server.ts")) as { closeDb?: () => Promise<void> };
      await client.closeDb?.();
      await vite.close();
    },
  };
}
