import { STEPS } from "~/domain/steps";
import { formatQuantity, unitsStatement } from "~/domain/units";
import { STEP_KEYS } from "~/domain/vocabulary";
import { reportDocuments } from "./documents.server";
import { ACCENT, BOTTOM, M, MUTED, PAGE, utc, W, type Section } from "./layout.server";

/** Standard gravity (m/s², exact by definition, CGPM 1901): a design mass as the weight the loads use. */
const G0 = 9.80665;

const STEP_LABEL: Record<string, string> = Object.fromEntries(STEPS.map((s) => [s.key, s.label]));

/** The cover: what the report is, of which case, from which revisions and inputs, and the caution. */
export function cover({ w, s, crit, units }: Section) {
  const b = s.inputs.basis;
  // The case's own masses, each with the weight it gives (the programme's aircraft line is free text).
  const massAndWeight = (kg: number) => `${formatQuantity(units, "mass", kg)} (${formatQuantity(units, "force", kg * G0)})`;
  const caseFile = reportDocuments(s)[0]!;
  const doc = w.doc;
  doc.rect(0, 0, PAGE.width, 6).fillColor(ACCENT).fill();
  w.text("Spanwright", M.left, 64, { size: 30, weight: 600, oneLine: true });
  w.text("Wing loads report", M.left, 102, { size: 12, color: MUTED, oneLine: true });
  w.text(s.organisation, M.left, 150, { size: 11, weight: 600, color: MUTED });
  w.text(s.case.title, M.left, 172, { size: 22, weight: 600, width: W, lineGap: 2 });
  w.y = Math.max(w.y, 200) + 6;
  w.text(`${s.case.reference} · ${s.programme.code} ${s.programme.name}`, M.left, w.y, { size: 11, color: MUTED });
  w.y += 6;
  if (s.case.description) w.para(s.case.description, { size: 9.5, color: MUTED });
  w.y += 14;
  w.facts([
    ["Report number", s.reportNumber],
    ["Version", `v${s.version}`],
    ["Issued", utc(s.issuedAt)],
    ["Organisation", s.organisation],
    ["Programme", `${s.programme.code} — ${s.programme.name}`],
    ["Aircraft", s.programme.aircraft],
    ["Case", `${s.case.reference} — ${s.case.title}`],
    ["Units", unitsStatement(units)],
    ["Design masses of this case", `MTOW ${massAndWeight(b.mtow)} · MZFW ${massAndWeight(b.mzfw)} · minimum ${massAndWeight(b.minWeight)}`],
    ["Input hash (SHA-256)", s.inputHash],
    ["Case document (attached)", `${caseFile.name}, SHA-256 ${caseFile.sha256}`],
    ["Engine version", `${s.engineVersion} (results ${s.result.engine}, ${s.result.schema})`],
    ["Load cases analysed", `${s.result.cases.length}`],
    ["Critical root bending", `${formatQuantity(units, "moment", crit.root.bending)} (case ${crit.id})`],
  ]);
  w.subheading("Step revisions this report is built from");
  const keys = [...STEP_KEYS.filter((k) => k in s.revisions), ...Object.keys(s.revisions).filter((k) => !(STEP_KEYS as readonly string[]).includes(k))];
  w.table(
    [
      { header: "Step", width: 0 },
      ...keys.map((k) => ({ header: STEP_LABEL[k] ?? k, width: 60, align: "right" as const })),
    ],
    [["Revision", ...keys.map((k) => `${s.revisions[k]}`)]],
    { size: 8.4, boldFirst: true },
  );
  const y = Math.max(w.y + 10, BOTTOM - 70);
  w.y = y;
  w.text(
    "This report sets out computed wing loads in support of the certification of the aircraft named above. It supports, and does not replace, what the certifying authority accepts; the applicable regulations and licensed engineering practice govern.",
    M.left,
    y,
    { size: 8.4, color: MUTED, lineGap: 1.4 },
  );
}
