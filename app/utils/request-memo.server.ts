import { AsyncLocalStorage } from "node:async_hooks";

/**
 * One answer per request for reads that several loaders of the same page need (the session, the
 * case, its steps): React Router runs the root, layout and page loaders of one request in parallel,
 * each with its own Request object, so the scope is opened around the whole handler instead
 * (app/server/http.ts). Only reads are ever memoised, and only in requests that cannot write (GET
 * and HEAD), so an action can never be answered with what was read before it changed the data.
 */
// Shared through globalThis: the server (app/server/http.ts, run from source) and the route modules
// (bundled into build/server) each load their own copy of this module.
const SCOPE_KEY = Symbol.for("spanwright.request-memo");
const scope: AsyncLocalStorage<Map<string, Promise<unknown>>> = ((globalThis as Record<symbol, unknown>)[SCOPE_KEY] ??= new AsyncLocalStorage()) as AsyncLocalStorage<Map<string, Promise<unknown>>>;

/** Runs `next` with a fresh memo; outside such a scope (tests calling loaders directly) nothing is memoised. */
export function withRequestMemo<T>(next: () => T): T {
  return scope.run(new Map(), next);
}

/** The promise of `load()` for `key`, started once per request; a failed read is not kept. */
export function memoised<T>(key: string, load: () => Promise<T>): Promise<T> {
  const memo = scope.getStore();
  if (!memo) return load();
  let pending = memo.get(key) as Promise<T> | undefined;
  if (!pending) {
    pending = load();
    memo.set(key, pending);
    pending.catch(() => memo.delete(key));
  }
  return pending;
}
