import { useEffect } from "react";
import { whenIdle } from "./use-after-interactive";

/** The part of React Router's route manifest (framework mode puts the whole of it on the page: react-router.config.ts) read here. */
interface RouteManifest {
  routes: Record<string, { parentId?: string; module: string; imports?: string[] } | undefined>;
}

/**
 * Fetches the code of the routes a person opens next from this page — the routes under the layout
 * `parentId` (a case's steps, from its rail) — once the browser is idle after the page answers
 * input: a `<link rel="modulepreload">` for each route's module and the chunks it imports, as React
 * Router's own link prefetching does, less its prefetch of the page's data (a page's data is read
 * when it is opened, never kept from before). Opening a step then waits for its data, not for its
 * code: without this, the browser fetched the route's module, and only once it had read it, the
 * chunks that module imports. Each file is fetched once per browser (the assets are immutable and
 * cached). The forms' schemas and the chart library, which pages import on demand, are not among them.
 */
export function usePreloadChildRouteModules(parentId: string) {
  useEffect(
    () =>
      whenIdle(() => {
        const manifest = (window as { __reactRouterManifest?: RouteManifest }).__reactRouterManifest;
        if (!manifest) return;
        const present = new Set([...document.querySelectorAll('link[rel="modulepreload"]')].map((link) => link.getAttribute("href")));
        for (const route of Object.values(manifest.routes)) {
          if (route?.parentId !== parentId) continue;
          for (const href of [route.module, ...(route.imports ?? [])]) {
            if (present.has(href)) continue;
            present.add(href);
            const link = document.createElement("link");
            link.rel = "modulepreload";
            link.href = href;
            document.head.append(link);
          }
        }
      }),
    [parentId],
  );
}
