import { useEffect } from "react";
import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { ErrorPanel } from "./components/ui/error-panel";
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
