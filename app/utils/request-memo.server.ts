import { AsyncLocalStorage } from "node:async_hooks";

/**
 * One answer per request for reads that several loaders of the same page need (the session, the
 * case, its steps): React Router runs the root, layout and page loaders of one request in parallel,
 * each with its own Request object, so the scope is opened around the whole handler instead
 * (app/server/http.ts). Only reads are ever memoised, and only in requests that cannot write (GET
 * and HEAD), so an action can never be answered with what was read before it changed the data.
 */
interface Memo {
  open: boolean;
  reads: Map<string, Promise<unknown>>;
}

// Shared through globalThis: the server (app/server/http.ts, run from source) and the route modules
// (bundled into build/server) each load their own copy of this module.
const SCOPE_KEY = Symbol.for("spanwright.request-memo");
const scope = ((globalThis as Record<symbol, unknown>)[SCOPE_KEY] ??= new AsyncLocalStorage<Memo>()) as AsyncLocalStorage<Memo>;

/**
 * Runs `next` with a fresh memo. `onDone` is handed the function that ends it: work that outlives
 * the request in its async context (a timer, a queue client started on the way) then reads afresh.
 * Outside such a scope (tests calling loaders directly) nothing is memoised.
 */
export function withRequestMemo<T>(next: () => T, onDone?: (end: () => void) => void): T {
  const memo: Memo = { open: true, reads: new Map() };
  onDone?.(() => {
    memo.open = false;
    memo.reads.clear();
  });
  return scope.run(memo, next);
}

/** The promise of `load()` for `key`, started once per request; a failed read is not kept. */
export function memoised<T>(key: string, load: () => Promise<T>): Promise<T> {
  const memo = scope.getStore();
  if (!memo?.open) return load();
  let pending = memo.reads.get(key) as Promise<T> | undefined;
  if (!pending) {
    pending = load();
    memo.reads.set(key, pending);
    pending.catch(() => memo.reads.delete(key));
  }
  return pending;
}
