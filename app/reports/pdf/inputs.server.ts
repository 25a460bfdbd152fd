import { formatNumber } from "~/domain/units";
import { MUTED, type Column, type Section } from "./layout.server";
import { planformDrawing } from "./planform-drawing.server";

/** The inputs as signed: planform with its drawing and derived geometry, section data, load cases. */
export function inputs(section: Section) {
  const { w, s, q, sym, figures } = section;
  const p = s.inputs.planform;
  const L = sym("length");
  w.heading("Inputs", { newPage: true });
  w.subheading("Planform");
  w.table(
    [
      { header: "Station", width: 50 },
      { header: `y [${L}]`, width: 70, align: "right" },
      { header: `Leading edge x [${L}]`, width: 90, align: "right" },
      { header: `Chord [${L}]`, width: 80, align: "right" },
      { header: "Twist [°]", width: 70, align: "right" },
      { header: "", width: 0 },
    ],
    p.stations.map((st, i) => [`${i + 1}`, q("length", st.y), q("length", st.xLe), q("length", st.chord), formatNumber(st.twist), i === 0 ? "root" : i === p.stations.length - 1 ? "tip" : ""]),
    { size: 8 },
  );
  const g = figures.geometry;
  planformDrawing(section);
  w.subheading("Derived geometry");
  const cols2: Column[] = [
    { header: "Quantity", width: 160 },
    { header: "Value", width: 90, align: "right" },
    { header: "Quantity", width: 160 },
    { header: "Value", width: 0, align: "right" },
  ];
  const left: [string, string][] = [
    [`Wing area, both sides [${sym("area")}]`, q("area", g.area)],
    [`Span [${L}]`, q("length", g.span)],
    [`Semispan [${L}]`, q("length", g.semispan)],
    ["Aspect ratio [–]", formatNumber(g.aspectRatio)],
    ["Taper ratio (tip/root) [–]", formatNumber(g.taperRatio)],
  ];
  const right: [string, string][] = [
    [`Mean aerodynamic chord [${L}]`, q("length", g.mac)],
    [`MAC spanwise position y [${L}]`, q("length", g.yMac)],
    [`MAC leading edge x [${L}]`, q("length", g.xLeMac)],
    [`Mean geometric chord S/b [${L}]`, q("length", g.meanGeometricChord)],
    ["Reference axis, root / tip [chord]", `${formatNumber(p.axisRoot)} / ${formatNumber(p.axisTip)}`],
  ];
  w.table(cols2, left.map((l, i) => [...l, ...(right[i] ?? ["", ""])]), { size: 8 });
  w.table(
    [
      { header: "Panel", width: 50 },
      { header: `From y [${L}]`, width: 70, align: "right" },
      { header: `To y [${L}]`, width: 70, align: "right" },
      { header: `Area, one side [${sym("area")}]`, width: 90, align: "right" },
      { header: "Sweep LE [°]", width: 70, align: "right" },
      { header: "Sweep c/4 [°]", width: 70, align: "right" },
      { header: "Sweep TE [°]", width: 0, align: "right" },
    ],
    g.panels.map((pn, i) => [`${i + 1}`, q("length", pn.yInner), q("length", pn.yOuter), q("area", pn.area), formatNumber(pn.sweepLeDeg, 3), formatNumber(pn.sweepQuarterChordDeg, 3), formatNumber(pn.sweepTrailingEdgeDeg, 3)]),
    { size: 8, caption: "Panels between planform stations" },
  );

  w.subheading("Section data (incompressible, two-dimensional)");
  const sec = s.inputs.sections;
  w.table(
    [
      { header: `y [${L}]`, width: 70, align: "right" },
      { header: "Lift slope a0 [1/rad]", width: 90, align: "right" },
      { header: "Zero-lift angle αL0 [°]", width: 100, align: "right" },
      { header: "cm,ac [–]", width: 70, align: "right" },
      { header: "clmax [–]", width: 70, align: "right" },
      { header: "Cp,min [–]", width: 0, align: "right" },
    ],
    sec.rows.map((r) => [q("length", r.y), formatNumber(r.a0), formatNumber(r.alphaL0), formatNumber(r.cmAc), formatNumber(r.clMax), formatNumber(r.cpMin)]),
    { size: 8 },
  );
  if (sec.flaps) {
    const f = sec.flaps;
    w.para(
      `Flaps extended from y = ${q("length", f.yFrom)} to ${q("length", f.yTo)} ${L}: zero-lift angle changed by ${formatNumber(f.dAlphaL0)}°, cm,ac by ${formatNumber(f.dCmAc)}${f.clMax !== undefined ? `, flapped clmax ${formatNumber(f.clMax)}` : ""}; the cases marked "flaps" are solved on the wing with these sections.`,
      { size: 8.2 },
    );
  }
  if (sec.aileron) {
    const a = sec.aileron;
    w.para(
      `Aileron from y = ${q("length", a.yFrom)} to ${q("length", a.yTo)} ${L}: section lift ${formatNumber(a.dClPerDeg)} and moment about the quarter chord ${formatNumber(a.dCmPerDeg)} per degree of down-going deflection (strip theory, as entered at every Mach number), ${formatNumber(a.deltaAtVa)}° at VA; the rolling cases add these increments over its span, down-going on the loaded side and up-going on the other.`,
      { size: 8.2 },
    );
  }
  const src = sec.source;
  w.para(
    `Source of the section data: ${src.kind === "upload" ? `uploaded file ${src.filename ?? ""}${src.sha256 ? ` (SHA-256 ${src.sha256})` : ""}` : src.kind === "import" ? "imported exchange document" : "typed in the sections step"}. Values between section stations are interpolated linearly and held constant outside them.`,
    { size: 8.2, color: MUTED },
  );

  w.subheading("Load cases");
  const env = s.inputs.envelope;
  const disp = s.inputs.distribution.dispositions;
  const analysed = new Set(s.result.cases.map((c) => c.id));
  w.para(`${env.cases.length} load cases in the envelope step, ${s.result.cases.length} analysed. Weight is the whole aircraft; nz the limit load factor; cases given by angle of attack show α instead.`, { size: 8.2, color: MUTED });
  w.table(
    [
      { header: "Case", width: 66 },
      { header: "Kind", width: 84 },
      { header: "Mach", width: 34, align: "right" },
      { header: `Alt. [${sym("altitude")}]`, width: 36, align: "right" },
      { header: `EAS [${sym("speed")}]`, width: 32, align: "right" },
      { header: `Weight [${sym("force")}]`, width: 40, align: "right" },
      { header: "nz / α [–/°]", width: 42, align: "right" },
      { header: "Status", width: 50 },
      { header: "Rule it comes from", width: 0 },
    ],
    env.cases.map((c) => [
      c.id,
      c.flaps ? `${c.kind}, flaps` : c.roll ? `${c.kind}, ${formatNumber(c.roll.fraction * 100)} %${c.roll.aileron > 0 ? `, δ ${formatNumber(c.roll.aileron, 3)}°` : ""}` : c.kind,
      formatNumber(c.mach, 4),
      q("altitude", c.altitude, 5),
      // The speed of the case, which its rule text no longer carries (stored text is free of units).
      figures.eas?.[c.id] !== undefined ? q("speed", figures.eas[c.id]!, 4) : "—",
      c.weight !== undefined ? q("force", c.weight) : "—",
      c.alpha !== undefined ? `α ${formatNumber(c.alpha)}°` : formatNumber(c.nz),
      c.excluded ? "excluded" : disp[c.id]?.action === "exclude" ? "excluded (flag)" : disp[c.id] ? "justified (flag)" : analysed.has(c.id) ? "analysed" : "—",
      c.rule || "entered by hand",
    ]),
    { size: 6.9, caption: "Load cases of the envelope", rowColor: (i) => (env.cases[i]!.excluded || disp[env.cases[i]!.id]?.action === "exclude" ? MUTED : undefined) },
  );
}
