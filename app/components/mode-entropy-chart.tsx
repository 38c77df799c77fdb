import { niceStep, tickDecimals } from "./chart-scale";
/**
 * Vibrational entropy per mode under the three treatments, against the mode's frequency on a log scale:
 * where the harmonic entropy of soft modes runs away, the quasi-RRHO value bends to the free rotor and the
 * raised modes stop at the cutoff's value. Each mode is one stem with a hollow marker per treatment (no line
 * joins modes: between them there is no data).
 */
type Shape = "circle" | "square" | "diamond";
type Series = { key: "none" | "grimme" | "truhlar"; label: string; color: string; shape: Shape };

const SERIES: Series[] = [
  { key: "none", label: "Harmonic", color: "#5d6472", shape: "circle" },
  { key: "grimme", label: "Quasi-RRHO (free-rotor blend)", color: "#b4531c", shape: "square" },
  { key: "truhlar", label: "Raised to cutoff", color: "#2a5f7c", shape: "diamond" },
];

function Marker({ shape, cx, cy, color }: { shape: Shape; cx: number; cy: number; color: string }) {
  const common = { fill: "none", stroke: color, strokeWidth: 1.6 };
  if (shape === "circle") return <circle cx={cx} cy={cy} r={4.5} {...common} />;
  if (shape === "square") return <rect x={cx - 3.5} y={cy - 3.5} width={7} height={7} {...common} />;
  return <path d={`M${cx} ${cy - 5.5}L${cx + 5.5} ${cy}L${cx} ${cy + 5.5}L${cx - 5.5} ${cy}Z`} {...common} />;
}

export function ModeEntropyChart({
  frequencies,
  entropy,
  cutoff,
}: {
  frequencies: number[];
  entropy: Record<Series["key"], number[]>;
  cutoff: number;
}) {
  if (frequencies.length === 0) return <p className="text-sm text-muted">No real modes to draw.</p>;
  const order = frequencies.map((f, i) => [f, i] as const);
  const width = 760;
  const height = 260;
  const pad = { left: 56, right: 16, top: 14, bottom: 36 };
  const lo = Math.log10(Math.max(1, Math.min(...frequencies, cutoff) * 0.8));
  const hi = Math.log10(Math.max(...frequencies, cutoff) * 1.15);
  const yTicks = niceTicks(Math.max(...SERIES.flatMap((s) => entropy[s.key])));
  const maxS = yTicks[yTicks.length - 1]!;
  const x = (f: number) => pad.left + ((Math.log10(f) - lo) / (hi - lo || 1)) * (width - pad.left - pad.right);
  const y = (s: number) => height - pad.bottom - (s / maxS) * (height - pad.top - pad.bottom);
  const ticks = [3, 10, 30, 100, 300, 1000, 3000].filter((t) => Math.log10(t) >= lo && Math.log10(t) <= hi);
  const decimals = tickDecimals(yTicks[1]! - yTicks[0]!);
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} className="h-auto w-full" role="img" aria-label="Entropy per mode">
        <rect x={pad.left} y={pad.top} width={width - pad.left - pad.right} height={height - pad.top - pad.bottom} fill="#fbfaf7" stroke="#dcd7cc" />
        {ticks.map((t) => (
          <g key={t}>
            <line x1={x(t)} x2={x(t)} y1={pad.top} y2={height - pad.bottom} stroke="#ebe7df" />
            <line x1={x(t)} x2={x(t)} y1={height - pad.bottom} y2={height - pad.bottom + 4} stroke="#5d6472" />
            <text x={x(t)} y={height - pad.bottom + 15} fontSize="10" textAnchor="middle" fill="#5d6472">
              {t}
            </text>
          </g>
        ))}
        <text x={(width + pad.left) / 2} y={height - 4} fontSize="10" textAnchor="middle" fill="#5d6472">
          frequency / cm⁻¹ (log scale)
        </text>
        {yTicks.map((t) => (
          <g key={t}>
            <line x1={pad.left} x2={width - pad.right} y1={y(t)} y2={y(t)} stroke="#ebe7df" />
            <text x={pad.left - 5} y={y(t) + 3} fontSize="10" textAnchor="end" fill="#5d6472">
              {t.toFixed(decimals)}
            </text>
          </g>
        ))}
        <text x={14} y={(height - pad.bottom + pad.top) / 2} fontSize="10" fill="#5d6472" transform={`rotate(-90 14 ${(height - pad.bottom + pad.top) / 2})`} textAnchor="middle">
          S / J mol⁻¹ K⁻¹
        </text>
        <line x1={x(cutoff)} x2={x(cutoff)} y1={pad.top} y2={height - pad.bottom} stroke="#9a6a00" strokeDasharray="2 3" />
        <text x={x(cutoff) + 3} y={pad.top + 11} fontSize="10" fill="#9a6a00">
          cutoff {cutoff} cm⁻¹
        </text>
        {order.map(([f, i]) => (
          <g key={i}>
            <line x1={x(f)} x2={x(f)} y1={y(0)} y2={y(Math.max(...SERIES.map((s) => entropy[s.key][i]!)))} stroke="#c9c3b6" />
            {SERIES.map((s) => (
              <Marker key={s.key} shape={s.shape} cx={x(f)} cy={y(entropy[s.key][i]!)} color={s.color} />
            ))}
          </g>
        ))}
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-muted">
        {SERIES.map((s) => (
          <span key={s.key} className="inline-flex items-center gap-1">
            <svg width="14" height="14" viewBox="0 0 14 14" aria-hidden="true"><Marker shape={s.shape} cx={7} cy={7} color={s.color} /></svg> {s.label}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}

/** 0 and four or five round steps (1, 2 or 5 × 10ⁿ) that cover `max`. */
function niceTicks(max: number): number[] {
  if (!(max > 0)) return [0, 1];
  const step = niceStep(max / 4);
  const n = Math.ceil(max / step - 1e-9);
  return Array.from({ length: n + 1 }, (_, i) => i * step);
}
