import { data } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/auth.server";
import { PlanformSchema } from "~/domain/step-data";
import { isEngineError, type WingGeometry } from "~/engine";
import { planformGeometry } from "~/services/planform.server";
import { fieldErrorsOf } from "~/utils/form-data";
import type { Route } from "./+types/planform-preview";

const PreviewSchema = PlanformSchema;
export type PlanformPreview =
  | { ok: true; geometry: WingGeometry; stations: z.output<typeof PreviewSchema>["stations"]; axis: { root: number; tip: number } }
  | { ok: false; fieldErrors: Record<string, string[] | undefined> };

/**
 * Derived planform geometry for the drawing that follows the person's typing (JSON in, JSON out,
 * SI units). Nothing is stored.
 */
export async function action({ request }: Route.ActionArgs) {
  await requirePermission(request, "case:read");
  const body = await request.json().catch(() => null);
  const parsed = PreviewSchema.safeParse(body);
  if (!parsed.success) return data<PlanformPreview>({ ok: false, fieldErrors: fieldErrorsOf(parsed.error) }, { status: 422 });
  try {
    const geometry = planformGeometry(parsed.data.stations);
    return data<PlanformPreview>({ ok: true, geometry, stations: parsed.data.stations, axis: { root: parsed.data.axisRoot, tip: parsed.data.axisTip } });
  } catch (error) {
    if (isEngineError(error)) return data<PlanformPreview>({ ok: false, fieldErrors: { [error.field ?? "form"]: [error.message] } }, { status: 422 });
    throw error;
  }
}
