import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Server } from "node:http";
import { createRequestHandler } from "@react-router/express";
import express, { type NextFunction, type Request, type Response } from "express";
import type { ServerBuild } from "react-router";
import { CLIENT_ADDRESS_HEADER } from "../utils/http.server";

/**
 * The HTTP server: static files, a same-origin check on every state-changing request (with the
 * SameSite=Lax session cookie this closes cross-site request forgery), security headers, and the
 * React Router request handler — from the production build, or from Vite in development.
 */
export async function startHttpServer(opts: { host: string; port: number; origin: string; dev: boolean }): Promise<Server> {
  const app = express();
  app.disable("x-powered-by");
  app.use(securityHeaders);
  app.use((req: Request, _res: Response, next: NextFunction) => {
    req.headers[CLIENT_ADDRESS_HEADER] = req.socket.remoteAddress ?? "unknown";
    next();
  });
  app.use(sameOriginForWrites(opts.origin));

  if (opts.dev) {
    const vite = await import("vite").then((v) => v.createServer({ server: { middlewareMode: true } }));
    app.use(vite.middlewares);
    app.all(
      "/{*splat}",
      createRequestHandler({ build: () => vite.ssrLoadModule("virtual:react-router/server-build") as Promise<ServerBuild> }),
    );
  } else {
    const buildDir = path.resolve("build");
    app.use("/assets", express.static(path.join(buildDir, "client/assets"), { immutable: true, maxAge: "1y" }));
    app.use(express.static(path.join(buildDir, "client"), { maxAge: "1h", index: false }));
    const build = (await import(pathToFileURL(path.join(buildDir, "server/index.js")).href)) as ServerBuild;
    app.all("/{*splat}", createRequestHandler({ build }));
  }

  return new Promise((resolve, reject) => {
    const server = app.listen(opts.port, opts.host, () => resolve(server));
    server.once("error", reject);
  });
}

function securityHeaders(_req: Request, res: Response, next: NextFunction) {
  res.setHeader("X-Content-Type-Options", "nosniff");
  res.setHeader("Referrer-Policy", "same-origin");
  res.setHeader("X-Frame-Options", "DENY");
  res.setHeader("Cross-Origin-Opener-Policy", "same-origin");
  next();
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Refuses a state-changing request whose Origin (or, failing that, Referer) is another site.
 * Requests with neither header (command-line clients with a bearer token) pass: they carry no
 * ambient browser credentials for a forger to abuse.
 */
function sameOriginForWrites(origin: string) {
  const allowed = new URL(origin).origin;
  return (req: Request, res: Response, next: NextFunction) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const source = req.headers.origin ?? (req.headers.referer ? safeOrigin(req.headers.referer) : undefined);
    if (source === undefined || source === allowed) return next();
    res.status(403).type("application/json").send(JSON.stringify({ message: "Cross-site request refused: the request did not come from this application." }));
  };
}

function safeOrigin(url: string): string {
  try {
    return new URL(url).origin;
  } catch {
    return "invalid";
  }
}
