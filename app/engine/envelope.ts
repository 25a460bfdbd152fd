/** Extremes of the internal loads at one station over all cases, with the case that gives each. */
export interface EnvelopeRow {
  y: number;
  shearMax: number;
  shearMaxCase: string;
  shearMin: number;
  shearMinCase: string;
  bendingMax: number;
  bendingMaxCase: string;
  bendingMin: number;
  bendingMinCase: string;
  torsionMax: number;
  torsionMaxCase: string;
  torsionMin: number;
  torsionMinCase: string;
}

const KINDS = ["shear", "bending", "torsion"] as const;

/** Running envelope over cases that share the same output stations. */
export interface EnvelopeAccumulator {
  y: number[];
  max: Record<(typeof KINDS)[number], Float64Array>;
  min: Record<(typeof KINDS)[number], Float64Array>;
  maxCase: Record<(typeof KINDS)[number], string[]>;
  minCase: Record<(typeof KINDS)[number], string[]>;
  count: number;
}

/** Start an empty envelope over output stations `y` (m). */
export function createEnvelope(y: readonly number[]): EnvelopeAccumulator {
  const n = y.length;
  const rec = (v: number) => ({ shear: new Float64Array(n).fill(v), bending: new Float64Array(n).fill(v), torsion: new Float64Array(n).fill(v) });
  const ids = () => ({ shear: new Array<string>(n).fill(""), bending: new Array<string>(n).fill(""), torsion: new Array<string>(n).fill("") });
  return { y: [...y], max: rec(-Infinity), min: rec(Infinity), maxCase: ids(), minCase: ids(), count: 0 };
}

/** Fold one case's station loads into the envelope; on ties the earlier case is kept. */
export function addToEnvelope(
  env: EnvelopeAccumulator,
  id: string,
  loads: { shear: ArrayLike<number>; bending: ArrayLike<number>; torsion: ArrayLike<number> },
): void {
  for (const k of KINDS) {
    const v = loads[k];
    const mx = env.max[k];
    const mn = env.min[k];
    for (let i = 0; i < env.y.length; i++) {
      if (v[i] > mx[i]) {
        mx[i] = v[i];
        env.maxCase[k][i] = id;
      }
      if (v[i] < mn[i]) {
        mn[i] = v[i];
        env.minCase[k][i] = id;
      }
    }
  }
  env.count++;
}

/** The envelope as plain rows (empty when no case was added). */
export function envelopeRows(env: EnvelopeAccumulator): EnvelopeRow[] {
  if (env.count === 0) return [];
  return env.y.map((y, i) => ({
    y,
    shearMax: env.max.shear[i],
    shearMaxCase: env.maxCase.shear[i],
    shearMin: env.min.shear[i],
    shearMinCase: env.minCase.shear[i],
    bendingMax: env.max.bending[i],
    bendingMaxCase: env.maxCase.bending[i],
    bendingMin: env.min.bending[i],
    bendingMinCase: env.minCase.bending[i],
    torsionMax: env.max.torsion[i],
    torsionMaxCase: env.maxCase.torsion[i],
    torsionMin: env.min.torsion[i],
    torsionMinCase: env.minCase.torsion[i],
  }));
}

/** Envelope of a list of cases with their station loads. */
export function loadEnvelope(
  cases: readonly { id: string; y: readonly number[]; shear: ArrayLike<number>; bending: ArrayLike<number>; torsion: ArrayLike<number> }[],
): EnvelopeRow[] {
  if (cases.length === 0) return [];
  const env = createEnvelope(cases[0].y);
  for (const c of cases) addToEnvelope(env, c.id, c);
  return envelopeRows(env);
}
