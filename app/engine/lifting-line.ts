import { EngineError } from "./errors";
import { factorDense } from "./linear-solve";
import type { SectionAt, WingStation } from "./planform";
import { validateStations, wingGeometry } from "./planform";
import type { SpanwiseOptions, SpanwiseResult, SpanwiseSystem } from "./spanwise";
import { checkMach, compressibleSectionAt } from "./spanwise";
import type { CompressibleSection } from "./spanwise";

/** Default number of odd Fourier terms per semispan. */
export const LIFTING_LINE_DEFAULT_TERMS = 80;
/**
 * Largest quarter-chord sweep (deg, either way) the lifting line accepts. It does not model sweep:
 * at 15° it over-states the lift slope by about 1–2.5 % more than on the unswept wing (against
 * DATCOM's swept-wing slope), at 25° by 4–6 % more and at 35–45° by 12–30 %; the vortex lattice
 * models sweep. Below 10° the effect stays under 1 %, between 10° and 15° a warning says so.
 */
export const LIFTING_LINE_MAX_SWEEP_DEG = 15;
export const LIFTING_LINE_WARN_SWEEP_DEG = 10;

/** Extra results of a lifting-line solve. */
export interface LiftingLineResult extends SpanwiseResult {
  /** Odd Fourier coefficients A1, A3, … (Γ = 2bV Σ An sin nθ). */
  coefficients: number[];
  /** Induced-drag factor δ = Σ_{n≥3} n(An/A1)², span efficiency e = 1/(1+δ). */
  delta: number;
  spanEfficiency: number;
}

/**
 * Prandtl lifting line by Glauert's Fourier series for a symmetric load: odd terms n = 1…2N−1,
 * collocation θi = iπ/(2N) on one semispan (y = s·cos θ). Monoplane equation per station
 * Σ An sin nθ [4b/(a c) + n/sin θ] = α_eff(θ), with a the rule-scaled section slope — for the
 * lifting line the Göthert transformation is identical to using a0/β on the real planform.
 * Valid for unswept or slightly swept wings of moderate to high aspect ratio.
 * @throws EngineError (field method.spanwise) when a panel's quarter-chord sweep exceeds LIFTING_LINE_MAX_SWEEP_DEG.
 */
export function buildLiftingLine(
  stations: readonly WingStation[],
  opts: SpanwiseOptions,
): SpanwiseSystem & { solveDetailed(rhs: (s: SectionAt) => number): LiftingLineResult } {
  validateStations(stations);
  const beta = checkMach(opts.mach);
  const N = opts.resolution ?? LIFTING_LINE_DEFAULT_TERMS;
  if (!Number.isInteger(N) || N < 2 || N > 2000) {
    throw new EngineError("invalid-argument", "must be a whole number from 2 to 2000", "resolution");
  }
  const g = wingGeometry(stations);
  g.panels.forEach((p, i) => {
    if (Math.abs(p.sweepQuarterChordDeg) > LIFTING_LINE_MAX_SWEEP_DEG) {
      throw new EngineError(
        "invalid-argument",
        `the lifting line does not model sweep and is limited to ${LIFTING_LINE_MAX_SWEEP_DEG}° of quarter-chord sweep; panel ${i + 1} (y = ${p.yInner}–${p.yOuter} m) is swept ${p.sweepQuarterChordDeg.toFixed(1)}°: use "vortex-lattice"`,
        "method.spanwise",
      );
    }
  });
  const b = g.span;
  const s = g.semispan;
  const theta: number[] = [];
  const secs: CompressibleSection[] = [];
  const A = new Float64Array(N * N);
  for (let i = 0; i < N; i++) {
    const th = ((i + 1) * Math.PI) / (2 * N);
    theta.push(th);
    const sec = compressibleSectionAt(stations, Math.max(0, s * Math.cos(th)), opts.rule, opts.mach);
    secs.push(sec);
    const st = Math.sin(th);
    const mu = (4 * b) / (sec.a * sec.chord);
    for (let j = 0; j < N; j++) {
      const n = 2 * j + 1;
      A[i * N + j] = Math.sin(n * th) * (mu + n / st);
    }
  }
  const system = (opts.denseSolver ?? factorDense)(A, N);
  const solveDetailed = (rhs: (sec: SectionAt) => number): LiftingLineResult => {
    const coefficients = Array.from(system.solve(secs.map((sec) => rhs(sec))));
    const CL = Math.PI * g.aspectRatio * coefficients[0];
    let delta = 0;
    for (let j = 1; j < N; j++) delta += (2 * j + 1) * (coefficients[j] / coefficients[0]) ** 2;
    const cclAt = (y: number) => {
      const th = Math.acos(Math.min(1, Math.max(0, y / s)));
      let sum = 0;
      for (let j = 0; j < N; j++) sum += coefficients[j] * Math.sin((2 * j + 1) * th);
      return 4 * b * sum;
    };
    return { CL, cclAt, coefficients, delta, spanEfficiency: 1 / (1 + delta) };
  };
  return {
    method: "lifting-line",
    mach: opts.mach,
    beta,
    breakpoints: stations.map((st) => st.y),
    solve: solveDetailed,
    solveMany: (list) => list.map(solveDetailed),
    solveDetailed,
  };
}
