import { useEffect } from "react";
import { preload } from "react-dom";
import { Links, Meta, Outlet, Scripts, ScrollRestoration, useMatches } from "react-router";
import type { Route } from "./+types/root";
import { ErrorPanel } from "./components/ui/error-panel";
import { useNonce } from "./utils/csp";
import appCss from "./app.css?url";
import sansLatin from "@fontsource-variable/source-sans-3/files/source-sans-3-latin-wght-normal.woff2?url";
import sansGreek from "@fontsource-variable/source-sans-3/files/source-sans-3-greek-wght-normal.woff2?url";
import { hasGreekText } from "./utils/page-fonts";
import { requestReads } from "./auth/request-context.server";

// The session, the case and its steps, read once per request however many loaders ask (each still checks access).
export const middleware: Route.MiddlewareFunction[] = [requestReads];

// A stylesheet with a precedence is one of React's resources: it is written at the top of <head>,
// before the route modules' modulepreloads. As a plain link it came after fifteen of them, waited for
// a free connection (six per origin over HTTP/1.1) and held back the first paint and, as scripts
// wait for the stylesheets before them, the page's scripts too.
export const links: Route.LinksFunction = () => [{ rel: "stylesheet", href: appCss, precedence: "default" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  // The Latin face (every weight in one variable file) asked for with the document, ahead of the
  // stylesheet (React writes font preloads first in <head>): it is then mostly there for the first
  // layout, and the text is not laid out a second time when it arrives.
  preload(sansLatin, { as: "font", type: "font/woff2", crossOrigin: "anonymous" });
  // The Greek face too where the page says its text has Greek letters (its route's handle): found at
  // the first layout instead, it arrived after the page's scripts and the page was laid out again.
  if (useMatches().some((m) => hasGreekText(m.handle))) preload(sansGreek, { as: "font", type: "font/woff2", crossOrigin: "anonymous" });
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
