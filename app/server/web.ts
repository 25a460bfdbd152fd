/**
 * One web process of a cluster that `npm start` forks when WEB_PROCESSES > 1: it only serves HTTP
 * (the primary has started the services, migrated and seeded, and runs the job worker). The
 * processes share nothing but PostgreSQL and S3, as separate machines would; the primary hands
 * them the connections of the one listening port.
 */
import { closeHttpServer, startHttpServer } from "./http";

const server = await startHttpServer({
  host: "127.0.0.1",
  port: Number(process.env.PORT ?? 3000),
  origin: process.env.APP_ORIGIN!,
  dev: false,
});

let closing = false;
async function close() {
  if (closing) return;
  closing = true;
  await closeHttpServer(server);
  process.exit(0);
}

// The primary stops its web processes with "disconnect"; Ctrl-C reaches the whole process group,
// and only the primary decides when to stop, after which it disconnects the rest.
process.on("disconnect", () => void close());
process.on("SIGINT", () => {});
process.on("SIGTERM", () => void close());
