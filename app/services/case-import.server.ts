import { and, eq } from "drizzle-orm";
import type { z } from "zod";
import { STEP_SCHEMAS } from "~/domain/step-data";
import { canonicalJson, sha256Hex, writeAudit } from "~/db/audit.server";
import { db, type Db, type Tx } from "~/db/client.server";
import { caseSteps, cases, programmes, stepRevisions } from "~/db/schema";
import type { StepKey } from "~/domain/vocabulary";
import { formatPath, parseCase, parseSections, type CaseFile, type CaseProblem, type SectionsFile } from "~/exchange";
import type { Actor } from "~/domain/people";
import { DomainError, problemsMessage } from "~/domain/errors";
import { runEngine } from "./engine.server";
import { lineProblem } from "~/utils/text";
import { queueCaseResults } from "./results-queue.server";


/** Refusal of an import: every problem found, each with its path in the exchange document. */
function importRefused(problems: CaseProblem[]): DomainError {
  return new DomainError(problemsMessage(problems), { field: problems[0]?.path, kind: "unprocessable", problems });
}

type ImportedSteps = { planform: unknown; sections: unknown; masses: unknown; envelope: unknown };

/**
 * The steps a `spanwright.case/1` document fills: stations → planform and section data; mass, its items
 * and the mass cases → masses (a mass case's weight is taken from its cases where they all agree; the
 * centre of gravity and the balance inputs are not in the format and stay to be entered); method and
 * cases → envelope (each case "manual", rule "imported", with its mass case and tail load as typed).
 * The certification basis is not part of the exchange format and stays unsaved.
 */
export function stepsFromCaseFile(file: CaseFile, sections?: SectionsFile): ImportedSteps {
  const stations = file.wing.stations;
  const richer = new Map((sections?.sections ?? []).map((s) => [s.y, s]));
  return {
    planform: {
      stations: stations.map((s) => ({ y: s.y, xLe: s.xLe, chord: s.chord, twist: s.twist })),
      axisRoot: file.wing.axis.rootChordFraction,
      axisTip: file.wing.axis.tipChordFraction,
    },
    sections: {
      rows: stations.map((s) => ({
        y: s.y,
        a0: s.a0,
        alphaL0: s.alphaL0,
        cmAc: s.cmAc,
        ...(s.clMax !== undefined ? { clMax: s.clMax } : {}),
        ...(s.cpMin !== undefined ? { cpMin: s.cpMin } : {}),
        ...(richer.get(s.y)?.cpMinCl !== undefined ? { cpMinCl: richer.get(s.y)!.cpMinCl } : {}),
        ...(richer.get(s.y)?.cpMinTable ? { cpMinTable: richer.get(s.y)!.cpMinTable } : {}),
        ...(richer.get(s.y)?.pressures ? { pressures: richer.get(s.y)!.pressures } : {}),
      })),
      source: { kind: "import" },
      tables: [],
      ...(file.wing.flaps ? { flaps: { ...file.wing.flaps } } : {}),
      ...(file.wing.aileron ? { aileron: { ...file.wing.aileron } } : {}),
    },
    envelope: {
      compressibility: file.method.compressibility,
      spanwise: file.method.spanwise,
      stations: file.method.stations,
      output: file.method.output,
      ...(file.method.strips !== undefined ? { strips: file.method.strips } : {}),
      cases: file.cases.map((c) => ({
        id: c.id,
        kind: "manual",
        rule: "imported",
        mach: c.mach,
        altitude: c.altitude,
        ...(c.alpha !== undefined
          ? { alpha: c.alpha }
          : { weight: c.weight, nz: c.nz, ...(c.massCase !== undefined ? { massCase: c.massCase } : {}), ...(c.tailLoad !== undefined ? { tailLoad: c.tailLoad } : {}) }),
        ...(c.flaps ? { flaps: true } : {}),
        ...(c.roll ? { roll: { ...c.roll } } : {}),
        excluded: false,
      })),
    },
    masses: {
      structureKg: file.wing.mass?.kg ?? 0,
      items: (file.wing.mass?.items ?? []).map((it) => ({ ...it, label: "" })),
      massCases: (file.massCases ?? []).map((mc) => {
        const weights = new Set(file.cases.filter((c) => c.massCase === mc.id && c.weight !== undefined).map((c) => c.weight! / G0));
        return { id: mc.id, label: "", fill: { ...mc.fill }, ...(weights.size === 1 ? { weight: [...weights][0] } : {}) };
      }),
      source: { kind: "import" },
    },
  };
}

const G0 = 9.80665;

// Where a step field came from in the exchange document, so a refusal names the field the caller wrote.
function documentPath(step: keyof ImportedSteps, path: readonly PropertyKey[]): string {
  const [head, index, ...rest] = path;
  switch (step) {
    case "planform":
      if (head === "stations") return formatPath(["wing", "stations", ...(index === undefined ? [] : [index]), ...rest]);
      if (head === "axisRoot") return "wing.axis.rootChordFraction";
      if (head === "axisTip") return "wing.axis.tipChordFraction";
      return "wing";
    case "sections":
      if (head === "rows") return formatPath(["wing", "stations", ...(index === undefined ? [] : [index]), ...rest]);
      if (head === "flaps") return formatPath(["wing", "flaps", ...(index === undefined ? [] : [index])]);
      if (head === "aileron") return formatPath(["wing", "aileron", ...(index === undefined ? [] : [index])]);
      return "wing.stations";
    case "envelope":
      if (head === "cases") return formatPath(["cases", ...(index === undefined ? [] : [index]), ...rest]);
      if (head === "stations") return "method.stations";
      if (head === "strips") return "method.strips";
      if (head === "compressibility" || head === "spanwise" || head === "output") return `method.${head}`;
      return "method";
    case "masses":
      if (head === "structureKg") return "wing.mass.kg";
      if (head === "items") return formatPath(["wing", "mass", "items", ...(index === undefined ? [] : [index]), ...rest]);
      if (head === "massCases") return formatPath(["massCases", ...(index === undefined ? [] : [index]), ...rest]);
      return "wing.mass";
  }
}

/**
 * Validates an exchange document for import: first by the contract (`parseCase`), then by the
 * stricter rules of the steps it fills (for example at most 60 stations, twist within ±20°,
 * 8–200 output stations, case ids of letters, digits and . _ - +). Returns every problem found.
 */
export function validateImport(json: unknown, sectionsJson?: unknown): { ok: true; file: CaseFile; steps: Record<keyof ImportedSteps, Record<string, unknown>> } | { ok: false; problems: CaseProblem[] } {
  const parsed = parseCase(json);
  if (!parsed.ok) return { ok: false, problems: parsed.problems };
  let sections: SectionsFile | undefined;
  if (sectionsJson !== undefined) {
    const checked = parseSections(sectionsJson, parsed.value);
    if (!checked.ok) return { ok: false, problems: checked.problems };
    sections = checked.value;
  }
  const mapped = stepsFromCaseFile(parsed.value, sections);
  const problems: CaseProblem[] = [];
  const steps = {} as Record<keyof ImportedSteps, Record<string, unknown>>;
  for (const key of Object.keys(mapped) as (keyof ImportedSteps)[]) {
    const result = (STEP_SCHEMAS[key] as z.ZodType).safeParse(mapped[key]);
    if (result.success) steps[key] = result.data as Record<string, unknown>;
    else for (const issue of result.error.issues) problems.push({ path: documentPath(key, issue.path), message: issue.message });
  }
  return problems.length ? { ok: false, problems } : { ok: true, file: parsed.value, steps };
}

/**
 * Creates a case from a `spanwright.case/1` document, with its planform, sections, masses and
 * envelope steps at revision 1 (draft), in ONE transaction with an audit entry for the case and for
 * each step: a refusal (bad document, unknown programme, reference taken) writes nothing.
 * The case title is `title`, else the document's title, else the reference.
 * @throws DomainError "unprocessable" with every bad field in `problems`; "not-found"/"conflict" for programme or reference.
 */
export async function importCase(input: { organisationId: string; programmeId: string; reference: string; title?: string; document: unknown; sections?: unknown; actor: Actor }, database: Db | Tx = db) {
  const checked = runEngine(() => validateImport(input.document, input.sections));
  if (!checked.ok) throw importRefused(checked.problems);
  const title = (input.title ?? checked.file.title ?? input.reference).trim();
  const titleProblem = lineProblem(title);
  if (titleProblem) throw importRefused([{ path: input.title === undefined ? "case.title" : "title", message: titleProblem }]);
  const imported = await database.transaction(async (tx) => {
    const [programme] = await tx
      .select()
      .from(programmes)
      .where(and(eq(programmes.id, input.programmeId), eq(programmes.organisationId, input.organisationId)));
    if (!programme) throw new DomainError("Choose one of your organisation's programmes.", { field: "programmeId", kind: "not-found" });
    const [clash] = await tx
      .select({ id: cases.id })
      .from(cases)
      .where(and(eq(cases.programmeId, programme.id), eq(cases.reference, input.reference)));
    if (clash) throw new DomainError(`Programme ${programme.code} already has a case ${input.reference}.`, { field: "reference", kind: "conflict" });
    const [row] = await tx
      .insert(cases)
      .values({ organisationId: input.organisationId, programmeId: programme.id, reference: input.reference, title, description: "", createdBy: input.actor.id })
      .returning();
    await writeAudit(tx, { organisationId: input.organisationId, actor: input.actor, action: "case.import", entityType: "case", entityId: row!.id, after: row });
    for (const step of Object.keys(checked.steps) as (keyof ImportedSteps & StepKey)[]) {
      const data = checked.steps[step];
      const hash = sha256Hex(canonicalJson(data));
      await tx.insert(caseSteps).values({ caseId: row!.id, step, revision: 1, status: "draft", data, updatedBy: input.actor.id });
      await tx.insert(stepRevisions).values({ caseId: row!.id, step, revision: 1, data, hash, createdBy: input.actor.id });
      await writeAudit(tx, {
        organisationId: input.organisationId,
        actor: input.actor,
        action: `step.${step}.save`,
        entityType: "case",
        entityId: row!.id,
        before: null,
        after: { revision: 1, hash, data, source: "import" },
      });
    }
    return row!;
  });
  // As after a save: a large case's results are built and solved by the worker from the start.
  if (database === db) await queueCaseResults(imported.id);
  return imported;
}
