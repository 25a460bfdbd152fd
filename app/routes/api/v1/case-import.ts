import { href } from "react-router";
import { z } from "zod";
import { lineProblem } from "~/utils/text";
import { requireApiUser } from "~/auth/api-auth.server";
import { importCase } from "~/services/case-import.server";
import type { Route } from "./+types/case-import";
import { apiHandler, invalidCase, methodNotAllowed, readJsonBody } from "./respond.server";

/** Where the imported case goes; the same rules as the new-case form. */
export const ImportTargetSchema = z.strictObject({
  programmeId: z.uuid({ error: "must be the id of one of your organisation's programmes" }),
  reference: z
    .string({ error: "is required (the case reference)" })
    .trim()
    .min(1, { error: "is required (the case reference)" })
    .max(40, { error: "has at most 40 characters" })
    .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, { error: "uses letters, digits and . _ - / only, starting with a letter or digit" }),
  title: z
    .string()
    .trim()
    .min(3, { error: "has at least 3 characters" })
    .max(160, { error: "has at most 160 characters" })
    .refine((v) => lineProblem(v) === null, { error: "must not contain control or bidirectional override characters" })
    .optional(),
  case: z.unknown(),
  /** Richer section data beside the case (`spanwright.sections/1`, docs/decisions/009). */
  sections: z.unknown().optional(),
});

export async function loader({ request }: Route.LoaderArgs) {
  return methodNotAllowed(request, "POST");
}

/**
 * POST /api/v1/cases/import — `{ programmeId, reference, title?, case, sections? }`, or the case document
 * alone with `?programmeId=&reference=[&title=]`. Creates the case with its planform, sections,
 * envelope and loads steps in one transaction; 422 naming every bad field, and nothing written.
 */
export async function action({ request, context }: Route.ActionArgs) {
  return apiHandler(async () => {
    if (request.method !== "POST") return methodNotAllowed(request, "POST");
    const current = await requireApiUser({ request, context }, "case:create");
    const body = await readJsonBody(request);
    const query = new URL(request.url).searchParams;
    // A bare document is recognised by its schema field; the wrapper never has one.
    const bare = typeof body === "object" && body !== null && "schema" in body;
    const target = ImportTargetSchema.safeParse(
      bare
        ? { programmeId: query.get("programmeId") ?? undefined, reference: query.get("reference") ?? undefined, title: query.get("title") ?? undefined, case: body }
        : body,
    );
    if (!target.success) {
      return invalidCase(
        target.error.issues.flatMap((i) =>
          i.code === "unrecognized_keys"
            ? i.keys.map((k) => ({ path: k, message: "is not a field of an import request (programmeId, reference, title, case, sections)" }))
            : [{ path: i.path.map(String).join(".") || "(body)", message: i.message }],
        ),
      );
    }
    if (target.data.case === undefined) return invalidCase([{ path: "case", message: "is required (the spanwright.case/1 document)" }]);
    // A refused document is a DomainError naming every problem, answered 422 by apiHandler.
    const row = await importCase({
      organisationId: current.organisation.id,
      programmeId: target.data.programmeId,
      reference: target.data.reference,
      title: target.data.title,
      document: target.data.case,
      sections: target.data.sections,
      actor: current.user,
    });
    const self = href("/api/v1/cases/:caseId", { caseId: row.id });
    return Response.json(
      { id: row.id, reference: row.reference, title: row.title, status: row.status, links: { case: self, export: href("/api/v1/cases/:caseId/export", { caseId: row.id }), results: href("/api/v1/cases/:caseId/results", { caseId: row.id }) } },
      { status: 201, headers: { Location: self } },
    );
  });
}
