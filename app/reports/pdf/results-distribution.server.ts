import { clOption, loadingOption, machCriticalOption, rulesOption } from "~/charts/distribution";
import { RULE_LABELS } from "~/domain/vocabulary";
import { formatNumber } from "~/domain/units";
import type { Section } from "./layout.server";

/** The spanwise distributions of the critical case under the case's rule, and the three rules side by side. */
export function resultsDistribution({ w, figures, crit, q, sym }: Section) {
  const d = figures.critical;
  // Heading, introduction and the first chart stay together.
  w.subheading(`Spanwise distributions of the critical case ${crit.id}`, 260);
  w.para(
    `Critical case: the largest root bending moment magnitude over all analysed cases. Mach ${formatNumber(d.mach)}, altitude ${q("altitude", d.altitude, 5)} ${sym("altitude")}, CL ${formatNumber(d.CL)}, root-chord α ${formatNumber(d.alphaDeg)}°, critical Mach number ${formatNumber(d.machCritical)} (${d.regime}). Rule in use: ${RULE_LABELS[d.rule]}.`,
    { size: 8.4 },
  );
  const h = 178;
  for (const option of [loadingOption(d), clOption(d), rulesOption(d, "cl"), rulesOption(d, "cm"), machCriticalOption(d)]) {
    w.ensure(h + 20);
    w.chart(option, h);
  }
  w.table(
    [
      { header: "Rule", width: 150 },
      { header: "CL [–]", width: 70, align: "right" },
      { header: "Wing lift slope [1/rad]", width: 110, align: "right" },
      { header: "Critical Mach [–]", width: 0, align: "right" },
    ],
    d.rules.map((r) => [RULE_LABELS[r.rule], formatNumber(r.CL), formatNumber(r.clAlpha), formatNumber(r.machCritical)]),
    { size: 7.8, caption: `The three compressibility rules at the critical case ${crit.id}` },
  );
}
