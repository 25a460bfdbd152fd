import { randomBytes } from "node:crypto";
import path from "node:path";
import zlib from "node:zlib";
import { pathToFileURL } from "node:url";
import type { Server } from "node:http";
import compression from "compression";
import express, { type Express, type NextFunction, type Request, type Response } from "express";
import expressStaticGzip from "express-static-gzip";
import { createRequestHandler, type ServerBuild } from "react-router";
import { CLIENT_ADDRESS_HEADER } from "../utils/http.server";
import { CSP_NONCE_HEADER } from "../utils/csp";
import { BODY_LIMITS, formatBytes } from "../utils/limits";

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
      app.all("/{*splat}", reactRouterHandler({ build: () => vite.ssrLoadModule("virtual:react-router/server-build") as Promise<ServerBuild>, origin: opts.origin }));
    };
  } else {
    const buildDir = path.resolve("build");
    const build = (await import(pathToFileURL(path.join(buildDir, "server/index.js")).href)) as ServerBuild;
    mount = (app) => {
      app.use("/assets", clientAssets(path.join(buildDir, "client/assets")));
      // Files in public/ all have an extension; pages never do, so they skip the file-system lookup.
      const publicFiles = express.static(path.join(buildDir, "client"), { maxAge: "1h", index: false });
      app.use((req: Request, res: Response, next: NextFunction) => (path.extname(req.path) ? (res.removeHeader("Cache-Control"), publicFiles(req, res, next)) : next()));
      app.all("/{*splat}", reactRouterHandler({ build, origin: opts.origin }));
    };
  }
  const app = createApp({ origin: opts.origin, dev: opts.dev, signInOrigin: process.env.OIDC_ISSUER, trustProxy: process.env.TRUST_PROXY }, mount);
  return new Promise((resolve, reject) => {
    const server = app.listen(opts.port, opts.host, () => resolve(server));
    server.once("error", reject);
  });
}

/**
 * The build's hashed client assets (scripts, the stylesheet, fonts): cached for a year as immutable
 * instead of the no-store every other answer gets. The build stores a brotli and a gzip copy beside
 * each compressible file (app/server/precompress.ts); the copy the client accepts is sent as it is
 * stored, with its Content-Encoding, the original's Content-Type and Vary: Accept-Encoding — brotli
 * where both are accepted — so no asset is compressed again per request on the cores the browser
 * shares (the compression middleware leaves an answer that has a Content-Encoding alone). A client
 * that accepts neither gets the plain file.
 */
export function clientAssets(dir: string) {
  const assets = expressStaticGzip(dir, { enableBrotli: true, orderPreference: ["br", "gzip"], serveStatic: { immutable: true, maxAge: "1y", index: false } });
  return (req: Request, res: Response, next: NextFunction) => (res.removeHeader("Cache-Control"), assets(req, res, next));
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

/** Brotli's window for answers compressed per request: 2^18 bytes (256 KiB), not its default 2^22. */
export const ANSWER_BROTLI_WINDOW_BITS = 18;

/**
 * The compression of answers made per request (pages, JSON, CSV): brotli at quality 4 where the
 * client accepts it, else gzip. With brotli's default 4 MiB window, V8 ran a full collection every
 * 0.4 s in each web process at 50 connections on the case overview (most likely on the encoders'
 * memory, which Node's zlib reports to it), and the processes served 30 % fewer requests
 * (docs/benchmarks.md). No answer gains from the larger window at this quality: the 2.3 MB results
 * document compresses to 527 KB with 18 bits against 537 KB with 22.
 */
export function answerCompression() {
  return compression({
    threshold: 1024,
    brotli: { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 4, [zlib.constants.BROTLI_PARAM_LGWIN]: ANSWER_BROTLI_WINDOW_BITS } },
  });
}

/**
 * The Express application around whatever `mount` adds (static files, the React Router handler):
 * security headers first, the client address (from the socket, or from X-Forwarded-For when the
 * socket is a trusted proxy), the same-origin check on writes, the body limit, and last an error
 * answer without internals. Exported so the tests can serve a build through it.
 */
export function createApp(opts: { origin: string; dev: boolean; signInOrigin?: string; trustProxy?: string }, mount: (app: Express) => void): Express {
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", trustedProxies(opts.trustProxy));
  app.use(securityHeaders(opts));
  app.use((req: Request, _res: Response, next: NextFunction) => {
    // req.ip is the socket's address unless that is a trusted proxy (TRUST_PROXY), in which case it
    // is the nearest address in X-Forwarded-For that is not itself a trusted proxy.
    req.headers[CLIENT_ADDRESS_HEADER] = req.ip ?? req.socket.remoteAddress ?? "unknown";
    next();
  });
  app.use(sameOriginForWrites(opts.origin));
  app.use(boundedBody);
  // Pages, JSON and CSV go out compressed; types that are compressed already (PDF, fonts) are sent
  // as they are, and so are the client assets' stored copies (clientAssets), whose Content-Encoding
  // tells this middleware to leave them.
  app.use(answerCompression());
  mount(app);
  app.use(answerErrors);
  return app;
}

/**
 * No other site's window keeps a handle on ours, and no other site embeds our answers. The benchmark's
 * peer page (tests/bench/peer) sends them too: they decide when the browser starts a renderer.
 */
export const ISOLATION_HEADERS = { "Cross-Origin-Opener-Policy": "same-origin", "Cross-Origin-Resource-Policy": "same-origin" } as const;

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
    for (const [name, value] of Object.entries(ISOLATION_HEADERS)) res.setHeader(name, value);
    res.setHeader("Permissions-Policy", "camera=(), microphone=(), geolocation=(), payment=(), usb=()");
    // Nothing is kept by a browser or proxy unless the answer says otherwise: pages, API answers and
    // downloads carry people's records. Static files replace this with their own caching.
    res.setHeader("Cache-Control", "no-store");
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

/**
 * TRUST_PROXY: the reverse proxies whose X-Forwarded-For is believed, as a comma-separated list of
 * addresses, subnets (CIDR) or the words loopback, linklocal, uniquelocal. Unset, no proxy is
 * trusted and the client address is the socket's: the header is then ignored, so nobody can choose
 * the address that sign-in throttling counts against.
 */
export function trustedProxies(value: string | undefined): string[] | false {
  const list = (value ?? "")
    .split(",")
    .map((v) => v.trim())
    .filter(Boolean);
  return list.length ? list : false;
}

// Bodies read by boundedBody, handed to the React Router handler.
const bodies = new WeakMap<Request, Buffer>();

/** The body limit of a request: anonymous requests get the smallest, whatever their path. */
export function bodyLimitFor(req: { path: string; headers: Request["headers"] }): number {
  const bearer = /^Bearer\s/i.test(req.headers.authorization ?? "");
  const session = /(?:^|;\s*)sw_session=/.test(req.headers.cookie ?? "");
  if (!bearer && !session) return BODY_LIMITS.anonymous;
  if (req.path.startsWith("/api/v1/")) return BODY_LIMITS.api;
  if (/^\/cases\/[^/]+\/sections\/?$/.test(req.path)) return BODY_LIMITS.upload;
  return BODY_LIMITS.form;
}

/**
 * Reads the body of every request that may have one, whole, before the app sees it, and answers 413
 * as soon as it is known to be larger than its limit: at once from Content-Length, or while reading
 * a chunked body. The connection is then closed, so the rest is never read. An action therefore
 * never starts on a body that was cut short.
 */
function boundedBody(req: Request, res: Response, next: NextFunction) {
  if (req.method === "GET" || req.method === "HEAD") return next();
  const limit = bodyLimitFor(req);
  const refuse = () => {
    res.setHeader("Connection", "close");
    const message = `The request body is larger than ${formatBytes(limit)}, the limit for this request.`;
    if (req.path.startsWith("/api/")) res.status(413).type("application/json").send(JSON.stringify({ error: "too-large", message }));
    else res.status(413).type("text/plain").send(message);
  };
  const declared = Number(req.headers["content-length"]);
  if (Number.isFinite(declared) && declared > limit) {
    req.pause();
    return refuse();
  }
  const chunks: Buffer[] = [];
  let size = 0;
  const stop = () => {
    req.off("data", onData);
    req.off("end", onEnd);
    req.off("error", onError);
  };
  const onData = (chunk: Buffer) => {
    size += chunk.byteLength;
    if (size <= limit) return void chunks.push(chunk);
    stop();
    req.pause();
    refuse();
  };
  const onEnd = () => {
    stop();
    bodies.set(req, Buffer.concat(chunks, size));
    next();
  };
  // The client went away mid-body: nothing to answer.
  const onError = () => stop();
  req.on("data", onData);
  req.on("end", onEnd);
  req.on("error", onError);
}

/**
 * React Router's request handler for Express (as @react-router/express's, which reads the body
 * itself), handing the app the body boundedBody has already read. The URL is built on the
 * configured origin, never on the Host header a client sends. An answer that says nothing about
 * caching is not to be stored.
 */
export function reactRouterHandler(opts: { build: ServerBuild | (() => Promise<ServerBuild>); origin: string; mode?: string }) {
  const handle = createRequestHandler(opts.build, opts.mode ?? process.env.NODE_ENV);
  const origin = new URL(opts.origin).origin;
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const headers = new Headers();
      for (const [key, values] of Object.entries(req.headers)) {
        if (Array.isArray(values)) for (const value of values) headers.append(key, value);
        else if (values !== undefined) headers.set(key, values);
      }
      let controller: AbortController | null = new AbortController();
      res.on("finish", () => (controller = null));
      res.on("close", () => controller?.abort());
      const read = req.method === "GET" || req.method === "HEAD" ? undefined : bodies.get(req);
      const body = read ? new Uint8Array(read) : undefined;
      const request = new Request(origin + req.originalUrl, { method: req.method, headers, body, signal: controller.signal });
      // No load context: with middleware on, React Router gives each request a fresh
      // RouterContextProvider, which the root's middleware fills (auth/request-context.server.ts).
      const response = await handle(request);
      if (res.destroyed || res.writableEnded) {
        await response.body?.cancel();
        return;
      }
      res.statusMessage = response.statusText;
      res.status(response.status);
      for (const [key, value] of response.headers.entries()) if (key !== "cache-control") res.append(key, value);
      res.setHeader("Cache-Control", response.headers.get("Cache-Control") ?? "no-store");
      if (response.body) await sendBody(response.body, res);
      else res.end();
    } catch (error) {
      if (res.destroyed || res.writableEnded) return;
      next(error);
    }
  };
}

/**
 * Writes a web stream (a page as React renders it, a JSON or CSV answer) to Express's response,
 * waiting whenever the response is full. The compression middleware passes `res.on("drain")` on to
 * its compressor but not `res.off`, so a writer that adds and removes a drain listener per wait
 * (@react-router/node's) leaves one behind on the compressor every time (Node's
 * MaxListenersExceededWarning after ten). Here each response has one drain listener, for its whole life.
 * The compressor is flushed only when the stream has nothing more at hand: the parts of a page that
 * arrive later (streamed data) still go out at once, without a flush after every small chunk.
 */
export async function sendBody(body: ReadableStream<Uint8Array>, res: Response): Promise<void> {
  const reader = body.getReader();
  let wake: (() => void) | undefined;
  const resume = () => {
    const waiting = wake;
    wake = undefined;
    waiting?.();
  };
  let gone = false;
  const onClose = () => {
    gone = true;
    resume();
  };
  res.on("drain", resume);
  res.once("close", onClose);
  const closed = new Promise<"closed">((resolve) => res.once("close", () => resolve("closed")));
  const uncork = () => {
    while (res.writableCorked) res.uncork();
  };
  const flush = () => {
    uncork();
    (res as Response & { flush?: () => void }).flush?.();
  };
  try {
    let next = reader.read();
    for (;;) {
      // A chunk already queued wins the race against the marker; otherwise flush what is written, then wait.
      let step: ReadableStreamReadResult<Uint8Array> | "idle" | "closed" = await Promise.race([next, Promise.resolve("idle" as const)]);
      if (step === "idle") {
        flush();
        step = await Promise.race([next, closed]);
      }
      if (step === "closed" || gone) break;
      if (step.done) {
        uncork();
        res.end();
        return;
      }
      next = reader.read();
      // Chunks at hand go to the socket together (one write for a page's shell, not one per chunk).
      if (!res.writableCorked) res.cork();
      if (!res.write(step.value) && !gone) {
        uncork();
        await new Promise<void>((resolve) => (wake = resolve));
      }
      if (gone) break;
    }
    // The client went away: stop producing (React Router aborts the render through the request's signal).
    await reader.cancel().catch(() => {});
  } catch (error) {
    await reader.cancel(error).catch(() => {});
    res.destroy(error instanceof Error ? error : new Error(String(error)));
  } finally {
    res.off("close", onClose);
    reader.releaseLock();
  }
}
