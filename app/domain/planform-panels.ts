/**
 * Panel-wise planform entry: each panel is given by its span along the panel (as drawings state it),
 * root and tip chord, leading-edge sweep, dihedral and tip twist, and becomes one more station.
 * Dihedral projects the panel span onto the plane of the wing reference (Δy = span·cos Γ); the
 * loads are computed on that projected planform.
 */
export interface PanelInput {
  span: number;
  rootChord: number;
  tipChord: number;
  sweepLeDeg: number;
  dihedralDeg: number;
  tipTwistDeg: number;
}

export interface StationRow {
  y: number;
  xLe: number;
  chord: number;
  twist: number;
}

const DEG = Math.PI / 180;

export function panelsToStations(rootTwistDeg: number, panels: readonly PanelInput[]): StationRow[] {
  const out: StationRow[] = [{ y: 0, xLe: 0, chord: panels[0]?.rootChord ?? 0, twist: rootTwistDeg }];
  for (const p of panels) {
    const last = out[out.length - 1]!;
    const dy = p.span * Math.cos(p.dihedralDeg * DEG);
    out.push({ y: last.y + dy, xLe: last.xLe + dy * Math.tan(p.sweepLeDeg * DEG), chord: p.tipChord, twist: p.tipTwistDeg });
  }
  return out;
}
