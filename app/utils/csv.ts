import Papa from "papaparse";

// Text a spreadsheet would run as a formula (= + - @, tab, CR first) unless it is simply a number:
// the same rule as FORMULA_START of app/exchange/csv.ts (a layer this one does not import).
const FORMULA_START = /^(?![+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$)[=+\-@\t\r]/i;

/**
 * CSV text from a header and rows (RFC 4180 quoting by papaparse). A text cell a spreadsheet would
 * run as a formula is written with a leading apostrophe (CSV injection); numbers stay numbers.
 */
export function toCsv(header: string[], rows: (string | number | null | undefined)[][]): string {
  return Papa.unparse({ fields: header, data: rows.map((r) => r.map((v) => (v === null || v === undefined ? "" : v))) }, { newline: "\r\n", escapeFormulae: FORMULA_START });
}

/** Saves text as a file from the browser. */
export function downloadText(filename: string, text: string, type = "text/csv;charset=utf-8") {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = filename;
  a.click();
  URL.revokeObjectURL(url);
}

/** Splits text pasted from a spreadsheet (tabs, or semicolons/commas for CSV) into cells. */
export function parsePastedCells(text: string): string[][] {
  const delimiter = text.includes("\t") ? "\t" : text.includes(";") ? ";" : ",";
  return text
    .replace(/\r\n?/g, "\n")
    .split("\n")
    .filter((line) => line.trim() !== "")
    .map((line) => line.split(delimiter).map((c) => c.trim()));
}
