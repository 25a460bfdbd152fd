import { data } from "react-router";
import { z } from "zod";
import { requirePermission } from "~/auth/auth.server";
import { PlanformSchema } from "~/domain/step-data";
import { isEngineError, wingGeometry } from "~/engine";
import { fieldErrorsOf } from "~/utils/form-data";
import type { Route } from "./+types/planform-preview";

const PreviewSchema = PlanformSchema;
export type PlanformPreview =
  | { ok: true; geometry: ReturnType<typeof wingGeometry>; stations: z.output<typeof PreviewSchema>["stations"]; axis: { root: number; tip: number } }
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
    // Geometry needs no section data; neutral values fill the engine's station type.
    const geometry = wingGeometry(parsed.data.stations.map((s) => ({ ...s, a0: 2 * Math.PI, alphaL0: 0, cmAc: 0 })));
    return data<PlanformPreview>({ ok: true, geometry, stations: parsed.data.stations, axis: { root: parsed.data.axisRoot, tip: parsed.data.axisTip } });
  } catch (error) {
    if (isEngineError(error)) return data<PlanformPreview>({ ok: false, fieldErrors: { [error.field ?? "form"]: [error.message] } }, { status: 422 });
    throw error;
  }
}
