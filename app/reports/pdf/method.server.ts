import { METHOD_STATEMENT as METHODS, methodUsedLines } from "~/domain/method-statement";
import { axisConvention, referenceAxisOf } from "~/domain/planform-panels";
import { RULE_LABELS, SPANWISE_LABELS } from "~/domain/vocabulary";
import type { Section } from "./layout.server";

const VALIDITY: [string, string, string][] = [
  ["Prandtl–Glauert / Göthert", "Linearised subsonic flow", "M below the critical Mach number; thin sections, small angles"],
  ["Kármán–Tsien", "Tangent-gas hodograph correction", "M below the critical Mach number; not for the spanwise solve"],
  ["Laitone", "Local-Mach correction of Prandtl–Glauert", "M below the critical Mach number; singular fallback to Prandtl–Glauert"],
  ["Cp* (isentropic, γ = 1.4)", "Sonic pressure coefficient", "Defines the critical Mach number; perfect gas"],
  ["Lifting line", "Glauert Fourier series", "Quarter-chord sweep up to 15° (refused beyond), moderate to high aspect ratio"],
  ["Vortex lattice", "Horseshoe vortices, 3/4-chord control points", "Attached flow, linear lift range; swept, tapered, cranked planforms"],
  ["Schrenk", "Mean of chord and ellipse", "Cross-check of the spanwise loading only; unswept wings"],
  ["Pratt gust formula", "Alleviated sharp-edged gust (NACA TN 2964)", "Part 23 gust loads; Part 25 preliminary only (25.341(a) asks for a dynamic analysis)"],
];

/** The published methods behind the results and where each stops being valid. */
export function methodStatement({ w, s }: Section) {
  w.heading("Method statement");
  w.para(
    `Published methods only. This case was computed with ${RULE_LABELS[s.inputs.envelope.compressibility]} for the sections and the ${SPANWISE_LABELS[s.inputs.envelope.spanwise].toLowerCase()} for the span, engine version ${s.engineVersion}. The three compressibility rules are shown side by side for the critical case.`,
  );
  for (const m of METHODS) {
    w.subheading(m.title);
    w.bullets(m.body, { size: 8.6 });
  }
  // What this case's result used (snapshots from before engine 0.3.0 carry no method block).
  w.subheading("As computed for this case");
  w.para(axisConvention(referenceAxisOf(s.inputs.planform)));
  if (s.result.method) w.facts(methodUsedLines(s.result.method));
  w.table(
    [
      { header: "Method", width: 120 },
      { header: "Basis", width: 150 },
      { header: "Validity limit", width: 0 },
    ],
    VALIDITY.map((r) => [...r]),
    { caption: "Validity limits of the methods used", size: 7.8 },
  );
}
