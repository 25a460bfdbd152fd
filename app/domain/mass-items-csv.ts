import Papa from "papaparse";
import type { CsvProblem } from "./section-csv";

/** Largest item-table file accepted, bytes, and rows (the step holds at most 100 items). */
export const MAX_ITEM_CSV_BYTES = 256 * 1024;
export const MAX_ITEM_CSV_ROWS = 100;

/** One row of the item table as typed in the grid: text, in the case's display units. */
export interface ItemRow {
  id: string;
  label: string;
  kg: string;
  x: string;
  y: string;
  yFrom: string;
  yTo: string;
}

// Header words, lower case with any "[unit]" and "(…)" removed, and the field each names. The grid's
// own CSV export ("Mass [kg]", "x of CG [m]", "y from [m]"…) reads back through the same table.
const HEADERS: Record<string, keyof ItemRow> = {
  id: "id",
  item: "id",
  description: "label",
  label: "label",
  mass: "kg",
  kg: "kg",
  x: "x",
  "x of cg": "x",
  y: "y",
  "y from": "yFrom",
  yfrom: "yFrom",
  "y to": "yTo",
  yto: "yTo",
};

function headerField(h: string): keyof ItemRow | undefined {
  const key = h
    .toLowerCase()
    .replace(/\[[^\]]*\]/g, "")
    .replace(/\([^)]*\)/g, "")
    .replace(/\s+/g, " ")
    .trim();
  return HEADERS[key];
}

/**
 * Reads the mass-item table from CSV text: a header naming the columns (id, description, mass, x, y,
 * y from, y to; units as the grid shows them) and one row per item — a point mass with y, a spread
 * mass with y from and y to. Every problem is listed by line and column; no rows unless all are good.
 * The numbers stay text: the grid takes them as typed and the step's rules check them on save.
 */
export function parseItemCsv(text: string): { ok: true; rows: ItemRow[] } | { ok: false; problems: CsvProblem[] } {
  if (text.length > MAX_ITEM_CSV_BYTES) return { ok: false, problems: [{ message: `The file is larger than ${MAX_ITEM_CSV_BYTES / 1024} KiB.` }] };
  if (text.includes("\u0000")) return { ok: false, problems: [{ message: "The file is not CSV text: it contains binary data." }] };
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transformHeader: (h) => h.trim(), delimitersToGuess: [",", ";", "\t"] });
  const decimalComma = parsed.meta.delimiter === ";";
  const header = (parsed.meta.fields ?? []).filter((f) => f !== "");
  const problems: CsvProblem[] = [];
  const fields = new Map<string, keyof ItemRow>();
  for (const h of header) {
    const f = headerField(h);
    if (!f) problems.push({ line: 1, column: h, message: "is not a column of the item table (id, description, mass, x, y, y from, y to)" });
    else fields.set(h, f);
  }
  const named = new Set(fields.values());
  for (const need of ["id", "kg", "x"] as const) if (!named.has(need)) problems.push({ line: 1, message: `Missing column ${need === "kg" ? "mass" : need}.` });
  if (!named.has("y") && !(named.has("yFrom") && named.has("yTo"))) problems.push({ line: 1, message: "Missing column y (point masses) or y from and y to (spread masses)." });
  if (problems.length) return { ok: false, problems };
  if (parsed.data.length === 0) return { ok: false, problems: [{ message: "The file has a header but no data rows." }] };
  if (parsed.data.length > MAX_ITEM_CSV_ROWS) return { ok: false, problems: [{ message: `The file has ${parsed.data.length} rows; at most ${MAX_ITEM_CSV_ROWS} items are accepted.` }] };
  for (const e of parsed.errors) problems.push({ line: (e.row ?? 0) + 2, message: e.message });
  const rows = parsed.data.map((record, i) => {
    const line = i + 2;
    const row: ItemRow = { id: "", label: "", kg: "", x: "", y: "", yFrom: "", yTo: "" };
    for (const [h, f] of fields) {
      const raw = (record[h] ?? "").trim();
      if (f === "id" || f === "label") {
        row[f] = raw;
        continue;
      }
      const value = decimalComma ? raw.replace(",", ".") : raw;
      if (value !== "" && !Number.isFinite(Number(value))) problems.push({ line, column: h, message: `"${raw.slice(0, 20)}" is not a number` });
      row[f] = value;
    }
    if (!row.id) problems.push({ line, message: "has no item id" });
    if (!row.kg) problems.push({ line, message: "has no mass" });
    if (!row.x) problems.push({ line, message: "has no x of the centre of gravity" });
    const spread = row.yFrom !== "" || row.yTo !== "";
    if (row.y !== "" && spread) problems.push({ line, message: "gives y and y from–to: a point mass has y, a spread mass y from and y to" });
    if (row.y === "" && !(row.yFrom !== "" && row.yTo !== "")) problems.push({ line, message: "needs y (a point mass) or y from and y to (a spread mass)" });
    return row;
  });
  const seen = new Set<string>();
  rows.forEach((r, i) => {
    if (r.id && seen.has(r.id)) problems.push({ line: i + 2, column: "id", message: `item id ${r.id} repeats` });
    seen.add(r.id);
  });
  return problems.length ? { ok: false, problems } : { ok: true, rows };
}
