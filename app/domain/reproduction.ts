/*
 * Reproduction of an issued report: the numbers it printed, recomputed from its stored input
 * snapshot, compared one by one. Pure, so the job, the page and the tests share one definition of
 * "identical".
 */

/** One value that differs, by its path in the report's documents. */
export interface ValueDifference {
  path: string;
  issued: string;
  now: string;
}

export interface ValueComparison {
  /** Numbers compared (every number of the issued documents and of the recomputed ones). */
  compared: number;
  /** Values that differ: numbers, texts, or a part present in only one of the two. */
  differing: number;
  /** The first differences, in document order. */
  differences: ValueDifference[];
}

const show = (v: unknown): string => (v === undefined ? "(absent)" : typeof v === "string" ? v : JSON.stringify(v));

/**
 * Compares the issued documents with the recomputed ones value by value. Numbers are equal when
 * they are the same double (as stored: the recomputed side is taken through JSON first, as the
 * issued side was when it was stored, so −0 reads as 0 and a non-finite number as null). Keys
 * listed in `ignore` (by path, e.g. "result.engine") are left out: the engine versions are shown
 * beside the verdict instead.
 */
export function compareValues(issued: unknown, recomputed: unknown, options: { ignore?: string[]; limit?: number } = {}): ValueComparison {
  const ignore = new Set(options.ignore ?? []);
  const limit = options.limit ?? 50;
  const out: ValueComparison = { compared: 0, differing: 0, differences: [] };
  const differ = (path: string, a: unknown, b: unknown) => {
    out.differing++;
    if (out.differences.length < limit) out.differences.push({ path: path || "(whole document)", issued: show(a), now: show(b) });
  };
  const walk = (a: unknown, b: unknown, path: string) => {
    if (ignore.has(path)) return;
    if (typeof a === "number" || typeof b === "number") {
      out.compared++;
      if (!(typeof a === "number" && typeof b === "number" && a === b)) differ(path, a, b);
      return;
    }
    if (Array.isArray(a) && Array.isArray(b)) {
      const n = Math.max(a.length, b.length);
      for (let i = 0; i < n; i++) walk(a[i], b[i], `${path}[${i}]`);
      return;
    }
    if (a !== null && b !== null && typeof a === "object" && typeof b === "object" && !Array.isArray(a) && !Array.isArray(b)) {
      const ka = a as Record<string, unknown>;
      const kb = b as Record<string, unknown>;
      for (const k of new Set([...Object.keys(ka), ...Object.keys(kb)])) walk(ka[k], kb[k], path ? `${path}.${k}` : k);
      return;
    }
    if (a !== b) differ(path, a, b);
  };
  walk(issued, JSON.parse(JSON.stringify(recomputed ?? null)) as unknown, "");
  return out;
}
