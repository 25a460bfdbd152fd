import { gustHistoryOption, tunedGustOption } from "~/charts/gust";
import { formatNumber, fromSI } from "~/domain/units";
import { MUTED, type Section } from "./layout.server";

/**
 * The tuned discrete gust of 14 CFR 25.341(a) on the rigid aircraft in plunge: for every design weight,
 * altitude and gust speed the mass ratio, Pratt's factor, the critical gradient and its Δn beside Pratt's,
 * then the figures of the most severe one (Δn against gradient, the response at the critical gradient).
 */
export function resultsGust(section: Section) {
  const { w, figures, units, q, sym } = section;
  const sets = figures.gusts ?? [];
  const rows = sets.flatMap((set) => (set.tuned ?? []).map((t) => ({ set, t })));
  if (rows.length === 0) {
    prattGust(section);
    return;
  }
  const L = sym("length");
  const V = sym("speed");
  w.subheading("Tuned discrete gust (14 CFR 25.341(a)), rigid aircraft in plunge", 260);
  w.para(
    "For each design weight and altitude and each of VB (where given), VC and VD, the 1-cos gust of gradient H from 30 to 350 ft with U_ds = U_ref·F_g·(H/350 ft)^(1/6) meets the rigid aircraft free to plunge, its lift building up by Küssner's function (gust entry) and Wagner's (the aircraft's own motion), in R. T. Jones's exponential approximations. The peak incremental load factor at the critical gradient gives the load cases tuned±; Pratt's formula with the same gust is shown beside it. The model leaves out the flexibility of the structure, the aircraft's pitching and the tail's own lift, compressibility and finite span in the lift build-up: the dynamic gust analysis the certifying authority accepts governs.",
    { size: 8.2, color: MUTED },
  );
  w.table(
    [
      { header: "Weight and altitude", width: 0 },
      { header: "Speed", width: 32 },
      { header: `EAS [${V}]`, width: 44, align: "right" },
      { header: "μ [–]", width: 40, align: "right" },
      { header: "Pratt K_g [–]", width: 46, align: "right" },
      { header: `Critical H [${L}]`, width: 52, align: "right" },
      { header: `U_ds [${V}]`, width: 44, align: "right" },
      { header: "Δn [–]", width: 42, align: "right" },
      { header: "Δn Pratt [–]", width: 46, align: "right" },
    ],
    rows.map(({ set, t }) => {
      const c = t.result.critical;
      return [set.label, t.speed, q("speed", t.veas), formatNumber(t.result.massRatio, 4), formatNumber(t.result.prattKg, 4), q("length", c.gradient), q("speed", c.uds), formatNumber(c.deltaN, 4), formatNumber(c.prattDeltaN, 4)];
    }),
    { size: 6.9, caption: "Tuned discrete gust per design weight, altitude and speed: the critical gradient and its peak load factor increment" },
  );
  const worst = rows.reduce((a, b) => (b.t.result.critical.deltaN > a.t.result.critical.deltaN ? b : a));
  const length = { symbol: L, fromSI: (m: number) => fromSI(units, "length", m) };
  const h = 190;
  w.ensure(h + 30);
  w.chart(tunedGustOption(`Peak Δn against gust gradient: ${worst.set.label}, ${worst.t.speed}`, worst.t.result, length), h);
  w.ensure(h + 30);
  w.chart(gustHistoryOption(`Response at the critical gradient: ${worst.set.label}, ${worst.t.speed}`, worst.t.history), h);
  w.para(
    `The most severe of the table: ${worst.set.label} at ${worst.t.speed}, H = ${q("length", worst.t.result.critical.gradient)} ${L} (${formatNumber(worst.t.result.critical.gradientChords, 3)} mean chords), Δn = ${formatNumber(worst.t.result.critical.deltaN, 4)}. ${worst.t.result.method}.`,
    { size: 8.2, color: MUTED },
  );
}

/**
 * Where Pratt's formula gives the gust cases (Part 23): its alleviation factor beside the rigid plunge
 * response to the 1-cos gust 25 mean chords long from which it was derived (NACA Report 1206), for every
 * design weight and altitude, with the response of the first drawn.
 */
function prattGust({ w, figures }: Section) {
  const sets = (figures.gusts ?? []).filter((g) => g.pratt);
  if (sets.length === 0) return;
  w.subheading("Gust response beside Pratt's formula", 260);
  w.para(
    "The gust cases of this basis come from Pratt's formula, whose alleviation factor K_g = 0.88μ/(5.3 + μ) was fitted to the peak response of a rigid aircraft in plunge to a one-minus-cosine gust 25 mean chords long (NACA Report 1206). The same response is computed here for each design weight and altitude (lift build-up by Küssner's and Wagner's functions in R. T. Jones's exponential approximations), as a check of the factor the cases use. Flexibility, pitching and the tail's own lift are left out; the authority's accepted method governs.",
    { size: 8.2, color: MUTED },
  );
  w.table(
    [
      { header: "Weight and altitude", width: 0 },
      { header: "μ [–]", width: 56, align: "right" },
      { header: "Pratt K_g [–]", width: 64, align: "right" },
      { header: "Plunge response K [–]", width: 84, align: "right" },
      { header: "Peak at [chords]", width: 64, align: "right" },
    ],
    sets.map((g) => [g.label, formatNumber(g.pratt!.massRatio, 4), formatNumber(g.pratt!.prattKg, 4), formatNumber(g.pratt!.k, 4), formatNumber(g.pratt!.sAtPeak / 2, 3)]),
    { size: 7.2, caption: "Peak load factor over its sharp-edged value: Pratt's factor and the rigid plunge response, 1-cos gust 25 mean chords long" },
  );
  const first = sets[0]!;
  const h = 190;
  w.ensure(h + 30);
  w.chart(gustHistoryOption(`Response to the 25-chord 1-cos gust: ${first.label}`, first.pratt!.history), h);
}
