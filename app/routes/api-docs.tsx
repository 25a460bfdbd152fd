import { Link } from "react-router";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { env } from "~/utils/env.server";
import { exchangeFormatHtml } from "./api-docs.server";
import type { Route } from "./+types/api-docs";

interface Endpoint {
  method: "GET" | "POST";
  path: string;
  permission: string;
  what: string;
  curl: string;
}

const AUTH = '-H "Authorization: Bearer $SPANWRIGHT_TOKEN"';

/** The endpoints, with command lines that name this server's own origin. */
function endpoints(origin: string): Endpoint[] {
  return [
    {
      method: "GET",
      path: "/api/v1/cases",
      permission: "case:read",
      what: "Your organisation's cases: id, reference, title, programme, status and time of the last change.",
      curl: `curl ${AUTH} ${origin}/api/v1/cases`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}",
      permission: "case:read",
      what: "One case with the status and revision of each of its steps.",
      curl: `curl ${AUTH} ${origin}/api/v1/cases/$CASE_ID`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}/export",
      permission: "case:read",
      what: "The case as a spanwright.case/1 document, ready for the command line. 409 while planform, sections or envelope is unsaved.",
      curl: `curl ${AUTH} -o case.json ${origin}/api/v1/cases/$CASE_ID/export`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}/results",
      permission: "case:read",
      what: "The spanwright.result/1 document of the case, computed once per input and engine version and then kept. Add ?format=csv for every case's station table as CSV. A sweep of more than 500 cases is solved by a background worker: until it is stored the answer is 202 with status \"computing\", a message and the progress so far (phase queued, solving or cases; solves, casesDone, casesTotal); ask again after the Retry-After seconds.",
      curl: `curl ${AUTH} -o results.csv "${origin}/api/v1/cases/$CASE_ID/results?format=csv"`,
    },
    {
      method: "POST",
      path: "/api/v1/cases/import",
      permission: "case:create",
      what: "Creates a case from a spanwright.case/1 document: body { programmeId, reference, title?, case }, or the document alone with ?programmeId=&reference= (programme ids are in the case list). Planform, sections, envelope and loads are filled in one go; the certification basis is left for you to enter. A refusal names every bad field and writes nothing.",
      curl: `curl ${AUTH} -H "Content-Type: application/json" --data-binary @case.json "${origin}/api/v1/cases/import?programmeId=$PROGRAMME_ID&reference=TN-WL-010"`,
    },
    {
      method: "POST",
      path: "/api/v1/analyze",
      permission: "case:read",
      what: "Analyses a spanwright.case/1 document (up to 20 MB) and answers spanwright.result/1. Nothing is stored. A bad document answers 422 with every problem and its path.",
      curl: `curl ${AUTH} -H "Content-Type: application/json" --data-binary @case.json ${origin}/api/v1/analyze`,
    },
  ];
}

export function loader() {
  return { endpoints: endpoints(env().APP_ORIGIN), exchangeFormat: exchangeFormatHtml() };
}

export default function ApiDocsRoute({ loaderData }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-4xl px-5 py-8">
      <PageHeader
        title="Spanwright API"
        description="JSON over HTTP for scripts and other programs: list and read cases, export and import them in the exchange format, fetch their results, and analyse a case file without storing it."
      />
      <div className="space-y-5">
        <Panel title="Signing in">
          <div className="space-y-2 text-sm">
            <p>
              Every endpoint except the description answers only to a signed-in person. From a browser where you are signed in, the session cookie is enough. From a
              script, create a personal token at <Link to="/account/tokens">Account → API tokens</Link> and send it as <code>Authorization: Bearer sw_…</code>. A token
              acts as you, in the organisation you created it in, with the roles you hold there now; revoke it when it is no longer needed.
            </p>
            <p>
              Errors are JSON: <code>{'{ "error": "…", "message": "…" }'}</code>. 401 means no credentials or a token that is unknown or revoked; 403 that your role
              lacks the permission named; 404 that the case does not exist in your organisation (another organisation's case answers the same way).
            </p>
            <pre className="overflow-x-auto rounded bg-canvas p-3 text-xs">export SPANWRIGHT_TOKEN=sw_…</pre>
          </div>
        </Panel>
        {loaderData.endpoints.map((e) => (
          <Panel key={e.method + e.path}>
            <h2 className="font-mono text-sm font-semibold">
              {e.method} {e.path}
            </h2>
            <p className="mt-1 text-sm">{e.what}</p>
            <p className="mt-1 text-xs text-ink-muted">Needs {e.permission}.</p>
            <pre className="mt-2 overflow-x-auto rounded bg-canvas p-3 text-xs">{e.curl}</pre>
          </Panel>
        ))}
        <Panel title="Formats">
          <ul className="list-disc space-y-1 pl-5 text-sm">
            <li>
              <a href="/api/v1/openapi.json">openapi.json</a> — the OpenAPI 3.1 description of every endpoint, generated from the schemas the server checks with.
            </li>
            <li>
              <a href="#exchange-format">The exchange format</a> — spanwright.case/1 in, spanwright.result/1 out (<code>docs/exchange-format.md</code> in the
              repository); the JSON Schema of both is in openapi.json under <code>components.schemas</code>.
            </li>
          </ul>
          <p className="mt-3 text-xs text-ink-muted">Results support, and do not replace, what the certifying authority accepts.</p>
        </Panel>
        <section id="exchange-format" aria-labelledby="exchange-format-title" className="rounded border border-line bg-surface">
          <h2 id="exchange-format-title" className="border-b border-line px-4 py-2 text-sm font-semibold uppercase tracking-wide text-ink-muted">
            The exchange format
          </h2>
          {/* Our own document, rendered on the server from the file bundled at build time. */}
          <div className="doc overflow-x-auto p-4 text-sm" dangerouslySetInnerHTML={{ __html: loaderData.exchangeFormat }} />
        </section>
      </div>
    </main>
  );
}

export function meta() {
  return [{ title: "API · Spanwright" }];
}
