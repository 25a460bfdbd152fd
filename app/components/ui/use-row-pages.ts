import { useEffect, useState } from "react";

/** A range of a long list as a ranged resource route answers it (`?offset=&limit=`). */
export interface RowRange<R> {
  revision: number;
  rows: R[];
}

/**
 * The rows of a long list the server holds, a page at a time: the first page comes with the page's
 * data, the others are fetched once each from `source?offset=&limit=` as rows firstIndex … lastIndex
 * come into view (a virtualised table). New first rows or a new revision start over; `stale` says a
 * page came from another revision than the one shown.
 */
export function useRowPages<R>({ source, first, total, revision, firstIndex, lastIndex }: { source: string; first: R[]; total: number; revision: number; firstIndex: number; lastIndex: number }) {
  const pageRows = Math.max(first.length, 1);
  const [pages, setPages] = useState<Map<number, R[]>>(() => new Map([[0, first]]));
  const [stale, setStale] = useState(false);
  // The pages asked for, with what they belong to: new first rows or a new revision start a new set.
  const [held, setHeld] = useState(() => ({ revision, first, requested: new Set<number>([0]) }));
  if (held.revision !== revision || held.first !== first) {
    setHeld({ revision, first, requested: new Set([0]) });
    setPages(new Map([[0, first]]));
    setStale(false);
  }
  const { requested } = held;
  useEffect(() => {
    for (let p = Math.floor(firstIndex / pageRows); p <= Math.floor(Math.min(lastIndex, total - 1) / pageRows); p++) {
      if (requested.has(p)) continue;
      requested.add(p);
      fetch(`${source}?offset=${p * pageRows}&limit=${pageRows}`, { headers: { Accept: "application/json" } })
        .then((r) => (r.ok ? (r.json() as Promise<RowRange<R>>) : Promise.reject(new Error(String(r.status)))))
        .then((page) => {
          if (page.revision !== revision) setStale(true);
          setPages((m) => new Map(m).set(p, page.rows));
        })
        // Asked again when the rows next come into view.
        .catch(() => requested.delete(p));
    }
  }, [firstIndex, lastIndex, total, source, revision, pageRows, requested]);
  return { rowAt: (i: number) => pages.get(Math.floor(i / pageRows))?.[i % pageRows], stale };
}
