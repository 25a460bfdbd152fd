import { spanwiseWaysOption } from "~/charts/comparisons";
import { formatChange, formatPercent, ROOT_LOADS, SPANWISE_WAY_LABELS, type RootLoads } from "~/domain/comparisons";
import { RULE_LABELS } from "~/domain/vocabulary";
import { formatNumber, fromSI } from "~/domain/units";
import { MUTED, WARN, type Section } from "./layout.server";

const quantityOf = (q: keyof RootLoads): "force" | "moment" => (q === "shear" ? "force" : "moment");

/** The critical cases' root loads under each of the three compressibility rules, with the spread between them. */
export function ruleSensitivity({ w, s, units, q, sym }: Section) {
  const r = s.sensitivity;
  w.heading("Sensitivity to the compressibility rule");
  if (!r) {
    w.para("This report was issued before the rule sensitivity was part of the report.", { color: MUTED });
    return;
  }
  w.para(
    `The root loads of the critical cases (those giving the largest and smallest root shear, bending and torsion of the envelope) under each of the three compressibility rules. The case's results use ${RULE_LABELS[r.chosen]}; the spread is the largest minus the smallest value of the three, in per cent of the largest magnitude. A large spread says the results lean on the choice of rule, usually near the critical Mach number. ${r.basis}`,
    { size: 8.6 },
  );
  const display = (k: keyof RootLoads, si: number) => fromSI(units, quantityOf(k), si);
  const rows: string[][] = [];
  const tone: (string | undefined)[] = [];
  for (const c of r.cases) {
    c.rules.forEach((x, i) => {
      rows.push([
        i === 0 ? `${c.id} (${c.gives.join(", ")}; Mach ${formatNumber(c.mach)})` : "",
        `${RULE_LABELS[x.rule]}${x.rule === r.chosen ? " (in use)" : ""}`,
        ...ROOT_LOADS.map((k) => q(quantityOf(k), x.root[k], 5)),
        `${formatNumber(x.machCritical)}${x.regime === "supercritical" ? " (below the case Mach)" : ""}`,
      ]);
      tone.push(x.regime === "supercritical" ? WARN : undefined);
    });
    rows.push([
      "",
      "Spread",
      ...ROOT_LOADS.map((k) => `${formatChange(display(k, c.spread[k]), Math.max(...c.rules.map((x) => Math.abs(display(k, x.root[k]))))).replace("+", "")} (${formatPercent(c.relative[k])})`),
      "",
    ]);
    tone.push(MUTED);
  }
  w.table(
    [
      { header: "Critical case", width: 112 },
      { header: "Rule", width: 118 },
      { header: `Root shear [${sym("force")}]`, width: 68, align: "right" },
      { header: `Root bending [${sym("moment")}]`, width: 72, align: "right" },
      { header: `Root torsion [${sym("moment")}]`, width: 70, align: "right" },
      { header: "Critical Mach [–]", width: 0, align: "right" },
    ],
    rows,
    { size: 7.2, caption: "Root loads of the critical cases under each compressibility rule", rowColor: (i) => tone[i] },
  );
}

/** The critical cases by the vortex lattice, the lifting line and Schrenk's approximation where each is valid. */
export function spanwiseMethods({ w, s, crit, units, q, sym }: Section) {
  const all = s.spanwise;
  w.heading("Spanwise methods compared");
  if (!all?.length) {
    w.para("This report was issued before the comparison of spanwise methods was part of the report.", { color: MUTED });
    return;
  }
  const chosen = all[0]!.chosen;
  w.para(
    `The critical cases again by the vortex lattice, the lifting line and Schrenk's approximation, each where it is valid, beside the ${SPANWISE_WAY_LABELS[chosen].toLowerCase()} the results use. Both solvers run at the case's Mach number under its compressibility rule; a case given by angle of attack carries each solver's own lift. Schrenk's approximation (NACA TM 948) carries the lift of the method in use, at the quarter chord, with the same section moments and inertia relief; its basic loading is that of the incompressible sections. Differences are from the method in use.`,
    { size: 8.6 },
  );
  const shown = all.find((c) => c.caseId === crit.id) ?? all[0]!;
  w.ensure(210);
  w.chart(spanwiseWaysOption(shown, { symbol: sym("runningLoad"), scale: (v) => fromSI(units, "runningLoad", v) }, units), 185);
  const absent = new Map<string, string>();
  const rows: string[][] = [];
  for (const c of all) {
    const base = c.ways.find((x) => x.way === c.chosen);
    c.ways.forEach((x, i) => {
      const label = i === 0 ? `${c.caseId} (Mach ${formatNumber(c.mach)})` : "";
      if (!x.valid) {
        absent.set(x.way, x.reason);
        rows.push([label, SPANWISE_WAY_LABELS[x.way], "not valid here", "", "", ""]);
        return;
      }
      const cell = (k: keyof RootLoads) => {
        const v = q(quantityOf(k), x.root[k], 5);
        if (x.way === c.chosen || !base?.valid) return v;
        const d = x.root[k] - base.root[k];
        const ref = fromSI(units, quantityOf(k), base.root[k]);
        return `${v} (${formatChange(fromSI(units, quantityOf(k), d), ref)}, ${formatPercent(base.root[k] !== 0 ? d / Math.abs(base.root[k]) : 0)})`;
      };
      rows.push([label, `${SPANWISE_WAY_LABELS[x.way]}${x.way === c.chosen ? " (in use)" : ""}`, formatNumber(x.CL), cell("shear"), cell("bending"), cell("torsion")]);
    });
  }
  w.table(
    [
      { header: "Critical case", width: 82 },
      { header: "Method", width: 92 },
      { header: "CL [–]", width: 34, align: "right" },
      { header: `Root shear [${sym("force")}] (change)`, width: 0, align: "right" },
      { header: `Root bending [${sym("moment")}] (change)`, width: 112, align: "right" },
      { header: `Root torsion [${sym("moment")}] (change)`, width: 104, align: "right" },
    ],
    rows,
    { size: 7, caption: "Root loads of the critical cases by spanwise method" },
  );
  for (const [way, reason] of absent) w.para(`${SPANWISE_WAY_LABELS[way as keyof typeof SPANWISE_WAY_LABELS]} is not shown: ${reason}.`, { size: 8.4, color: WARN });
}
