interface Station {
  y: number;
  xLe: number;
  chord: number;
}

/** A mass item drawn on the planform: a point mass at (x, y), or a mass spread from yFrom to yTo at x. */
export interface DrawnItem {
  id: string;
  kg: number;
  x: number;
  y?: number;
  yFrom?: number;
  yTo?: number;
}

/**
 * A to-scale plan view of one semispan (span to the right, flow downwards), with the mean
 * aerodynamic chord and the straight reference axis, and optionally the mass items (point masses as
 * circles whose area grows with the mass, spread masses as bars) and centre-of-gravity marks on the
 * MAC. Equal scale in both directions.
 */
export function PlanformDrawing({
  stations,
  mac,
  axis,
  unitLabel,
  scaleToDisplay,
  items = [],
  cgs = [],
}: {
  stations: Station[];
  mac?: { yMac: number; xLeMac: number; mac: number };
  axis: { root: number; tip: number };
  unitLabel: string;
  scaleToDisplay: (m: number) => number;
  items?: DrawnItem[];
  /** Centres of gravity to mark on the MAC, as fractions of it. */
  cgs?: { label: string; fraction: number }[];
}) {
  if (stations.length < 2) return <p className="text-sm text-ink-muted">Enter at least two stations to see the planform.</p>;
  const xs = [...stations.flatMap((s) => [s.xLe, s.xLe + s.chord]), ...items.map((i) => i.x).filter(Number.isFinite)];
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
        {mac
          ? cgs.map((c) => (
              <line
                key={c.label}
                x1={mac.yMac - pad * 0.15}
                x2={mac.yMac + pad * 0.15}
                y1={mac.xLeMac + c.fraction * mac.mac}
                y2={mac.xLeMac + c.fraction * mac.mac}
                stroke="#6b2fa0"
                strokeWidth={stroke * 2}
              >
                <title>{`${c.label}: CG at ${(c.fraction * 100).toFixed(1)} % MAC`}</title>
              </line>
            ))
          : null}
        {items.map((it) => {
          const biggest = Math.max(1e-9, ...items.map((i) => i.kg));
          if (it.y !== undefined && Number.isFinite(it.y)) {
            const r = pad * 0.12 + pad * 0.25 * Math.sqrt(Math.max(0, it.kg) / biggest);
            return (
              <g key={it.id}>
                <circle cx={it.y} cy={it.x} r={r} fill="#6b2fa0" fillOpacity={0.35} stroke="#6b2fa0" strokeWidth={stroke} />
                <text x={it.y} y={it.x - r * 1.3} fontSize={pad * 0.16} textAnchor="middle" fill="#17202b">
                  {it.id}
                </text>
              </g>
            );
          }
          if (it.yFrom === undefined || it.yTo === undefined || !(it.yTo > it.yFrom)) return null;
          const h = pad * 0.08 + pad * 0.2 * (Math.max(0, it.kg) / biggest);
          return (
            <g key={it.id}>
              <rect x={it.yFrom} y={it.x - h / 2} width={it.yTo - it.yFrom} height={h} fill="#6b2fa0" fillOpacity={0.25} stroke="#6b2fa0" strokeWidth={stroke} />
              <text x={(it.yFrom + it.yTo) / 2} y={it.x + h / 2 + pad * 0.2} fontSize={pad * 0.16} textAnchor="middle" fill="#17202b">
                {it.id}
              </text>
            </g>
          );
        })}
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
        {cgs.length ? (
          <span>
            <span className="mr-1 inline-block h-0.5 w-4 bg-[#6b2fa0] align-middle" />
            centres of gravity on the MAC ({cgs.map((c) => `${c.label} ${(c.fraction * 100).toFixed(1)} %`).join(", ")})
          </span>
        ) : null}
        {items.length ? (
          <span>
            <span className="mr-1 inline-block h-2.5 w-2.5 rounded-full border border-[#6b2fa0] bg-[#6b2fa0]/35 align-middle" />
            point masses (area grows with mass) and spread masses (bars), at their centres of gravity
          </span>
        ) : null}
        <span>
          semispan {scaleToDisplay(span).toPrecision(4)} {unitLabel}; flow from top to bottom; plane of symmetry at left
        </span>
      </figcaption>
    </figure>
  );
}
