import { measureElement, type Virtualizer } from "@tanstack/react-virtual";

/**
 * The virtualiser's row measure, taken from its ResizeObserver's report only. The library's own reads
 * a row's offsetHeight in the commit that draws it, which lays the page out there and then (while the
 * page hydrates, inside React's commit), and a row whose height differs from the estimate by a
 * fraction of a pixel renders the whole list again. Here a row keeps its estimate (or its last size)
 * until the browser has laid it out and the observer reports it, and a report within a pixel of that
 * changes nothing: with estimates that are the rows' usual heights, nothing renders again.
 */
export function measureWhenLaidOut<S extends Element, E extends Element>(el: E, entry: ResizeObserverEntry | undefined, instance: Virtualizer<S, E>): number {
  const index = instance.indexFromElement(el);
  const held = instance.itemSizeCache.get(instance.options.getItemKey(index)) ?? instance.options.estimateSize(index);
  if (!entry) return held;
  const measured = measureElement(el, entry, instance);
  return Math.abs(measured - held) <= 1 ? held : measured;
}
