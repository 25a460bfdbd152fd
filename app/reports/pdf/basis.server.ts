import { CATEGORY_LABELS, RULE_LABELS, SPANWISE_LABELS } from "~/domain/vocabulary";
import { formatNumber, unitsStatement } from "~/domain/units";
import type { Section } from "./layout.server";

/** The certification basis of the case and what the report covers and does not. */
export function basisAndScope({ w, s, q, sym }: Section) {
  const b = s.inputs.basis;
  // The flaps-extended conditions are in the report where the basis gives VF and the sections the flapped span.
  const flaps = b.vf !== undefined && s.inputs.sections.flaps ? s.inputs.sections.flaps : null;
  const flapCases = s.exchange.cases.filter((c) => c.flaps).length;
  const rollCases = s.exchange.cases.filter((c) => c.roll).length;
  const part25 = b.category === "part25";
  w.heading("Certification basis and scope", { newPage: true });
  w.facts([
    ["Category", CATEGORY_LABELS[b.category]],
    ["Regulation references", b.regulations],
    ["Units of this report", unitsStatement(b.units)],
    ["Design weights", `MTOW ${q("mass", b.mtow)} ${sym("mass")} · MZFW ${q("mass", b.mzfw)} ${sym("mass")} · minimum ${q("mass", b.minWeight)} ${sym("mass")}`],
    ["Design speeds (EAS)", `VS1 ${q("speed", b.vs1)} · VA ${q("speed", b.va)} · VC ${q("speed", b.vc)} · VD ${q("speed", b.vd)} ${sym("speed")}`],
    ["Altitudes", `${b.altitudes.map((a) => q("altitude", a, 5)).join(", ")} ${sym("altitude")} (ISA)`],
    ["Wing reference area", `${q("area", b.wingArea)} ${sym("area")}`],
    ["Aircraft CLmax", `${formatNumber(b.clMax)} positive, ${formatNumber(b.clMaxNegative)} negative (flaps up)`],
    ...(flaps
      ? ([["Flaps extended", `VF ${q("speed", b.vf!)} ${sym("speed")} EAS, CLmax ${formatNumber(b.clMaxFlaps!)} with flaps; flapped span ${q("length", flaps.yFrom)}–${q("length", flaps.yTo)} ${sym("length")} (sections)`]] as [string, string][])
      : []),
    ["Method choice", `${RULE_LABELS[s.inputs.envelope.compressibility]}; ${SPANWISE_LABELS[s.inputs.envelope.spanwise]}${s.result.method?.strips ? `, ${s.result.method.strips} strips` : ""}, ${s.inputs.envelope.stations} output stations per semispan`],
    ["Semispan structural mass", `${q("mass", s.inputs.masses?.structureKg ?? s.inputs.loads.semispanMass ?? 0)} ${sym("mass")} (inertia relief), ${s.inputs.masses?.items.length ?? 0} mass items, ${s.inputs.masses?.massCases.length ?? 0} mass cases`],
  ]);
  w.subheading("Scope");
  w.para(
    `This report covers the wing loads of case ${s.case.reference}: the spanwise lift and pitching-moment distributions, corrected for compressibility, and the shear force, bending moment and torsion about the wing reference axis along the semispan for every load case of the manoeuvre and gust envelope listed in section 3, with their envelope. Loads are limit loads (no factor of safety applied) for the symmetric conditions given: flaps up${flapCases ? `, and flaps extended in ${flapCases} case${flapCases > 1 ? "s" : ""} (${b.category === "part25" ? "14 CFR 25.345(a)" : "14 CFR 23.345(a)"}: n = 2.0 up to VF and gusts of 25 ft/s EAS at VF, solved on the wing with the flapped sections over the flapped span)` : ""}${rollCases ? `; and ${rollCases} rolling and unsymmetrical case${rollCases > 1 ? "s" : ""} (${part25 ? "14 CFR 25.349(a): 2/3·n1 at VA, VC and VD with the aileron deflections of the rule" : "14 CFR 23.349 and 23.455: a share of the airload on one side in condition A, and 2/3·n1 at VA, VC and VD with the aileron deflections of 23.455 and the Δcm of 23.349(b)"}; paragraphs from memory), each analysed on both sides — the loaded side with the full airload and the down-going aileron, the other with its share and the up-going aileron — by the simplified method: the aileron's lift by strip theory and its moment as entered, both sides with the same inertia relief` : ""}.`,
  );
  const items = s.inputs.masses?.items.length ?? 0;
  w.para(
    `It does not cover: the fuselage, tail or control surfaces; ${rollCases ? "in the rolling cases, the inertia of the roll acceleration, the wing's flexibility (aileron reversal and loss of effectiveness), the spanwise carry-over of the aileron's lift beyond strip theory and any compressibility correction of the aileron increments, and the aileron's own hinge and support loads; yawing, unsymmetrical gust (25.349(b)) or ground conditions" : "asymmetric, rolling, yawing or ground conditions"}; ${flapCases ? "flap settings other than the one whose section increments are given, the flaps' own loads and the flap-track loads, slats and spoilers" : "high-lift devices (no flaps-extended case was analysed)"}; ${items ? "" : "engine, fuel and landing-gear point loads other than the distributed structural mass; "}aeroelastic effects, the dynamic gust response of the flexible aircraft${s.inputs.basis.category === "part25" ? " (the tuned gust is computed on the rigid aircraft in plunge)" : ""}, flutter, fatigue or damage tolerance; stress analysis or the strength of the structure; transonic or supercritical flow.`,
  );
}
