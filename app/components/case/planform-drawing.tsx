interface Station {
  y: number;
  xLe: number;
  chord: number;
}

/**
 * A to-scale plan view of one semispan (span to the right, flow downwards), with the mean
 * aerodynamic chord and the straight reference axis. Equal scale in both directions.
 */
export function PlanformDrawing({
  stations,
  mac,
  axis,
  unitLabel,
  scaleToDisplay,
}: {
  stations: Station[];
  mac?: { yMac: number; xLeMac: number; mac: number };
  axis: { root: number; tip: number };
  unitLabel: string;
  scaleToDisplay: (m: number) => number;
}) {
  if (stations.length < 2) return <p className="text-sm text-ink-muted">Enter at least two stations to see the planform.</p>;
  const xs = stations.flatMap((s) => [s.xLe, s.xLe + s.chord]);
  const minX = Math.min(...xs);
  const maxX = Math.max(...xs);
  const span = stations[stations.length - 1]!.y;
  const pad = Math.max(span, maxX - minX) * 0.08;
  const width = span + 2 * pad;
  const height = maxX - minX + 2 * pad;
  const le = stations.map((s) => `${s.y},${s.xLe}`).join(" ");
  const te = [...stations].reverse().map((s) => `${s.y},${s.xLe + s.chord}`).join(" ");
  const root = stations[0]!;
  const tip = stations[stations.length - 1]!;
  const axisRoot = { y: root.y, x: root.xLe + axis.root * root.chord };
  const axisTip = { y: tip.y, x: tip.xLe + axis.tip * tip.chord };
  const stroke = width / 400;
  return (
    <figure>
      <svg viewBox={`${-pad} ${minX - pad} ${width} ${height}`} className="h-auto max-h-80 w-full" role="img" aria-label="Planform drawn to scale">
        <polygon points={`${le} ${te}`} fill="#e5f0f7" stroke="#1f5f8b" strokeWidth={stroke * 2} />
        {stations.slice(1, -1).map((s) => (
          <line key={s.y} x1={s.y} x2={s.y} y1={s.xLe} y2={s.xLe + s.chord} stroke="#7a8694" strokeWidth={stroke} strokeDasharray={`${stroke * 4} ${stroke * 3}`} />
        ))}
        <line x1={axisRoot.y} y1={axisRoot.x} x2={axisTip.y} y2={axisTip.x} stroke="#a4500f" strokeWidth={stroke * 2} strokeDasharray={`${stroke * 8} ${stroke * 4}`} />
        {mac ? <line x1={mac.yMac} x2={mac.yMac} y1={mac.xLeMac} y2={mac.xLeMac + mac.mac} stroke="#217a45" strokeWidth={stroke * 3} /> : null}
        <line x1={-pad / 2} x2={-pad / 2} y1={minX - pad / 2} y2={maxX + pad / 2} stroke="#17202b" strokeWidth={stroke} />
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-ink-muted">
        <span>
          <span className="mr-1 inline-block h-0.5 w-5 bg-[#217a45] align-middle" />
          mean aerodynamic chord
        </span>
        <span>
          <span className="mr-1 inline-block h-0.5 w-5 border-t-2 border-dashed border-[#a4500f] align-middle" />
          reference axis
        </span>
        <span>
          semispan {scaleToDisplay(span).toPrecision(4)} {unitLabel}; flow from top to bottom; plane of symmetry at left
        </span>
      </figcaption>
    </figure>
  );
}
