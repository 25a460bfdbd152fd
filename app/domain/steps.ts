import { STEP_KEYS, type StepKey } from "./vocabulary";

const STEP_TEXT: Record<StepKey, { label: string; summary: string }> = {
  basis: { label: "Basis", summary: "Certification basis, weights, design speeds, altitudes" },
  planform: { label: "Planform", summary: "Wing stations: position, chord, twist" },
  sections: { label: "Sections", summary: "Incompressible section data along the span" },
  masses: { label: "Masses", summary: "Wing masses, fuel states, weights, centre of gravity and balance" },
  envelope: { label: "Envelope", summary: "Manoeuvre and gust load cases, method choice" },
  distribution: { label: "Distribution", summary: "Spanwise lift and moment, critical Mach, flags" },
  loads: { label: "Loads", summary: "Shear, bending, torsion, envelope and root loads" },
};

/** The steps of a case, in working order (STEP_KEYS). Each is a nested route under /cases/:caseId/. */
export const STEPS: readonly { key: StepKey; label: string; summary: string }[] = STEP_KEYS.map((key) => ({ key, ...STEP_TEXT[key] }));

export function stepIndex(key: StepKey): number {
  return STEPS.findIndex((s) => s.key === key);
}

/** The steps whose inputs depend on the given step (everything after it). */
/** Why the approval of a step waits: the steps before it that are not approved yet. */
export function approvalWaits(step: StepKey, waiting: readonly StepKey[]): string {
  return `The ${step} step waits for the approval of ${waiting.join(", ")}: steps are approved in order, each resting on the ones before it.`;
}

export function downstreamOf(key: StepKey): StepKey[] {
  return STEPS.slice(stepIndex(key) + 1).map((s) => s.key);
}

export function nextStep(key: StepKey): StepKey | null {
  return STEPS[stepIndex(key) + 1]?.key ?? null;
}

const STEP_EVENTS: Record<string, string> = {
  save: "saved",
  submit: "submitted for check",
  approve: "approved",
  return: "returned to the engineer",
  comment: "commented on",
};

const CASE_EVENTS: Record<string, string> = {
  "case.create": "Case started",
  "case.import": "Case imported from an exchange document",
  "case.approve-for-issue": "Case approved for issue",
  "upload.sections": "Section data file uploaded",
  "seed.case.create": "Case created by the demo seed",
};

/**
 * The case-history line for an audit action, in words ("Planform submitted for check"); an action
 * without words of its own is shown as recorded, so nothing is hidden from the reader.
 */
export function describeCaseEvent(action: string): string {
  const step = /^step\.([a-z]+)\.([a-z-]+)$/.exec(action);
  if (step) {
    const label = STEPS.find((s) => s.key === step[1])?.label;
    const event = STEP_EVENTS[step[2]!];
    if (label && event) return `${label} ${event}`;
  }
  return CASE_EVENTS[action] ?? action;
}
