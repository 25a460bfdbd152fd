import Papa from "papaparse";
import { cpMinAt, fitSectionTable, isEngineError, validateSectionData } from "~/engine";
import type { SectionsData } from "./step-data";

/** Largest section-data file accepted, bytes. */
export const MAX_SECTION_CSV_BYTES = 1024 * 1024;
/** Largest number of data rows accepted (a section table has tens to hundreds). */
export const MAX_SECTION_CSV_ROWS = 5000;

export const COEFFICIENT_COLUMNS = ["y", "a0", "alphaL0", "cmAc", "clMax", "cpMin"] as const;
export const POLAR_COLUMNS = ["y", "alpha", "cl", "cm", "cpMin"] as const;
export const PRESSURE_COLUMNS = ["y", "alpha", "x", "cpUpper", "cpLower"] as const;
const REQUIRED = { coefficients: ["y", "a0", "alphaL0", "cmAc"], polars: ["y", "alpha", "cl", "cm"], pressures: ["y", "alpha", "x", "cpUpper", "cpLower"] } as const;
/** The lift a polar's single Cp,min is quoted at when the polar gives Cp,min per angle (the engine's default lift of a single value). */
const SINGLE_CPMIN_CL = 0.4;

export interface CsvProblem {
  /** 1-based line number in the file (the header is line 1), when the problem is in one row. */
  line?: number;
  column?: string;
  message: string;
}

type Pressures = NonNullable<SectionsData["rows"][number]["pressures"]>;

export type SectionCsvResult =
  | { ok: true; kind: "coefficients" | "polars"; rows: SectionsData["rows"]; tables: SectionsData["tables"]; lines: number }
  | { ok: true; kind: "pressures"; pressures: { y: number; sets: Pressures }[]; lines: number }
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
  const kind = header.includes("cpUpper") || header.includes("cpLower") ? "pressures" : header.includes("alpha") ? "polars" : "coefficients";
  const allowed: readonly string[] = kind === "pressures" ? PRESSURE_COLUMNS : kind === "polars" ? POLAR_COLUMNS : COEFFICIENT_COLUMNS;
  const missing = REQUIRED[kind].filter((c) => !header.includes(c));
  if (missing.length) problems.push({ line: 1, message: `Missing column${missing.length > 1 ? "s" : ""} ${missing.join(", ")}. Expected ${REQUIRED.coefficients.join(", ")}[, clMax, cpMin], or ${REQUIRED.polars.join(", ")}[, cpMin], or ${REQUIRED.pressures.join(", ")}.` });
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
    if (kind === "pressures" && out.x !== undefined && !(out.x >= 0 && out.x <= 1)) problems.push({ line, column: "x", message: "is a chord fraction from 0 (leading edge) to 1 (trailing edge)" });
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

  if (kind === "pressures") return pressuresFrom(numbers);

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
    try {
      const points = list.map((l) => ({ alphaDeg: l.values.alpha!, cl: l.values.cl!, cm: l.values.cm! }));
      const fit = fitSectionTable(points);
      // One Cp,min for the station, or Cp,min per angle: then a table against lift up to the largest cl
      // (before stall), and the single value quoted at the engine's default lift.
      let cpMinData: Partial<SectionsData["rows"][number]> = {};
      if (cpMins.length === 1) cpMinData = { cpMin: cpMins[0]! };
      else if (cpMins.length > 1) {
        const table = cpMinTableOf(list.map((l) => l.values));
        if (typeof table === "string") problems.push({ line: list[0]!.line, column: "cpMin", message: `station y = ${y}: ${table}` });
        else {
          const cl = Math.min(Math.max(SINGLE_CPMIN_CL, table[0]!.cl), table[table.length - 1]!.cl);
          cpMinData = { cpMin: cpMinAt(table, cl).cpMin, cpMinCl: cl, cpMinTable: table };
        }
      }
      rows.push({ y, a0: fit.a0PerRad, alphaL0: fit.alphaL0Deg, cmAc: fit.cmAc, clMax: fit.clMaxObserved, ...cpMinData });
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

/**
 * Cp,min against lift from a polar's rows: the rows up to the largest cl (before stall) in angle order,
 * each with Cp,min, as (cl, Cp,min) points of increasing cl. A message where that gives fewer than two.
 */
function cpMinTableOf(rows: Record<string, number | undefined>[]): NonNullable<SectionsData["rows"][number]["cpMinTable"]> | string {
  const sorted = rows.filter((r) => r.cpMin !== undefined).sort((a, b) => a.alpha! - b.alpha!);
  if (sorted.length < rows.length) return "give cpMin on every row of the station, or on none, or the same on all";
  const peak = sorted.reduce((best, r, i) => (r.cl! > sorted[best]!.cl! ? i : best), 0);
  const table: { cl: number; cpMin: number }[] = [];
  for (const r of sorted.slice(0, peak + 1)) if (!table.length || r.cl! > table[table.length - 1]!.cl) table.push({ cl: r.cl!, cpMin: r.cpMin! });
  return table.length >= 2 ? table : "cpMin varies but fewer than two angles before the largest cl give a table against lift";
}

/** Chordwise pressures by station and angle; every station checked by the engine's rules. */
function pressuresFrom(numbers: Record<string, number | undefined>[]): SectionCsvResult {
  const problems: CsvProblem[] = [];
  const byY = new Map<number, Map<number, { x: number; cpUpper: number; cpLower: number }[]>>();
  for (const n of numbers) {
    const byAlpha = byY.get(n.y!) ?? new Map();
    const pts = byAlpha.get(n.alpha!) ?? [];
    pts.push({ x: n.x!, cpUpper: n.cpUpper!, cpLower: n.cpLower! });
    byAlpha.set(n.alpha!, pts);
    byY.set(n.y!, byAlpha);
  }
  const pressures: { y: number; sets: Pressures }[] = [];
  for (const [y, byAlpha] of [...byY.entries()].sort((a, b) => a[0] - b[0])) {
    const sets = [...byAlpha.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([alpha, pts]) => {
        pts.sort((a, b) => a.x - b.x);
        return { alpha, x: pts.map((p) => p.x), cpUpper: pts.map((p) => p.cpUpper), cpLower: pts.map((p) => p.cpLower) };
      });
    try {
      validateSectionData({ pressures: sets.map((p) => ({ alphaDeg: p.alpha, x: p.x, cpUpper: p.cpUpper, cpLower: p.cpLower })) }, "station");
      pressures.push({ y, sets });
    } catch (error) {
      if (!isEngineError(error)) throw error;
      // "station.pressures[1].x[3]" → "station y = 5 m, angle 4°, x[3]"
      const where = (error.field ?? "")
        .replace(/^station\.pressures/, "")
        .replace(/^\[(\d+)\]\.?/, (_, i: string) => `, angle ${sets[Number(i)]?.alpha}°${"."}`)
        .replace(/\.$/, "")
        .replace(/°\.(\w)/, "°, $1")
        .replace("alphaDeg", "alpha");
      problems.push({ message: `station y = ${y} m${where}: ${error.message.replace(`${error.field}: `, "")}` });
    }
  }
  return problems.length ? { ok: false, problems } : { ok: true, kind: "pressures", pressures, lines: numbers.length };
}

type Source = SectionsData["source"];

/**
 * The section data a checked upload gives, against what is saved: coefficient and polar files replace
 * the rows (and their polar tables); a pressure file adds chordwise pressures to the saved rows at the
 * same y, keeping everything else. A message where a pressure file names a station the data do not have.
 */
export function sectionsWithUpload(saved: SectionsData | null, upload: Extract<SectionCsvResult, { ok: true }>, source: Source): { data: unknown } | { problem: string } {
  // A coefficient file replaces the rows; the flaps and the aileron (their spans and increments) are typed and stay.
  if (upload.kind !== "pressures") return { data: { rows: upload.rows, tables: upload.tables, source, ...(saved?.flaps ? { flaps: saved.flaps } : {}), ...(saved?.aileron ? { aileron: saved.aileron } : {}) } };
  if (!saved) return { problem: "Save the section coefficients first: chordwise pressures belong to stations that already have section data." };
  const missing = upload.pressures.filter((p) => !saved.rows.some((r) => r.y === p.y)).map((p) => p.y);
  if (missing.length) return { problem: `The pressure file has stations at y = ${missing.join(", ")} m, which the section data do not have (stations at ${saved.rows.map((r) => r.y).join(", ")} m).` };
  const byY = new Map(upload.pressures.map((p) => [p.y, p.sets]));
  return { data: { ...saved, rows: saved.rows.map((r) => (byY.has(r.y) ? { ...r, pressures: byY.get(r.y) } : r)) } };
}

/**
 * Typed rows keep the richer data (Cp,min table, chordwise pressures) of the saved row at the same y:
 * editing a coefficient must not lose an upload's tables.
 */
export function keepRicherData(rows: SectionsData["rows"], saved: SectionsData | null): SectionsData["rows"] {
  return rows.map((r) => {
    const old = saved?.rows.find((o) => o.y === r.y);
    return { ...r, ...(old?.cpMinTable ? { cpMinTable: old.cpMinTable } : {}), ...(old?.pressures ? { pressures: old.pressures } : {}) };
  });
}
