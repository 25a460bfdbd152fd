import { drizzle, type NodePgDatabase } from "drizzle-orm/node-postgres";
import pg from "pg";
import * as schema from "./schema";

export type Db = NodePgDatabase<typeof schema>;
/** A transaction handle; services accept `Db | Tx` so callers can compose them in one transaction. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

// One pool per process, kept across dev-server module reloads.
const globalForDb = globalThis as unknown as { __spanwrightPool?: pg.Pool; __spanwrightDb?: Db };

function connectionString(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set");
  return url;
}

export function pool(): pg.Pool {
  if (!globalForDb.__spanwrightPool) {
    const created = new pg.Pool({ connectionString: connectionString(), max: 10 });
    // An idle connection dropped by the server (restart, shutdown) must not crash the process:
    // the pool replaces it, and the next query reports a real failure if the server stays away.
    created.on("error", (error) => console.warn(`database connection lost: ${error.message}`));
    // A connection that is checked out (inside a transaction) when the server goes emits its error on
    // the client, where pg has no listener: without this one, a database restart kills the process.
    // The query in flight still fails, and the request answers with that failure.
    created.on("connect", (client) => client.on("error", () => {}));
    globalForDb.__spanwrightPool = created;
  }
  return globalForDb.__spanwrightPool;
}

export const db: Db = new Proxy({} as Db, {
  // Created on first use so that importing this module never needs a database.
  get(_target, prop, receiver) {
    return Reflect.get(handle(), prop, receiver);
  },
});

function handle(): Db {
  return (globalForDb.__spanwrightDb ??= drizzle(pool(), { schema }));
}

/**
 * A query built once and sent as a named prepared statement: the reads every page makes (the
 * session, the case, its steps, history and checks) skip Drizzle's query building, which cost more
 * CPU than PostgreSQL's answer, and PostgreSQL parses and plans each once per connection. Kept per
 * database handle, so a pool closed and opened again (tests) gets its statements anew.
 */
export function prepared<T>(build: (database: Db) => T): () => T {
  const built = new WeakMap<Db, T>();
  return () => {
    const database = handle();
    let query = built.get(database);
    if (query === undefined) built.set(database, (query = build(database)));
    return query;
  };
}

export async function closeDb(): Promise<void> {
  await globalForDb.__spanwrightPool?.end();
  globalForDb.__spanwrightPool = undefined;
  globalForDb.__spanwrightDb = undefined;
}
