import { type z } from "zod";
import { requirePermission } from "~/auth/auth.server";
import { PlanformSchema } from "~/domain/step-data";
import type { WingGeometry } from "~/engine";
import { planformGeometry } from "~/services/planform.server";
import { fieldErrorsOf, type ActionRefusal } from "~/utils/form-data";
import { accepted, answer, refused } from "~/utils/http.server";
import type { Route } from "./+types/planform-preview";

/** The preview's answer: the derived geometry of the stations as typed (SI), or why they are no wing. */
export type PlanformPreview =
  | { ok: true; geometry: WingGeometry; stations: z.output<typeof PlanformSchema>["stations"]; axis: { root: number; tip: number } }
  | ActionRefusal;

/**
 * Derived planform geometry for the drawing that follows the person's typing (JSON in, JSON out,
 * SI units). Nothing is stored.
 */
export async function action({ request, context }: Route.ActionArgs) {
  await requirePermission({ request, context }, "case:read");
  const body = await request.json().catch(() => null);
  const parsed = PlanformSchema.safeParse(body);
  if (!parsed.success) return refused(fieldErrorsOf(parsed.error), { status: 422 });
  const stations = parsed.data.stations;
  return answer(async () => accepted(null, { geometry: planformGeometry(stations), stations, axis: { root: parsed.data.axisRoot, tip: parsed.data.axisTip } }));
}
