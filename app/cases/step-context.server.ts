import type { UnitSystem } from "./units";
import type { StepState } from "~/services/case-steps.server";
import type { StepKey } from "~/db/schema";
import { stepData } from "~/services/case-steps.server";

/** The display units chosen in the case's basis (SI until a basis is saved). */
export function caseUnits(steps: Record<StepKey, StepState>): UnitSystem {
  return stepData(steps, "basis")?.units ?? "SI";
}
