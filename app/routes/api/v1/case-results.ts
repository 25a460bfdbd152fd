import { requireApiUser } from "~/auth/api-auth.server";
import { sweepProgressText } from "~/domain/results";
import { resultToCsv } from "~/exchange";
import { ENGINE_VERSION } from "~/engine";
import { currentResultsOrQueue, resultJsonOrQueue } from "~/services/analysis.server";
import { getCase } from "~/services/programmes.server";
import { DomainError } from "~/domain/errors";
import { acceptedEncoding, apiRefusal } from "~/utils/http.server";
import type { Route } from "./+types/case-results";
import { filenameOf } from "./case-export";
import { apiHandler, methodNotAllowed, notFoundJson } from "./respond.server";

/**
 * GET /api/v1/cases/:caseId/results — the `spanwright.result/1` document of the case's exported
 * input (computed once per input and engine version, then served from storage);
 * `?format=csv` gives every case's station table as CSV instead.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  return apiHandler(async () => {
    const current = await requireApiUser({ request, context }, "case:read");
    const format = new URL(request.url).searchParams.get("format") ?? "json";
    if (format !== "json" && format !== "csv") {
      return apiRefusal(new DomainError(`format must be "json" or "csv" (got "${format}").`, { field: "format" }));
    }
    const found = await getCase(current.organisation.id, params.caseId);
    if (!found) return notFoundJson("The case");
    const answer = format === "json" ? await resultJsonOrQueue(found.case.id, found.case.title, current.user.id, acceptedEncoding(request)) : await currentResultsOrQueue(found.case.id, found.case.title, current.user.id);
    if (answer.pending) {
      const p = answer.progress;
      return Response.json(
        {
          status: "computing",
          message: `${sweepProgressText(p, answer.cases)} Ask again in a moment.`,
          progress: p ? { phase: p.phase, solves: p.solves, casesDone: p.casesDone, casesTotal: p.casesTotal } : null,
        },
        { status: 202, headers: { "Retry-After": "1", "Cache-Control": "no-store" } },
      );
    }
    // The result is fixed by its input and the engine version, so they name it: a client that keeps
    // this version itself is answered 304 without the body. Browsers and proxies keep nothing
    // (no-store): results are an organisation's records.
    // The JSON goes out compressed once and kept (Content-Encoding set here, so the middleware leaves it);
    // each encoding is a representation of its own, with its own tag.
    const encoding = "json" in answer ? answer.encoding : null;
    const etag = `"${ENGINE_VERSION}-${answer.inputHash}-${format}${encoding ? `-${encoding}` : ""}"`;
    const headers = { "X-Spanwright-Input-Sha256": answer.inputHash, ETag: etag, "Cache-Control": "no-store", ...(format === "json" ? { Vary: "Accept-Encoding" } : {}) };
    if (request.headers.get("If-None-Match")?.split(/\s*,\s*/).includes(etag)) return new Response(null, { status: 304, headers });
    if ("json" in answer) return new Response(answer.json, { headers: { ...headers, "Content-Type": "application/json", ...(encoding ? { "Content-Encoding": encoding } : {}) } });
    return new Response(resultToCsv(answer.result), {
      headers: { ...headers, "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${filenameOf(found.case.reference)}-results.csv"` },
    });
  });
}

export async function action({ request }: Route.ActionArgs) {
  return methodNotAllowed(request, "GET");
}
