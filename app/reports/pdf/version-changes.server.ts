import { envelopeVersionsOption } from "~/charts/comparisons";
import { formatChange } from "~/domain/comparisons";
import { ENVELOPE_EXTREMES, EXTREME_LABELS, type ReportComparison } from "~/domain/report-comparison";
import { STEPS } from "~/domain/steps";
import { shownChange } from "~/domain/input-fields";
import { formatNumber, fromSI, unitSystemWords, type UnitSystem } from "~/domain/units";
import { MUTED, utc, type Fmt, type Section, type Sym, type Writer } from "./layout.server";

const quantityOf = (k: string): "force" | "moment" => (k.startsWith("shear") ? "force" : "moment");

/** The report's section: what changed since the previous issued version (frozen in the snapshot at issue). */
export function versionChanges({ w, s, units, q, sym }: Section) {
  w.heading("Changes from the previous version");
  if (s.version === 1) {
    w.para("This is the first issued version of the report: there is no earlier version to compare with.", { color: MUTED });
    return;
  }
  if (!s.comparison) {
    w.para("This report was issued before the comparison with the previous version was part of the report.", { color: MUTED });
    return;
  }
  writeComparison(w, s.comparison, units, q, sym);
}

/**
 * A comparison of two versions: both named with their input hashes and engine versions, every input
 * that changed (step by step, field by field), the root's envelope extremes, the envelope at every
 * station with its change, and the shear and bending envelopes of both overlaid.
 */
export function writeComparison(w: Writer, c: ReportComparison, units: UnitSystem, q: Fmt, sym: Sym) {
  w.table(
    [
      { header: "", width: 70 },
      { header: "Report", width: 150 },
      { header: "Issued", width: 110 },
      { header: "Inputs (SHA-256, first 16)", width: 110 },
      { header: "Engine", width: 0 },
    ],
    [
      ["Earlier", `${c.from.reportNumber} v${c.from.version}`, utc(c.from.issuedAt), c.from.inputHash.slice(0, 16), c.from.engineVersion],
      ["Later", `${c.to.reportNumber} v${c.to.version}`, utc(c.to.issuedAt), c.to.inputHash.slice(0, 16), c.to.engineVersion],
    ],
    { size: 7.6, caption: "The two versions compared" },
  );
  w.subheading("Inputs that changed");
  if (!c.inputs.length) w.para("No input changed between the two versions.", { size: 8.6 });
  else {
    w.para(`Every stored input that differs, step by step and field by field, in ${unitSystemWords(units)}, converted from the stored SI values. Rows of load cases are matched by their id, other rows by position.`, { size: 8.4, color: MUTED });
    w.table(
      [
        { header: "Step", width: 64 },
        { header: "Field", width: 190 },
        { header: "Before", width: 125 },
        { header: "After", width: 0 },
      ],
      c.inputs.map((x) => {
        const shown = shownChange(x, units);
        return [STEPS.find((st) => st.key === x.step)?.label ?? x.step, shown.field, shown.before, shown.after];
      }),
      { size: 7.2, caption: `Changed inputs (${c.inputs.length})` },
    );
  }
  if (c.casesAdded.length || c.casesRemoved.length) {
    w.para(`Load cases added: ${c.casesAdded.join(", ") || "none"}. Load cases removed: ${c.casesRemoved.join(", ") || "none"}.`, { size: 8.4 });
  }
  const change = (k: string, before: number, after: number) => {
    if (!Number.isFinite(before)) return "—";
    const d = fromSI(units, quantityOf(k), after - before);
    return formatChange(d, fromSI(units, quantityOf(k), after));
  };
  const root = c.stations[0];
  if (root) {
    w.subheading("Root loads");
    w.table(
      [
        { header: "Envelope extreme at the root", width: 130 },
        { header: "Earlier", width: 80, align: "right" },
        { header: "Later", width: 80, align: "right" },
        { header: "Change", width: 70, align: "right" },
        { header: "Critical case (earlier / later)", width: 0 },
      ],
      ENVELOPE_EXTREMES.map((k) => [
        `${EXTREME_LABELS[k]} [${sym(quantityOf(k))}]`,
        q(quantityOf(k), root.before[k], 5),
        q(quantityOf(k), root.after[k], 5),
        change(k, root.before[k], root.after[k]),
        `${root.casesBefore[k]} / ${root.casesAfter[k]}`,
      ]),
      { size: 7.4, caption: "Root loads of the envelope, earlier and later version" },
    );
  }
  w.subheading("Envelope at each station");
  w.para(
    c.interpolated
      ? "The two versions have different output stations: the earlier envelope is read at the later version's stations by linear interpolation."
      : "Both versions have the same output stations. Each cell gives the later value and, below it, the change from the earlier.",
    { size: 8.4, color: MUTED },
  );
  w.table(
    [{ header: `y [${sym("length")}]`, width: 40, align: "right" }, ...ENVELOPE_EXTREMES.map((k) => ({ header: `${EXTREME_LABELS[k]} [${sym(quantityOf(k))}]`, width: k === "torsionMin" ? 0 : 76, align: "right" as const }))],
    c.stations.map((st) => [formatNumber(fromSI(units, "length", st.y), 4), ...ENVELOPE_EXTREMES.map((k) => `${q(quantityOf(k), st.after[k], 5)}\n${change(k, st.before[k], st.after[k])}`)]),
    { size: 6.8, caption: "Envelope extremes per station, later version and change" },
  );
  for (const kind of ["bending", "shear"] as const) {
    const quantity = kind === "shear" ? "force" : "moment";
    w.ensure(200);
    w.chart(envelopeVersionsOption(kind, c, { symbol: sym(quantity), scale: (v) => fromSI(units, quantity, v) }, units), 180);
  }
}
