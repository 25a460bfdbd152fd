import type { RollingSides } from "../engine/rolling";

// How a result names the sides of a rolling case, and reads them back. A module of its own, with no
// code of the engine's or the schemas' (zod): a page that reads a label brings nothing else with it.

/** How the envelope and the pages name a side of a rolling case: "R1 (loaded side)", "R1 (other side)". */
export function rollingSideLabel(id: string, side: keyof RollingSides): string {
  return `${id} (${side} side)`;
}

/** The case id and side of an envelope attribution (side null for a symmetric case). */
export function attributionOf(label: string): { id: string; side: keyof RollingSides | null } {
  const m = /^(.*) \((loaded|other) side\)$/.exec(label);
  return m ? { id: m[1]!, side: m[2] as keyof RollingSides } : { id: label, side: null };
}
