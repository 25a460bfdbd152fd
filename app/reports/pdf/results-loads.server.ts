import { loadsOption, type LoadQuantity } from "~/charts/loads";
import { formatNumber, fromSI, type Quantity } from "~/domain/units";
import { attributionOf } from "~/exchange";
import { W, WARN, type Section } from "./layout.server";

/** Shear, bending and torsion: the envelope over every case with the critical case, by station and at the root. */
export function resultsLoads({ w, s, crit, units, q, sym }: Section) {
  const env = s.result.envelope;
  const F = sym("force");
  const Mo = sym("moment");
  w.subheading(`Shear, bending and torsion: envelope of all cases with the critical case ${crit.id}`, 240);
  const scaleOf = (qty: LoadQuantity) => {
    const quantity: Quantity = qty === "shear" ? "force" : "moment";
    return { symbol: sym(quantity), scale: (v: number) => fromSI(units, quantity, v) };
  };
  const h = 185;
  for (const qty of ["shear", "bending", "torsion"] as const) {
    w.ensure(h + 20);
    w.chart(loadsOption(qty, { y: env.map((e) => e.y), max: env.map((e) => e[`${qty}Max`]), min: env.map((e) => e[`${qty}Min`]), caseId: crit.id, caseValues: crit.stations?.map((st) => st[qty]) }, scaleOf(qty)), h);
  }
  if (!crit.stations) w.para("Station tables were left out of the stored results (summary output): the critical case is shown by its root loads only.", { size: 8.2, color: WARN });

  // The mass case of each extreme at the root: the envelope says which mass state (and, for a rolling case, which side) made it.
  const massCaseOf = new Map(s.exchange.cases.map((c) => [c.id, `${c.massCase ?? "all items full"}${c.flaps ? ", flaps" : ""}`]));
  const root = env[0];
  if (root) {
    w.table(
      [
        { header: "At the root", width: 56 },
        { header: "Maximum", width: 56, align: "right" },
        { header: "Case", width: 96 },
        { header: "Mass case", width: 58 },
        { header: "Minimum", width: 56, align: "right" },
        { header: "Case", width: 96 },
        { header: "Mass case", width: 0 },
      ],
      (["shear", "bending", "torsion"] as const).map((qty) => {
        const quantity: Quantity = qty === "shear" ? "force" : "moment";
        const max = root[`${qty}MaxCase`];
        const min = root[`${qty}MinCase`];
        return [`${qty[0]!.toUpperCase()}${qty.slice(1)} [${sym(quantity)}]`, q(quantity, root[`${qty}Max`]), max, massCaseOf.get(attributionOf(max).id) ?? "—", q(quantity, root[`${qty}Min`]), min, massCaseOf.get(attributionOf(min).id) ?? "—"];
      }),
      { size: 7.6, caption: "Root envelope with the case and the mass case that give each extreme" },
    );
  }

  const idW = Math.max(30, ...env.flatMap((e) => [e.shearMaxCase, e.shearMinCase, e.bendingMaxCase, e.bendingMinCase, e.torsionMaxCase, e.torsionMinCase].map((c) => w.widthOf(c, { size: 6.6 })))) + 6;
  const valW = (W - 34 - 6 * idW) / 6;
  w.table(
    [
      { header: `y [${sym("length")}]`, width: 34, align: "right" },
      ...(["Shear", "Bending", "Torsion"] as const).flatMap((name) => {
        const u = name === "Shear" ? F : Mo;
        return [
          { header: `${name} max [${u}]`, width: valW, align: "right" as const },
          { header: "case", width: idW },
          { header: `${name} min [${u}]`, width: valW, align: "right" as const },
          { header: "case", width: idW },
        ];
      }),
    ],
    env.map((e) => [
      q("length", e.y),
      q("force", e.shearMax),
      e.shearMaxCase,
      q("force", e.shearMin),
      e.shearMinCase,
      q("moment", e.bendingMax),
      e.bendingMaxCase,
      q("moment", e.bendingMin),
      e.bendingMinCase,
      q("moment", e.torsionMax),
      e.torsionMaxCase,
      q("moment", e.torsionMin),
      e.torsionMinCase,
    ]),
    { size: 6.6, caption: "Envelope by station with the case that gives each extreme" },
  );

  const sorted = [...s.result.cases].sort((a, b) => Math.abs(b.root.bending) - Math.abs(a.root.bending));
  w.table(
    [
      { header: "Case", width: 58 },
      { header: "Mass case", width: 52 },
      { header: "Mach", width: 34, align: "right" },
      { header: `Alt. [${sym("altitude")}]`, width: 38, align: "right" },
      { header: "CL [–]", width: 34, align: "right" },
      { header: "α [°]", width: 32, align: "right" },
      { header: "Critical Mach", width: 40, align: "right" },
      { header: "Regime", width: 50 },
      { header: `Root shear [${F}]`, width: 54, align: "right" },
      { header: `Root bending [${Mo}]`, width: 56, align: "right" },
      { header: `Root torsion [${Mo}]`, width: 0, align: "right" },
    ],
    sorted.map((c) => [
      c.id,
      massCaseOf.get(c.id) ?? "—",
      formatNumber(c.mach),
      q("altitude", c.altitude, 5),
      formatNumber(c.cl),
      formatNumber(c.alpha),
      formatNumber(c.machCritical),
      c.regime === "supercritical" ? "supercritical" : c.regime,
      q("force", c.root.shear),
      q("moment", c.root.bending),
      q("moment", c.root.torsion),
    ]),
    { size: 6.9, caption: "Root loads of every analysed case, by root bending magnitude", rowColor: (i) => (sorted[i]!.regime === "supercritical" ? WARN : undefined) },
  );
}
