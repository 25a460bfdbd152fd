import { vnOption } from "~/charts/vn";
import { formatNumber, fromSI } from "~/domain/units";
import { MUTED, type Section } from "./layout.server";

const G0 = 9.80665;

/** The V–n diagram of the first design weight and altitude, with its corner and gust points. */
export function resultsVn({ w, s, figures, units, q, sym }: Section) {
  const b = s.inputs.basis;
  const { set, count } = figures.vn;
  // Heading, V–n caption and chart stay together.
  w.heading("Results", { keep: 320 });
  w.chart(vnOption(`V–n diagram, ${set.label}`, set.points, { area: b.wingArea, clMax: b.clMax, clMaxNegative: b.clMaxNegative, weightN: set.weightKg * G0, clMaxFlaps: set.flaps?.clMax }, { symbol: sym("speed"), fromSI: (v) => fromSI(units, "speed", v) }), 250);
  w.para(
    `Gust velocities ${q("speed", set.gustAtVc)} ${sym("speed")} at VC and ${q("speed", set.gustAtVd)} ${sym("speed")} at VD (${set.gustRule}); airplane lift slope ${formatNumber(set.liftSlope)} /rad from the spanwise solver at the VC Mach number (wing alone). ${set.flaps ? `Flaps extended (points flaps-…): n = 2.0 up to VF ${q("speed", set.flaps.vf)} ${sym("speed")} and gusts of 25 ft/s EAS at VF, lift slope of the flapped wing ${formatNumber(set.flaps.liftSlope)} /rad at the VF Mach number. ` : ""}${set.points.some((p) => p.roll) ? `Rolling conditions (diamonds, ${set.points.filter((p) => p.roll).map((p) => p.name).join(", ")}): each analysed on both sides, the share of the airload on the other side and the aileron deflection in the load-case table. ` : ""}${count} weight and altitude combinations in all; the others are in the load-case table.`,
    { size: 8.2, color: MUTED },
  );
  w.table(
    [
      { header: "Point", width: 56 },
      { header: `VEAS [${sym("speed")}]`, width: 64, align: "right" },
      { header: "nz [–]", width: 54, align: "right" },
      { header: "Rule", width: 0 },
    ],
    set.points.map((pt) => [pt.name, q("speed", pt.veas), formatNumber(pt.nz), pt.rule]),
    { size: 7.6, caption: `Corner and gust points, ${set.label}` },
  );
}
