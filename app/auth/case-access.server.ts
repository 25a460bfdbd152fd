import { getCase } from "~/services/programmes.server";
import { notFound } from "~/utils/http.server";
import { requirePermission } from "./auth.server";
import type { Permission } from "~/domain/permissions";

/**
 * The signed-in person with the permission, and the case — only if it belongs to their
 * organisation. Every case-step loader and action calls this itself: child loaders run in
 * parallel with the layout's, so no parent may be relied on to have checked.
 */
export async function requireCase(request: Request, caseId: string | undefined, permission: Permission) {
  const current = await requirePermission(request, permission);
  const found = caseId ? await getCase(current.organisation.id, caseId) : null;
  if (!found) notFound("Case");
  return { current, case: found.case, programme: found.programme, createdByName: found.createdByName };
}
