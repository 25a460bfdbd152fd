/**
 * The peer of the load benchmark: the page in app/routes/case.tsx built by React Router and served
 * by Express (with the app's compression of answers), one process per core like the app's
 * `npm start`. Started by tests/bench/load.ts with PORT, DATABASE_URL and WEB_PROCESSES.
 */
import cluster from "node:cluster";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { createRequestHandler } from "@react-router/express";
import express from "express";
import type { ServerBuild } from "react-router";
import { answerCompression, ISOLATION_HEADERS } from "../../../app/server/http";

const processes = Number(process.env.WEB_PROCESSES ?? 2);
if (cluster.isPrimary && processes > 1) {
  for (let i = 0; i < processes; i++) cluster.fork();
  process.on("SIGTERM", () => {
    for (const w of Object.values(cluster.workers ?? {})) w?.kill("SIGTERM");
    process.exit(0);
  });
} else {
  const build = (await import(pathToFileURL(path.join(import.meta.dirname, "build/server/index.js")).href)) as ServerBuild;
  const app = express();
  app.disable("x-powered-by");
  app.use(answerCompression());
  // The app's isolation headers (app/server/http.ts), which change what the browser does: a page with
  // Cross-Origin-Opener-Policy: same-origin is loaded in a browsing context group, and so a renderer
  // process, of its own when it is reached from one without it (a new tab's blank page). Without them
  // the peer's first visit reuses the new tab's renderer while the app's starts another.
  app.use((_req, res, next) => {
    for (const [name, value] of Object.entries(ISOLATION_HEADERS)) res.setHeader(name, value);
    next();
  });
  app.use("/assets", express.static(path.join(import.meta.dirname, "build/client/assets"), { immutable: true, maxAge: "1y" }));
  app.all("/{*splat}", createRequestHandler({ build }));
  app.listen(Number(process.env.PORT), "127.0.0.1");
  // An orderly exit, so that a process run with --cpu-prof writes its profile.
  process.on("SIGTERM", () => process.exit(0));
}
