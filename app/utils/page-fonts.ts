/**
 * What a route's `handle` says about the text it draws, for root.tsx: a page whose text has Greek
 * letters (α, Δ, η…) is set partly from the Greek face, a second file the browser would find only at
 * the first layout and then lay the page out again; root.tsx preloads it with the document on those
 * pages alone (every page has the Latin face preloaded).
 */
export interface PageHandle {
  greekText?: boolean;
}

export const GREEK_TEXT: PageHandle = { greekText: true };

export const hasGreekText = (handle: unknown): boolean => typeof handle === "object" && handle !== null && (handle as PageHandle).greekText === true;
