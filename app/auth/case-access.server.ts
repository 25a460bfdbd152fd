import { notFound } from "~/utils/http.server";
import { requirePermission } from "./auth.server";
import { readsOf, type RequestScope } from "./request-context.server";
import type { Permission } from "~/domain/permissions";
import type { StepKey } from "~/domain/vocabulary";

/**
 * The signed-in person with the permission, and the case — only if it belongs to their
 * organisation — with readers of its steps (whole, some of them, or their states only). Every case-step loader
 * and action calls this itself: child loaders run in parallel with the layout's, so no parent may
 * be relied on to have checked;
 * the reads themselves are shared by the loaders of one request (request-context.server.ts).
 */
export async function requireCase(scope: RequestScope, caseId: string | undefined, permission: Permission) {
  const current = await requirePermission(scope, permission);
  const reads = readsOf(scope);
  const found = caseId ? await reads.case(current.organisation.id, caseId) : null;
  if (!found) notFound("Case");
  const id = found.case.id;
  return {
    current,
    case: found.case,
    programme: found.programme,
    createdByName: found.createdByName,
    readSteps: () => reads.steps(id),
    /** The steps a page shows, not the others (a large envelope is megabytes). */
    readStepsOf: <K extends StepKey>(keys: readonly K[]) => reads.stepsOf(id, keys),
    readStepStates: () => reads.stepStates(id),
  };
}
