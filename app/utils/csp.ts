import { createContext, useContext } from "react";

/**
 * The Content-Security-Policy nonce of the current document, provided by entry.server.tsx while the
 * server renders. In the browser it stays empty: browsers hide nonce attributes from scripts, and
 * the scripts that needed it have already run.
 */
export const NonceContext = createContext("");

export function useNonce(): string {
  return useContext(NonceContext);
}

/** Set by our HTTP server on every request, replacing anything the client sent, and named in its CSP header. */
export const CSP_NONCE_HEADER = "x-spanwright-csp-nonce";

// The CSP forbids eval, and zod probes `new Function` for its compiled parsers when the first object
// schema is built, which the browser reports as a violation. zod reads its settings from this
// global, so setting it here (root.tsx imports this module before any route module builds a schema)
// turns the probe off without pulling zod into the root chunk. The server keeps the faster parsers.
if (typeof document !== "undefined") {
  const g = globalThis as { __zod_globalConfig?: { jitless?: boolean } };
  g.__zod_globalConfig = Object.assign(g.__zod_globalConfig ?? {}, { jitless: true });
}
