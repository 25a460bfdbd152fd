import Papa from "papaparse";
import { fitSectionTable, isEngineError } from "~/engine";
import type { SectionsData } from "./step-data";

/** Largest section-data file accepted, bytes. */
export const MAX_SECTION_CSV_BYTES = 1024 * 1024;
/** Largest number of data rows accepted (a section table has tens to hundreds). */
export const MAX_SECTION_CSV_ROWS = 5000;

export const COEFFICIENT_COLUMNS = ["y", "a0", "alphaL0", "cmAc", "clMax", "cpMin"] as const;
export const POLAR_COLUMNS = ["y", "alpha", "cl", "cm", "cpMin"] as const;
const REQUIRED = { coefficients: ["y", "a0", "alphaL0", "cmAc"], polars: ["y", "alpha", "cl", "cm"] } as const;

export interface CsvProblem {
  /** 1-based line number in the file (the header is line 1), when the problem is in one row. */
  line?: number;
  column?: string;
  message: string;
}

export type SectionCsvResult =
  | { ok: true; kind: "coefficients" | "polars"; rows: SectionsData["rows"]; tables: SectionsData["tables"]; lines: number }
  | { ok: false; problems: CsvProblem[] };

/**
 * Reads section data from CSV, in one of two layouts named by the header:
 * - coefficients: `y, a0, alphaL0, cmAc[, clMax][, cpMin]` — one row per station (a0 per rad, angles deg);
 * - polars: `y, alpha, cl, cm[, cpMin]` — several rows per station; the engine fits a0, αL0 and cmAc
 *   over the linear range it finds, and the largest cl becomes clMax.
 * Every bad row and column is listed; nothing is returned unless the whole file is good.
 */
export function parseSectionCsv(bytes: Uint8Array): SectionCsvResult {
  if (bytes.byteLength > MAX_SECTION_CSV_BYTES) {
    return { ok: false, problems: [{ message: `The file is ${(bytes.byteLength / 1024).toFixed(0)} KiB; at most ${MAX_SECTION_CSV_BYTES / 1024} KiB is accepted.` }] };
  }
  if (bytes.includes(0)) return { ok: false, problems: [{ message: "The file is not CSV text: it contains binary data." }] };
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return { ok: false, problems: [{ message: "The file is not CSV text: it is not valid UTF-8." }] };
  }
  text = text.replace(/^\uFEFF/, "");
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: "greedy", transformHeader: (h) => h.trim(), delimitersToGuess: [",", ";", "\t"] });
  const decimalComma = parsed.meta.delimiter === ";";
  const header = (parsed.meta.fields ?? []).filter((f) => f !== "");
  const problems: CsvProblem[] = [];
  const kind = header.includes("alpha") ? "polars" : "coefficients";
  const allowed: readonly string[] = kind === "polars" ? POLAR_COLUMNS : COEFFICIENT_COLUMNS;
  const missing = REQUIRED[kind].filter((c) => !header.includes(c));
  if (missing.length) problems.push({ line: 1, message: `Missing column${missing.length > 1 ? "s" : ""} ${missing.join(", ")}. Expected ${REQUIRED.coefficients.join(", ")}[, clMax, cpMin] or ${REQUIRED.polars.join(", ")}[, cpMin].` });
  const unknown = header.filter((c) => !allowed.includes(c));
  if (unknown.length) problems.push({ line: 1, message: `Unknown column${unknown.length > 1 ? "s" : ""} ${unknown.join(", ")}.` });
  if (problems.length) return { ok: false, problems };
  if (parsed.data.length === 0) return { ok: false, problems: [{ message: "The file has a header but no data rows." }] };
  if (parsed.data.length > MAX_SECTION_CSV_ROWS) return { ok: false, problems: [{ message: `The file has ${parsed.data.length} data rows; at most ${MAX_SECTION_CSV_ROWS} are accepted.` }] };
  for (const e of parsed.errors) problems.push({ line: (e.row ?? 0) + 2, message: e.message });

  const numbers: Record<string, number | undefined>[] = parsed.data.map((record, i) => {
    const line = i + 2;
    const out: Record<string, number | undefined> = {};
    for (const column of header) {
      const raw = (record[column] ?? "").trim();
      const optional = !(REQUIRED[kind] as readonly string[]).includes(column);
      if (raw === "") {
        if (!optional) problems.push({ line, column, message: "is empty" });
        continue;
      }
      const value = Number(decimalComma ? raw.replace(",", ".") : raw);
      if (!Number.isFinite(value)) problems.push({ line, column, message: `"${raw.slice(0, 20)}" is not a number` });
      else out[column] = value;
    }
    if (out.y !== undefined && out.y < 0) problems.push({ line, column: "y", message: "must be 0 or more" });
    if (out.cpMin !== undefined && !(out.cpMin < 0)) problems.push({ line, column: "cpMin", message: "must be below 0 (a suction peak)" });
    if (kind === "coefficients") {
      if (out.a0 !== undefined && !(out.a0 > 0)) problems.push({ line, column: "a0", message: "must be greater than 0 (per radian)" });
      if (out.clMax !== undefined && !(out.clMax > 0)) problems.push({ line, column: "clMax", message: "must be greater than 0" });
      if (out.a0 !== undefined && out.a0 > 20) problems.push({ line, column: "a0", message: "is per radian: a value above 20 looks like per degree × 57" });
    }
    return out;
  });
  if (problems.length) return { ok: false, problems };

  if (kind === "coefficients") {
    for (let i = 1; i < numbers.length; i++) {
      if (!(numbers[i]!.y! > numbers[i - 1]!.y!)) problems.push({ line: i + 2, column: "y", message: "must be greater than the row before (stations from root to tip)" });
    }
    if (problems.length) return { ok: false, problems };
    return {
      ok: true,
      kind,
      lines: numbers.length,
      tables: [],
      rows: numbers.map((n) => ({ y: n.y!, a0: n.a0!, alphaL0: n.alphaL0!, cmAc: n.cmAc!, ...(n.clMax !== undefined ? { clMax: n.clMax } : {}), ...(n.cpMin !== undefined ? { cpMin: n.cpMin } : {}) })),
    };
  }

  const groups = new Map<number, { line: number; values: Record<string, number | undefined> }[]>();
  numbers.forEach((n, i) => {
    const list = groups.get(n.y!) ?? [];
    list.push({ line: i + 2, values: n });
    groups.set(n.y!, list);
  });
  const rows: SectionsData["rows"] = [];
  const tables: SectionsData["tables"] = [];
  for (const [y, list] of [...groups.entries()].sort((a, b) => a[0] - b[0])) {
    const cpMins = [...new Set(list.map((l) => l.values.cpMin).filter((v) => v !== undefined))];
    if (cpMins.length > 1) problems.push({ line: list[0]!.line, column: "cpMin", message: `station y = ${y} has different cpMin values; give one per station` });
    try {
      const points = list.map((l) => ({ alphaDeg: l.values.alpha!, cl: l.values.cl!, cm: l.values.cm! }));
      const fit = fitSectionTable(points);
      rows.push({ y, a0: fit.a0PerRad, alphaL0: fit.alphaL0Deg, cmAc: fit.cmAc, clMax: fit.clMaxObserved, ...(cpMins[0] !== undefined ? { cpMin: cpMins[0] } : {}) });
      tables.push({ y, points: points.map((p) => ({ alpha: p.alphaDeg, cl: p.cl, cm: p.cm })), linearFrom: fit.linearRange.alphaMinDeg, linearTo: fit.linearRange.alphaMaxDeg });
    } catch (error) {
      if (!isEngineError(error)) throw error;
      problems.push({ line: list[0]!.line, message: `station y = ${y}: ${error.message}` });
    }
  }
  if (problems.length) return { ok: false, problems };
  return { ok: true, kind, rows, tables, lines: numbers.length };
}

export function describeProblem(p: CsvProblem): string {
  return `${p.line ? `Line ${p.line}` : "File"}${p.column ? `, column ${p.column}` : ""}: ${p.message}`;
}
