import type { CaseResult } from "./schema";

function cell(v: string | number): string {
  if (typeof v === "number") return String(v);
  return /[",\n\r]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/**
 * Station tables of every case as CSV (RFC 4180 quoting): case, y, chord, cl, cm, lift, shear, bending, torsion.
 * Units as in the result: m, N/m, N, N·m.
 */
export function resultToCsv(result: CaseResult): string {
  const lines = ["case,y,chord,cl,cm,lift,shear,bending,torsion"];
  for (const c of result.cases) {
    for (const s of c.stations ?? []) {
      lines.push([c.id, s.y, s.chord, s.cl, s.cm, s.lift, s.shear, s.bending, s.torsion].map(cell).join(","));
    }
  }
  return lines.join("\n") + "\n";
}
