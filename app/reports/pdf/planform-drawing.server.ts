import { formatNumber, formatQuantity } from "~/domain/units";
import { ACCENT, INK, M, MUTED, W, type Section } from "./layout.server";

/** The semispan drawn to scale with pdfkit paths: outline, stations, MAC, reference axis, scale bar. */
export function planformDrawing({ w, s, figures }: Section) {
  const p = s.inputs.planform;
  const g = figures.geometry;
  const doc = w.doc;
  const st = p.stations;
  const span = g.semispan;
  const xMin = Math.min(...st.map((t) => t.xLe));
  const xMax = Math.max(...st.map((t) => t.xLe + t.chord));
  const boxW = W - 20;
  const maxH = 170;
  const scale = Math.min(boxW / span, maxH / (xMax - xMin));
  const height = (xMax - xMin) * scale;
  w.ensure(height + 58);
  const top = w.y + 14;
  const left = M.left + 10;
  const X = (y: number) => left + y * scale;
  const Y = (x: number) => top + (x - xMin) * scale;
  w.text(`Semispan planform to scale (1 : ${formatNumber(1000 / ((scale * 25.4) / 72), 3)} at print size), x aft, y outboard`, M.left, w.y, { size: 8, weight: 600, color: MUTED, oneLine: true });
  // Outline: leading edge root to tip, tip chord, trailing edge back to the root.
  doc.moveTo(X(st[0]!.y), Y(st[0]!.xLe));
  for (const t of st.slice(1)) doc.lineTo(X(t.y), Y(t.xLe));
  for (const t of [...st].reverse()) doc.lineTo(X(t.y), Y(t.xLe + t.chord));
  doc.closePath().lineWidth(0.9).fillColor("#f4f7fa").strokeColor(INK).fillAndStroke();
  // Planform stations.
  for (const t of st.slice(1, -1)) doc.moveTo(X(t.y), Y(t.xLe)).lineTo(X(t.y), Y(t.xLe + t.chord)).lineWidth(0.4).dash(2, { space: 2 }).strokeColor(MUTED).stroke().undash();
  // Reference axis: straight from its root chord fraction to its tip chord fraction.
  const root = st[0]!;
  const tip = st[st.length - 1]!;
  doc.moveTo(X(root.y), Y(root.xLe + p.axisRoot * root.chord)).lineTo(X(tip.y), Y(tip.xLe + p.axisTip * tip.chord)).lineWidth(0.8).dash(6, { space: 2 }).strokeColor("#a82424").stroke().undash();
  // MAC at its spanwise position.
  doc.moveTo(X(g.yMac), Y(g.xLeMac)).lineTo(X(g.yMac), Y(g.xLeMac + g.mac)).lineWidth(1.4).strokeColor(ACCENT).stroke();
  w.text(`MAC ${formatQuantity(s.inputs.basis.units, "length", g.mac)}`, X(g.yMac) + 3, Y(g.xLeMac + g.mac / 2) - 4, { size: 7, color: ACCENT, oneLine: true });
  w.text("root", X(0) + 2, Y(root.xLe + root.chord) + 2, { size: 7, color: MUTED, oneLine: true });
  w.text("tip", X(tip.y) - 12, Y(tip.xLe + tip.chord) + 2, { size: 7, color: MUTED, oneLine: true });
  // Scale bar of 1 m (or 1 ft) below the drawing.
  const yBar = top + height + 16;
  const unitLen = s.inputs.basis.units === "SI" ? 1 : 0.3048;
  doc.moveTo(left, yBar).lineTo(left + unitLen * scale, yBar).lineWidth(1.2).strokeColor(INK).stroke();
  doc.moveTo(left, yBar - 3).lineTo(left, yBar + 3).moveTo(left + unitLen * scale, yBar - 3).lineTo(left + unitLen * scale, yBar + 3).lineWidth(0.6).stroke();
  w.text(s.inputs.basis.units === "SI" ? "1 m" : "1 ft", left + unitLen * scale + 4, yBar - 4, { size: 7, oneLine: true });
  // Legend.
  const lx = left + 80;
  doc.moveTo(lx, yBar).lineTo(lx + 18, yBar).lineWidth(0.8).dash(6, { space: 2 }).strokeColor("#a82424").stroke().undash();
  w.text(`Reference axis (${formatNumber(p.axisRoot)} c root → ${formatNumber(p.axisTip)} c tip)`.replace("→", "to"), lx + 22, yBar - 4, { size: 7, oneLine: true });
  const mx = lx + 200;
  doc.moveTo(mx, yBar).lineTo(mx + 18, yBar).lineWidth(1.4).strokeColor(ACCENT).stroke();
  w.text("Mean aerodynamic chord", mx + 22, yBar - 4, { size: 7, oneLine: true });
  const sx = mx + 120;
  doc.moveTo(sx, yBar).lineTo(sx + 18, yBar).lineWidth(0.4).dash(2, { space: 2 }).strokeColor(MUTED).stroke().undash();
  w.text("Planform station", sx + 22, yBar - 4, { size: 7, oneLine: true });
  w.y = yBar + 14;
}
