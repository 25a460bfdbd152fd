import { Link } from "react-router";
import { PageHeader, Panel } from "~/components/ui/page-header";
import { MAX_LOAD_CASES, MAX_STORED_STATION_ROWS } from "~/domain/step-data";
import { env } from "~/utils/env.server";
import { ANALYZE_LIMITS, BODY_LIMITS, formatBytes, MAX_LISTED_PROBLEMS, MAX_OPEN_ANALYSES, MAX_OUTPUT_ROWS } from "~/utils/limits";
import { exchangeFormatHtml } from "./api-docs.server";
import type { Route } from "./+types/api-docs";

interface Endpoint {
  method: "GET" | "POST";
  path: string;
  permission: string;
  /** The token scope it needs. */
  scope: "read" | "read-write";
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
      scope: "read",
      what: "Your organisation's cases: id, reference, title, programme, status and time of the last change.",
      curl: `curl ${AUTH} ${origin}/api/v1/cases`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}",
      permission: "case:read",
      scope: "read",
      what: "One case with the status and revision of each of its steps.",
      curl: `curl ${AUTH} ${origin}/api/v1/cases/$CASE_ID`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}/export",
      permission: "case:read",
      scope: "read",
      what: "The case as a spanwright.case/1 document, ready for the command line. 409 while planform, sections or envelope is unsaved.",
      curl: `curl ${AUTH} -o case.json ${origin}/api/v1/cases/$CASE_ID/export`,
    },
    {
      method: "GET",
      path: "/api/v1/cases/{caseId}/results",
      permission: "case:read",
      scope: "read",
      what: "The spanwright.result/1 document of the case, computed once per input and engine version and then kept. Add ?format=csv for every case's station table as CSV. A sweep of more than 500 cases is solved by a background worker: until it is stored the answer is 202 with status \"computing\", a message and the progress so far (phase queued, solving or cases; solves, casesDone, casesTotal); ask again after the Retry-After seconds.",
      curl: `curl ${AUTH} -o results.csv "${origin}/api/v1/cases/$CASE_ID/results?format=csv"`,
    },
    {
      method: "POST",
      path: "/api/v1/cases/import",
      permission: "case:create",
      scope: "read-write",
      what: "Creates a case from a spanwright.case/1 document: body { programmeId, reference, title?, case }, or the document alone with ?programmeId=&reference= (programme ids are in the case list). Planform, sections, envelope and loads are filled in one go; the certification basis is left for you to enter. A refusal names every bad field and writes nothing.",
      curl: `curl ${AUTH} -H "Content-Type: application/json" --data-binary @case.json "${origin}/api/v1/cases/import?programmeId=$PROGRAMME_ID&reference=TN-WL-010"`,
    },
    {
      method: "POST",
      path: "/api/v1/analyze",
      permission: "case:read",
      scope: "read",
      what: `Analyses a spanwright.case/1 document and answers spanwright.result/1. Up to ${ANALYZE_LIMITS.syncCases} load cases are answered at once and nothing is stored; a larger sweep, up to ${ANALYZE_LIMITS.queuedCases} cases, is answered 202 with a job to poll (below). A bad document answers 422 with its first ${MAX_LISTED_PROBLEMS} problems and their count. A web process holds ${ANALYZE_LIMITS.inFlightPerProcess} analyses at once; beyond that a request is answered 503 (error "busy") with Retry-After at once, nothing computed: send it again.`,
      curl: `curl ${AUTH} -H "Content-Type: application/json" --data-binary @case.json ${origin}/api/v1/analyze`,
    },
    {
      method: "GET",
      path: "/api/v1/analyze/jobs/{jobId}",
      permission: "case:read",
      scope: "read",
      what: `A sweep you sent to /api/v1/analyze that went to the job queue: 202 while it waits or runs, then 200 with the result (kept for a day). You may have ${MAX_OPEN_ANALYSES} waiting at once; another person's job answers 404.`,
      curl: `curl ${AUTH} ${origin}/api/v1/analyze/jobs/$JOB_ID`,
    },
  ];
}

/** What one request may ask for, as the server enforces it. */
const LIMITS = [
  ["Request body", formatBytes(BODY_LIMITS.api)],
  ["Wing stations (wing.stations)", String(ANALYZE_LIMITS.wingStations)],
  ["Output stations (method.stations)", String(ANALYZE_LIMITS.outputStations)],
  ["Load cases answered at once", String(ANALYZE_LIMITS.syncCases)],
  ["Load cases per request (the rest through the job queue)", String(ANALYZE_LIMITS.queuedCases)],
  ["Values of section data beside the case (sections)", String(ANALYZE_LIMITS.sectionValues)],
  ['Station rows with method.output "full" (cases × output stations)', String(MAX_OUTPUT_ROWS)],
  ["Load cases of an imported case (cases/import)", String(MAX_LOAD_CASES)],
  ['Station rows of an imported case with method.output "full" (stored with its results)', String(MAX_STORED_STATION_ROWS)],
  ["Analyses of yours waiting at once", String(MAX_OPEN_ANALYSES)],
  ["Problems listed in a 422 answer", String(MAX_LISTED_PROBLEMS)],
] as const;

export function loader() {
  return { endpoints: endpoints(env().APP_ORIGIN), exchangeFormat: exchangeFormatHtml(), limits: LIMITS };
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
              acts as you, in the organisation you created it in, with the roles you hold there now; revoke it when it is no longer needed. Its scope is chosen when
              it is made: <strong>read only</strong> (every read, and analysis) or <strong>read and write</strong> (also import). A read-only token asking to
              change a record is answered 403 <code>insufficient-scope</code>.
            </p>
            <p>
              Errors are JSON: <code>{'{ "error": "…", "message": "…" }'}</code>. 401 means no credentials or a token that is unknown or revoked; 403 that your role
              lacks the permission named; 404 that the case does not exist in your organisation (another organisation's case answers the same way).
            </p>
            <pre tabIndex={0} className="overflow-x-auto rounded bg-canvas p-3 text-xs">export SPANWRIGHT_TOKEN=sw_…</pre>
          </div>
        </Panel>
        {loaderData.endpoints.map((e) => (
          <Panel key={e.method + e.path}>
            <h2 className="font-mono text-sm font-semibold">
              {e.method} {e.path}
            </h2>
            <p className="mt-1 text-sm">{e.what}</p>
            <p className="mt-1 text-xs text-ink-muted">
              Needs {e.permission}; a token of scope {e.scope === "read" ? "read only or read and write" : "read and write"}.
            </p>
            {/* Focusable, so a keyboard can scroll a long command sideways (WCAG 2.1.1). */}
            <pre tabIndex={0} className="mt-2 overflow-x-auto rounded bg-canvas p-3 text-xs">
              {e.curl}
            </pre>
          </Panel>
        ))}
        <Panel title="Limits">
          <p className="mb-2 text-sm">
            What one request may ask for. A request beyond a limit is answered at once with 413 (or 422 for a value out of range), naming the limit; nothing is
            solved or stored.
          </p>
          <table className="text-sm">
            <tbody>
              {loaderData.limits.map(([what, value]) => (
                <tr key={what} className="border-t border-line">
                  <td className="py-1 pr-6">{what}</td>
                  <td className="py-1 text-right tabular">{value}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Panel>
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
