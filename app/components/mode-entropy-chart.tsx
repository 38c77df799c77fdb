/**
 * Vibrational entropy per mode under the three treatments, against the mode's frequency on a log scale:
 * where the harmonic entropy of soft modes runs away, the quasi-RRHO curve bends to the free rotor and the
 * raised modes flatten at the cutoff.
 */
type Series = { key: "none" | "grimme" | "truhlar"; label: string; color: string; dash?: string };

const SERIES: Series[] = [
  { key: "none", label: "Harmonic", color: "#5d6472" },
  { key: "grimme", label: "Quasi-RRHO (free-rotor blend)", color: "#b4531c" },
  { key: "truhlar", label: "Raised to cutoff", color: "#2a5f7c", dash: "5 3" },
];

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
  const order = frequencies.map((f, i) => [f, i] as const).sort((a, b) => a[0] - b[0]);
  const width = 560;
  const height = 220;
  const pad = { left: 48, right: 12, top: 12, bottom: 34 };
  const lo = Math.log10(Math.max(1, Math.min(...frequencies, cutoff) * 0.8));
  const hi = Math.log10(Math.max(...frequencies, cutoff) * 1.1);
  const maxS = Math.max(...SERIES.flatMap((s) => entropy[s.key])) * 1.08 || 1;
  const x = (f: number) => pad.left + ((Math.log10(f) - lo) / (hi - lo || 1)) * (width - pad.left - pad.right);
  const y = (s: number) => height - pad.bottom - (s / maxS) * (height - pad.top - pad.bottom);
  const ticks = [10, 30, 100, 300, 1000, 3000].filter((t) => Math.log10(t) >= lo && Math.log10(t) <= hi);
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} className="w-full max-w-[560px]" role="img" aria-label="Entropy per mode">
        <rect x={pad.left} y={pad.top} width={width - pad.left - pad.right} height={height - pad.top - pad.bottom} fill="#fbfaf7" stroke="#dcd7cc" />
        <line x1={x(cutoff)} x2={x(cutoff)} y1={pad.top} y2={height - pad.bottom} stroke="#9a6a00" strokeDasharray="2 3" />
        <text x={x(cutoff) + 3} y={pad.top + 11} fontSize="10" fill="#9a6a00">
          cutoff {cutoff} cm⁻¹
        </text>
        {ticks.map((t) => (
          <g key={t}>
            <line x1={x(t)} x2={x(t)} y1={height - pad.bottom} y2={height - pad.bottom + 4} stroke="#5d6472" />
            <text x={x(t)} y={height - pad.bottom + 15} fontSize="10" textAnchor="middle" fill="#5d6472">
              {t}
            </text>
          </g>
        ))}
        <text x={(width + pad.left) / 2} y={height - 4} fontSize="10" textAnchor="middle" fill="#5d6472">
          frequency / cm⁻¹ (log scale)
        </text>
        {[0, 0.5, 1].map((f) => (
          <text key={f} x={pad.left - 4} y={y(maxS * f) + 3} fontSize="10" textAnchor="end" fill="#5d6472">
            {(maxS * f).toFixed(0)}
          </text>
        ))}
        <text x={12} y={(height - pad.bottom + pad.top) / 2} fontSize="10" fill="#5d6472" transform={`rotate(-90 12 ${(height - pad.bottom + pad.top) / 2})`} textAnchor="middle">
          S / J mol⁻¹ K⁻¹
        </text>
        {SERIES.map((s) => (
          <g key={s.key}>
            <polyline
              fill="none"
              stroke={s.color}
              strokeWidth="1.6"
              strokeDasharray={s.dash}
              points={order.map(([f, i]) => `${x(f).toFixed(1)},${y(entropy[s.key][i]).toFixed(1)}`).join(" ")}
            />
            {order.map(([f, i]) => (
              <circle key={i} cx={x(f)} cy={y(entropy[s.key][i])} r="2" fill={s.color} />
            ))}
          </g>
        ))}
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-4 text-xs text-muted">
        {SERIES.map((s) => (
          <span key={s.key} className="inline-flex items-center gap-1">
            <span className="inline-block h-0.5 w-4" style={{ background: s.color }} /> {s.label}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
