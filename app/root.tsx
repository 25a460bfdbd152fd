import { useEffect } from "react";
import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { useNonce } from "./utils/csp";
import "./app.css";
import { requestReads } from "./auth/request-context.server";

// The session, the case and its steps, read once per request however many loaders ask (each still checks access).
export const middleware: Route.MiddlewareFunction[] = [requestReads];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <link rel="icon" href="/favicon.ico" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen antialiased">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  // Says the page's scripts run; from here on a form keeps what is typed (browser tests wait for it).
  useEffect(() => {
    document.documentElement.dataset.hydrated = "true";
  }, []);
  return <Outlet />;
}

export function meta() {
  return [{ title: "Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <p className="text-lg font-semibold">Spanwright</p>
      <ErrorPanel error={error} />
      <p className="mt-6 text-sm">
        <a href="/">Back to the start page</a>
      </p>
    </main>
  );
}

/** Shared by the root and the signed-in layout: status-specific words, never a stack trace. */
export function ErrorPanel({ error }: { error: unknown }) {
  let title = "Something went wrong";
  let detail = "The request could not be completed. If it keeps happening, tell your administrator the time it happened.";
  if (isRouteErrorResponse(error)) {
    const message = typeof error.data === "object" && error.data && "message" in error.data ? String(error.data.message) : typeof error.data === "string" ? error.data : "";
    if (error.status === 404) {
      title = "Not found";
      detail = message || "There is no page at this address, or you have no access to it.";
    } else if (error.status === 403) {
      title = "Not allowed";
      detail = message || "Your role does not allow this.";
    } else if (error.status === 401) {
      title = "Sign-in needed";
      detail = message || "Sign in to continue.";
    } else if (error.status === 503) {
      title = "Temporarily unavailable";
      detail = message || detail;
    } else {
      title = `Error ${error.status}`;
      detail = message || error.statusText || detail;
    }
  }
  return (
    <div role="alert" className="mt-6 rounded border border-line bg-surface p-5">
      <h1 className="text-xl font-semibold">{title}</h1>
      <p className="mt-2 text-ink-muted">{detail}</p>
    </div>
  );
}
