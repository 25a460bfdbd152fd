import { PassThrough } from "node:stream";
import type { EntryContext, HandleErrorFunction, RouterContextProvider } from "react-router";
import { createReadableStreamFromReadable } from "@react-router/node";
import { ServerRouter } from "react-router";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { CSP_NONCE_HEADER, NonceContext } from "./utils/csp";

export const streamTimeout = 5_000;

/**
 * React Router's default Node entry, plus the CSP nonce: app/server/http.ts puts a fresh one on
 * every request and names it in the Content-Security-Policy header, and every inline script React
 * Router writes (hydration context, route modules, scroll restoration, streamed data) carries it.
 */
export default function handleRequest(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext, _loadContext: RouterContextProvider) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }
  const nonce = request.headers.get(CSP_NONCE_HEADER) ?? undefined;

  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Crawlers and SPA-mode renders wait for all content, as in the default entry.
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={nonce ?? ""}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceContext.Provider>,
      {
        nonce,
        [readyOption]() {
          shellRendered = true;
          const body = new PassThrough({
            final(callback) {
              clearTimeout(timeoutId);
              timeoutId = undefined;
              callback();
            },
          });
          const stream = createReadableStreamFromReadable(body);
          responseHeaders.set("Content-Type", "text/html; charset=utf-8");
          pipe(body);
          resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          // Errors of the initial shell reject and are logged by React Router; log only later ones.
          if (shellRendered) console.error("Rendering failed after the first byte", error);
        },
      },
    );
  });
}

/**
 * Logs an unexpected error of a loader, action or render once, with the request it belongs to. The
 * answer itself never carries it: in production React Router sends the error boundary with a
 * generic message. Aborted requests (the person navigated away) are not errors.
 */
export const handleError: HandleErrorFunction = (error, { request }) => {
  if (request.signal.aborted) return;
  console.error(`Unexpected error answering ${request.method} ${new URL(request.url).pathname}`, error);
};
