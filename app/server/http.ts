import { randomBytes } from "node:crypto";
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Server } from "node:http";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express, { type Express, type NextFunction, type Request, type Response } from "express";
import type { ServerBuild } from "react-router";
import { CLIENT_ADDRESS_HEADER } from "../utils/http.server";
import { CSP_NONCE_HEADER } from "../utils/csp";
import { withRequestMemo } from "../utils/request-memo.server";

/**
 * The HTTP server: static files, a same-origin check on every state-changing request (with the
 * SameSite=Lax session cookie this closes cross-site request forgery), security headers, and the
 * React Router request handler — from the production build, or from Vite in development.
 */
export async function startHttpServer(opts: { host: string; port: number; origin: string; dev: boolean }): Promise<Server> {
  let mount: (app: Express) => void;
  if (opts.dev) {
    const vite = await import("vite").then((v) => v.createServer({ server: { middlewareMode: true } }));
    mount = (app) => {
      app.use(vite.middlewares);
      app.all("/{*splat}", createRequestHandler({ build: () => vite.ssrLoadModule("virtual:react-router/server-build") as Promise<ServerBuild> }));
    };
  } else {
    const buildDir = path.resolve("build");
    const build = (await import(pathToFileURL(path.join(buildDir, "server/index.js")).href)) as ServerBuild;
    mount = (app) => {
      app.use("/assets", express.static(path.join(buildDir, "client/assets"), { immutable: true, maxAge: "1y" }));
      // Files in public/ all have an extension; pages never do, so they skip the file-system lookup.
      const publicFiles = express.static(path.join(buildDir, "client"), { maxAge: "1h", index: false });
      app.use((req: Request, res: Response, next: NextFunction) => (path.extname(req.path) ? publicFiles(req, res, next) : next()));
      app.all("/{*splat}", createRequestHandler({ build }));
    };
  }
  const app = createApp({ origin: opts.origin, dev: opts.dev, signInOrigin: process.env.OIDC_ISSUER }, mount);
  return new Promise((resolve, reject) => {
    const server = app.listen(opts.port, opts.host, () => resolve(server));
    server.once("error", reject);
  });
}

/**
 * Stops taking connections, drops the open ones, then closes the database pool: the built app
 * shares the process-wide pool (kept on globalThis), which must close before PostgreSQL stops.
 */
export async function closeHttpServer(server: Server): Promise<void> {
  await new Promise<void>((resolve) => {
    server.close(() => resolve());
    server.closeAllConnections();
  });
  const { closeDb } = await import("../db/client.server");
  await closeDb();
}

/**
 * The Express application around whatever `mount` adds (static files, the React Router handler):
 * security headers first, the client address from the socket, the same-origin check on writes,
 * and last an error answer without internals. Exported so the tests can serve a build through it.
 */
export function createApp(opts: { origin: string; dev: boolean; signInOrigin?: string }, mount: (app: Express) => void): Express {
  const app = express();
  app.disable("x-powered-by");
  app.use(securityHeaders(opts));
  app.use((req: Request, _res: Response, next: NextFunction) => {
    req.headers[CLIENT_ADDRESS_HEADER] = req.socket.remoteAddress ?? "unknown";
    next();
  });
  app.use(sameOriginForWrites(opts.origin));
  // Pages, JSON, CSV and assets go out compressed (brotli at quality 4, or gzip, as the client
  // accepts); types that are compressed already (PDF, fonts) are sent as they are.
  app.use(compression({ threshold: 1024 }));
  // Reads shared by the loaders of one page are made once per request (never in a writing request).
  app.use((req: Request, res: Response, next: NextFunction) => (req.method === "GET" || req.method === "HEAD" ? withRequestMemo(next, (end) => res.once("close", end)) : next()));
  mount(app);
  app.use(answerErrors);
  return app;
}

/**
 * Headers on every answer. The Content-Security-Policy allows scripts only from this origin and
 * inline ones carrying this request's nonce (entry.server.tsx gives it to React Router's inline
 * scripts); no framing by any site; no referrer to other sites. Styles keep 'unsafe-inline' because
 * server-rendered style attributes (chart sizes, progress bars) need it; they cannot run code.
 * Vite's development server injects its own inline scripts and a websocket, so development relaxes
 * script-src and connect-src.
 */
function securityHeaders(opts: { dev: boolean; origin: string; signInOrigin?: string }) {
  const https = new URL(opts.origin).protocol === "https:";
  // A form that starts company sign-in is redirected to the identity provider: form-action must allow it.
  const formTargets = ["'self'", ...(opts.signInOrigin ? [safeOrigin(opts.signInOrigin)].filter((o) => o !== "invalid") : [])].join(" ");
  return (req: Request, res: Response, next: NextFunction) => {
    const nonce = randomBytes(16).toString("base64");
    req.headers[CSP_NONCE_HEADER] = nonce;
    const scripts = opts.dev ? "'self' 'unsafe-inline' 'unsafe-eval'" : `'self' 'nonce-${nonce}'`;
    res.setHeader(
      "Content-Security-Policy",
      [
        "default-src 'self'",
        `script-src ${scripts}`,
        "style-src 'self' 'unsafe-inline'",
        "img-src 'self' data: blob:",
        "font-src 'self' data:",
        `connect-src 'self'${opts.dev ? " ws: wss:" : ""}`,
        "object-src 'none'",
        "base-uri 'self'",
        `form-action ${formTargets}`,
        "frame-ancestors 'none'",
      ].join("; "),
    );
    res.setHeader("X-Content-Type-Options", "nosniff");
    res.setHeader("Referrer-Policy", "same-origin");
    res.setHeader("X-Frame-Options", "DENY");
    res.setHeader("Cross-Origin-Opener-Policy", "same-origin");
    res.setHeader("Cross-Origin-Resource-Policy", "same-origin");
    res.setHeader("Permissions-Policy", "camera=(), microphone=(), geolocation=(), payment=(), usb=()");
    if (https) res.setHeader("Strict-Transport-Security", "max-age=31536000");
    next();
  };
}

/**
 * Last in the chain: an error Express itself raised (a malformed URL escape, an unreadable static
 * path) gets a short answer without its stack; only server faults are logged.
 */
function answerErrors(error: unknown, _req: Request, res: Response, next: NextFunction) {
  if (res.headersSent) return next(error);
  const status = typeof error === "object" && error && "status" in error && typeof error.status === "number" && error.status >= 400 && error.status < 600 ? error.status : 500;
  if (status >= 500) console.error("Request failed before reaching the app", error);
  res.status(status).type("text/plain").send(status >= 500 ? "The server failed to answer this request." : "The request could not be read.");
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
