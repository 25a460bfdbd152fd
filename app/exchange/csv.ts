import { rollingSideLabel } from "./rolling-labels";
import type { CaseResult } from "./schema";

/**
 * Text a spreadsheet would run as a formula: it starts with = + - @ (or a tab or carriage return)
 * and is not simply a number. Such a cell is written with a leading apostrophe (OWASP's advice on
 * CSV injection), so a load case named "=HYPERLINK(…)" stays text. app/utils/csv.ts applies the
 * same rule to the pages' CSV downloads.
 */
export const FORMULA_START = /^(?![+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$)[=+\-@\t\r]/i;

function cell(v: string | number): string {
  if (typeof v === "number") return String(v);
  const formula = FORMULA_START.test(v);
  const text = formula ? `'${v}` : v;
  return formula || /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * Station tables of every case as CSV (RFC 4180 quoting): case, y, chord, cl, cm, lift, shear, bending, torsion.
 * Units as in the result: m, N/m, N, N·m. A rolling case's other side follows it as "<id> (other side)" with
 * its shear, bending and torsion (cl, cm and lift left empty: the section data are the symmetric condition's).
 */
export function resultToCsv(result: CaseResult): string {
  const lines = ["case,y,chord,cl,cm,lift,shear,bending,torsion"];
  for (const c of result.cases) {
    for (const s of c.stations ?? []) {
      lines.push([c.id, s.y, s.chord, s.cl, s.cm, s.lift, s.shear, s.bending, s.torsion].map(cell).join(","));
    }
    (c.roll?.other.stations ?? []).forEach((s, k) => {
      lines.push([rollingSideLabel(c.id, "other"), s.y, c.stations![k].chord, "", "", "", s.shear, s.bending, s.torsion].map(cell).join(","));
    });
  }
  return lines.join("\n") + "\n";
}
