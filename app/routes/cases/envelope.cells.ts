import type { loadCaseRowValues } from "./envelope.schema";

/** One load case as the grid shows it: text in the display units (envelope.schema's loadCaseRowValues). */
export type CaseRow = ReturnType<typeof loadCaseRowValues>;

/**
 * The cells of a load case row in the page's data, in this order. The data carries each row as an
 * array of its cells: the demo's 228 rows as objects naming each of their 14 cells were a third of it,
 * built by the server's encoder and the browser's decoder cell by cell on every visit.
 */
export const CASE_CELLS = ["id", "kind", "rule", "mach", "altitude", "alpha", "weight", "nz", "massCase", "tailLoad", "flaps", "rollFraction", "rollAileron", "excluded"] as const satisfies readonly (keyof CaseRow)[];

export type CaseCells = CaseRow[keyof CaseRow][];

export const caseCells = (rows: CaseRow[]): CaseCells[] => rows.map((row) => CASE_CELLS.map((key) => row[key]));

export const caseRows = (rows: CaseCells[]): CaseRow[] => rows.map((cells) => Object.fromEntries(CASE_CELLS.map((key, i) => [key, cells[i]])) as CaseRow);
