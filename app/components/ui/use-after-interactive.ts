import { startTransition, useEffect, useRef, useState } from "react";

/**
 * False on the server, while the page hydrates and until the browser is next idle; true from then on.
 * What is drawn only from then on (charts, the rows of a long grid) does not hold back the page's
 * first answer to a click or a key: hydration has that much less to build and attach. It is then
 * drawn as a transition, which React interrupts for a click or a key that arrives meanwhile.
 */
export function useAfterInteractive() {
  const [ready, setReady] = useState(false);
  useEffect(() => whenIdle(() => startTransition(() => setReady(true))), []);
  return ready;
}

/**
 * How many items of a list to draw: none on the server, while the page hydrates and until the browser
 * is next idle; then `step` more at each idle moment (each a transition) until `total` are drawn, and
 * Infinity from then on. Each commit adds `step` items at most, so a click or a key that arrives
 * meanwhile waits for one small commit, not for every item at once. `total` is null while unknown (the
 * first step is then drawn without it).
 */
export function useDrawnInSteps(total: number | null, step: number): number {
  const [drawn, setDrawn] = useState(0);
  useEffect(() => {
    if (drawn === Infinity) return;
    return whenIdle(() => startTransition(() => setDrawn((d) => (total !== null && d + step >= total ? Infinity : d + step))));
  }, [drawn, total, step]);
  return drawn;
}

/** Calls `run` when the browser is next idle (at the latest after a second, on a page that is never idle); returns the cancel. */
export function whenIdle(run: () => void): () => void {
  if (typeof window.requestIdleCallback !== "function") {
    const timer = setTimeout(run, 0);
    return () => clearTimeout(timer);
  }
  const id = window.requestIdleCallback(run, { timeout: 1000 });
  return () => window.cancelIdleCallback(id);
}

/**
 * Loads `url` into a fetcher (useFetcher's `load`) whenever `url` or `again` changes, as an effect
 * would — except the first load, which waits until the browser is idle. Started in the effects of the
 * commit that draws the page, a fetcher's load matches the routes, imports the resource route's
 * module and re-renders the router's subscribers before the page can answer its first click.
 */
export function useLoadAfterInteractive(load: (url: string) => Promise<void>, url: string | null, again?: unknown) {
  const waited = useRef(false);
  useEffect(() => {
    if (url === null) return;
    if (waited.current) {
      void load(url);
      return;
    }
    return whenIdle(() => {
      waited.current = true;
      void load(url);
    });
  }, [load, url, again]);
}
