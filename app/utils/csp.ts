import { createContext, useContext } from "react";
import { z } from "zod";

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
// schema is built, which the browser reports as a violation. root.tsx imports this module, so the
// setting is in place before any route module builds a schema. The server keeps the faster parsers.
if (typeof document !== "undefined") z.config({ jitless: true });
