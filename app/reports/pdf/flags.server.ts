import type { Section } from "./layout.server";

/** Flagged cases with the engineer's disposition of each, then the assumptions and cautions of the results. */
export function flagsAndCautions({ w, s }: Section) {
  w.heading("Flagged cases and their dispositions");
  if (s.flags.length === 0) {
    w.para("No case was flagged: every analysed case is below its critical Mach number and no station exceeds its section clmax.");
  } else {
    w.para(`${s.flags.length} case${s.flags.length > 1 ? "s were" : " was"} flagged in the distribution step. Each carries the engineer's disposition: excluded from the loads, or kept with a written justification.`, { size: 8.4 });
    w.table(
      [
        { header: "Case", width: 60 },
        { header: "Why it was flagged", width: 210 },
        { header: "Disposition", width: 60 },
        { header: "Comment", width: 0 },
      ],
      s.flags.map((f) => [f.id, f.reasons.join("; "), f.action === "exclude" ? "excluded" : f.action === "justify" ? "kept, justified" : f.action, f.comment || "—"]),
      { size: 7.2 },
    );
  }
  w.heading("Assumptions and cautions");
  const rollNote = s.exchange.cases.some((c) => c.roll)
    ? "; the rolling cases take each side as a share of the symmetric airload plus the aileron's strip-theory increments, with the same inertia relief on both sides (no roll acceleration): a rational rolling analysis the authority accepts governs"
    : "";
  const flapsNote = s.exchange.cases.some((c) => c.flaps)
    ? "flaps up, and flaps extended where a case says so (the flap's section increments applied over its span as entered, one flap setting; the flap's own loads and its tracks are not part of the wing loads here)"
    : "flaps up";
  w.bullets([
    "These results support, and never replace, what the certifying authority accepts. The applicable regulations and licensed engineering practice govern; the engineer who signs remains responsible for the results and their use.",
    "The compressibility rules are subsonic rules: they are valid only below the critical Mach number. Cases at or above it are computed for completeness, marked supercritical and flagged; their loads are not a basis for substantiation without other evidence.",
    "Linear aerodynamics: lift is linear in angle of attack up to the section clmax; stations above clmax are flagged, and no stall redistribution is modelled.",
    s.inputs.masses?.items.length
      ? `Loads are limit loads about a straight reference axis, for a rigid wing, symmetric flight, ${flapsNote}${rollNote}. Inertia relief comes from the semispan structural mass spread in proportion to chord and from the mass items of the masses section, each scaled by its case's mass case; the wing carries nz·W less the balancing tail load of each case.`
      : `Loads are limit loads about a straight reference axis, for a rigid wing, symmetric flight, ${flapsNote}${rollNote}. Inertia relief comes only from the semispan structural mass spread in proportion to chord; engines, fuel and other point masses are not included unless they were folded into that mass.`,
    s.inputs.basis.category === "part25"
      ? "Gust loads of this transport aeroplane come from the tuned discrete gust of 14 CFR 25.341(a) on a rigid aircraft in plunge, with the wing's lift slope at each speed's Mach number (the tail's contribution is left to the engineer); the flexibility of the structure and the aircraft's pitching are left out. The dynamic gust analysis by the method the authority accepts governs."
      : "Gust loads come from the Pratt formula with the wing's lift slope at each speed's Mach number (the tail's contribution is left to the engineer).",
    "Section data are two-dimensional and incompressible as entered; their source and the planform are the engineer's responsibility and are recorded by revision and hash in this report.",
    "The input hash on every page identifies the exact exchange document the results were computed from; recomputing it with the same engine version reproduces these numbers.",
  ]);
}
