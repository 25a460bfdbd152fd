import { z } from "zod";
import { validateSectionData } from "../engine/section-data";
import type { WingModel } from "../engine/superposition";
import { isEngineError } from "../engine/errors";
import type { CaseProblem } from "./parse";
import { formatPath } from "./parse";
import type { CaseFile } from "./schema";

/**
 * Richer section data beside a case: `spanwright.sections/1` (docs/decisions/009-richer-section-data.md).
 * The case contract `spanwright.case/1` stays as it is; this companion document carries, per station
 * of the case (matched by `y`), the lift a single `cpMin` belongs to, the minimum Cp against lift, and
 * the incompressible chordwise pressures for applying the rule point by point.
 */
export const SECTIONS_SCHEMA_ID = "spanwright.sections/1";

const typeError = (what: string) => (iss: { input?: unknown }) => (iss.input === undefined ? "is required" : `must be ${what}`);
const num = () => z.number({ error: typeError("a number") });

export const SectionDataSchema = z.strictObject({
  y: num().min(0, { error: "must be 0 or more (the y of a station of the case)" }),
  cpMinCl: num().optional(),
  cpMinTable: z.array(z.strictObject({ cl: num(), cpMin: num() })).optional(),
  pressures: z
    .array(z.strictObject({ alpha: num(), x: z.array(num()), cpUpper: z.array(num()), cpLower: z.array(num()) }))
    .optional(),
});

export const SectionsFileSchema = z.strictObject({
  schema: z.literal(SECTIONS_SCHEMA_ID, { error: `must be "${SECTIONS_SCHEMA_ID}"` }),
  sections: z.array(SectionDataSchema).min(1, { error: "needs at least 1 section" }),
});

/** A parsed `spanwright.sections/1` document. */
export type SectionsFile = z.output<typeof SectionsFileSchema>;

/**
 * Validate a sections document against the case it goes with: its form, every `y` a station of the
 * case (once), and the engine's rules for each station's data. Every problem is returned with its path.
 */
export function parseSections(json: unknown, file: CaseFile): { ok: true; value: SectionsFile } | { ok: false; problems: CaseProblem[] } {
  const r = SectionsFileSchema.safeParse(json);
  if (!r.success) {
    return {
      ok: false,
      problems: r.error.issues.flatMap((iss) =>
        iss.code === "unrecognized_keys"
          ? iss.keys.map((k) => ({ path: `sections:${formatPath([...iss.path, k])}`, message: `is not a field of ${SECTIONS_SCHEMA_ID} (unknown fields are an error)` }))
          : [{ path: `sections:${formatPath(iss.path)}`, message: iss.message }],
      ),
    };
  }
  const problems: CaseProblem[] = [];
  const seen = new Set<number>();
  r.data.sections.forEach((s, i) => {
    const at = file.wing.stations.findIndex((st) => st.y === s.y);
    if (at < 0) {
      problems.push({ path: `sections:sections[${i}].y`, message: `must be the y of a station of the case (${file.wing.stations.map((st) => st.y).join(", ")})` });
      return;
    }
    if (seen.has(s.y)) problems.push({ path: `sections:sections[${i}].y`, message: `must be unique (${s.y} repeats)` });
    seen.add(s.y);
    try {
      validateSectionData({ ...engineData(s), cpMin: file.wing.stations[at].cpMin }, `sections[${i}]`);
    } catch (e) {
      if (!isEngineError(e)) throw e;
      problems.push({ path: `sections:${e.field}`.replace(/\.pressures\[(\d+)\]\.alphaDeg/, ".pressures[$1].alpha"), message: e.message.replace(`${e.field}: `, "") });
    }
  });
  return problems.length ? { ok: false, problems } : { ok: true, value: r.data };
}

function engineData(s: SectionsFile["sections"][number]) {
  return {
    ...(s.cpMinCl !== undefined ? { cpMinCl: s.cpMinCl } : {}),
    ...(s.cpMinTable ? { cpMinTable: s.cpMinTable.map((p) => ({ ...p })) } : {}),
    ...(s.pressures ? { pressures: s.pressures.map((p) => ({ alphaDeg: p.alpha, x: [...p.x], cpUpper: [...p.cpUpper], cpLower: [...p.cpLower] })) } : {}),
  };
}

/** The wing model with each station's richer section data added (the document must have passed parseSections). */
export function withSections(model: WingModel, sections: SectionsFile | undefined): WingModel {
  if (!sections) return model;
  const byY = new Map(sections.sections.map((s) => [s.y, s]));
  return { ...model, stations: model.stations.map((st) => (byY.has(st.y) ? { ...st, ...engineData(byY.get(st.y)!) } : st)) };
}
