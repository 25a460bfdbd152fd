import { formatNumber } from "~/domain/units";
import { MUTED, WARN, type Section } from "./layout.server";

const G0 = 9.80665;

/**
 * The masses the loads were computed with: the items of one semispan, each mass case with its weight,
 * centre of gravity, fill factors and what it puts on the wing, the balance inputs, and the balance of
 * every trimmed case (tail load and wing lift).
 */
export function massesAndBalance({ w, s, figures, q, sym }: Section) {
  const m = s.inputs.masses;
  const L = sym("length");
  const M = sym("mass");
  const F = sym("force");
  w.heading("Masses and balance");
  if (!m) {
    w.para("No masses were given: the loads carry no inertia relief, and every trimmed case puts its whole nz·W on the wing.", { size: 8.4 });
    return;
  }
  w.para(
    `Structural mass of one semispan ${q("mass", m.structureKg)} ${M}, spread in proportion to chord on the reference axis; ${m.items.length} mass item${m.items.length === 1 ? "" : "s"} of one semispan${m.source.kind === "csv" ? ` (item table from the file ${m.source.filename ?? ""})` : ""}. Every mass acts downward with nz·g·m and relieves shear and bending inboard of it; an item whose centre of gravity lies off the reference axis adds torsion (aft of the axis: nose up under positive nz), resolved about the axis like every other load.`,
    { size: 8.4 },
  );
  if (m.items.length) {
    w.table(
      [
        { header: "Item", width: 70 },
        { header: "Description", width: 0 },
        { header: `Mass [${M}]`, width: 56, align: "right" },
        { header: `x of CG [${L}]`, width: 56, align: "right" },
        { header: `y [${L}]`, width: 86, align: "right" },
      ],
      m.items.map((it) => [it.id, it.label || "—", q("mass", it.kg), q("length", it.x), it.y !== undefined ? `${q("length", it.y)} (point)` : `${q("length", it.yFrom!)} – ${q("length", it.yTo!)} (spread)`]),
      { size: 7.6, caption: "Mass items of one semispan (x from the origin of the leading edges, aft positive)" },
    );
  }
  const summaries = figures.masses?.cases ?? [];
  if (summaries.length) {
    w.table(
      [
        { header: "Mass case", width: 62 },
        { header: "Description", width: 0 },
        { header: `Weight [${M}]`, width: 50, align: "right" },
        { header: "CG [% MAC]", width: 44, align: "right" },
        { header: "Fill factors (others full)", width: 110 },
        { header: `Items, semispan [${M}]`, width: 56, align: "right" },
        { header: `Both wings [${M}]`, width: 52, align: "right" },
      ],
      summaries.map((c) => {
        const fill = m.massCases.find((x) => x.id === c.id)?.fill ?? {};
        const named = Object.entries(fill);
        return [
          c.id,
          c.label || "—",
          c.weight !== null ? q("mass", c.weight) : "—",
          c.cg !== null ? formatNumber(c.cg * 100, 3) : "—",
          named.length ? named.map(([id, f]) => `${id} ${formatNumber(f, 3)}`).join(", ") : "all full",
          q("mass", c.itemsKg),
          q("mass", c.wingKg),
        ];
      }),
      { size: 7.4, caption: "Mass cases: the aircraft's weight and centre of gravity, the fill of each item, the wing's own masses (structure and items)" },
    );
    const failed = summaries.flatMap((c) => c.checks.filter((k) => !k.ok).map((k) => `${c.id}: ${k.text}`));
    w.para(failed.length ? `Checks not met: ${failed.join("; ")}.` : "Every mass case lies within the basis (minimum design weight to MTOW), gives its centre of gravity, and weighs more than both wings with their items.", { size: 8.2, color: failed.length ? WARN : MUTED });
  }
  w.subheading("Balance of the trimmed cases");
  w.para(
    m.balance
      ? `Balancing tail load from pitching-moment equilibrium about the centre of gravity of each mass case: the wing's lift at its aerodynamic centre and its moment there (from the wing solution at the case's Mach number), the wing–body moment coefficient increment ${formatNumber(m.balance.cmBody)} on the wing area and MAC, and the tail arm ${q("length", m.balance.tailArm)} ${L} from the MAC quarter chord to the tail's aerodynamic centre. The wing carries nz·W − P. A gust case is balanced at 1 g (its increment is put on the wing, conservative for the wing); a tail load typed in the envelope step is kept as typed.`
      : "No balance inputs were given: the tail load of each trimmed case is 0 (or as typed in the envelope step) and the wing carries nz·W − P.",
    { size: 8.2, color: MUTED },
  );
  const rows = figures.masses?.balance ?? [];
  if (rows.length) {
    w.table(
      [
        { header: "Case", width: 70 },
        { header: "Kind", width: 50 },
        { header: "Mass case", width: 62 },
        { header: "nz [–]", width: 40, align: "right" },
        { header: `Weight [${F}]`, width: 56, align: "right" },
        { header: `Tail load P [${F}]`, width: 62, align: "right" },
        { header: `Wing lift [${F}]`, width: 62, align: "right" },
        { header: "Tail load from", width: 0 },
      ],
      rows.map((r) => [
        r.caseId,
        r.kind,
        r.massCase ?? "—",
        formatNumber(r.nz, 4),
        q("force", r.weight),
        q("force", r.tailLoad),
        q("force", r.wingLift),
        r.source === "typed" ? "typed" : r.source === "balance" ? `balance at ${formatNumber(r.balanceNz, 4)} g` : "none (0)",
      ]),
      { size: 6.9, caption: `Balance per case: tail load (up positive, whole aircraft) and wing lift (both sides); weights as masses × ${G0} m/s²` },
    );
  }
  if (figures.masses?.problem) w.para(figures.masses.problem, { size: 8.2, color: WARN });
}
