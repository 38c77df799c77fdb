import type { ReactionStatus } from "./grids/reaction-columns";

/**
 * The status of a computed row: a colour and a glyph of our own, so it reads without colour too.
 * ok: a filled dot with a tick; incomplete: a half-filled ring; inconsistent: two offset bars;
 * unbalanced: a tilted beam; invalid: a triangle with a bar.
 */
const STYLE: Record<ReactionStatus, { color: string; text: string }> = {
  ok: { color: "var(--color-ok, #2f7d4f)", text: "ok" },
  incomplete: { color: "var(--color-warn, #a66a00)", text: "incomplete" },
  inconsistent: { color: "var(--color-bad, #b03a2e)", text: "inconsistent" },
  unbalanced: { color: "var(--color-bad, #b03a2e)", text: "unbalanced" },
  invalid: { color: "var(--color-bad, #b03a2e)", text: "invalid" },
};

function Glyph({ status, color }: { status: ReactionStatus; color: string }) {
  const common = { width: 14, height: 14, viewBox: "0 0 14 14", "aria-hidden": true } as const;
  switch (status) {
    case "ok":
      return (
        <svg {...common}>
          <circle cx="7" cy="7" r="6" fill={color} />
          <path d="M4 7.2 L6.2 9.3 L10 4.9" stroke="#fff" strokeWidth="1.6" fill="none" />
        </svg>
      );
    case "incomplete":
      return (
        <svg {...common}>
          <circle cx="7" cy="7" r="5.3" fill="none" stroke={color} strokeWidth="1.5" />
          <path d="M7 1.7 A5.3 5.3 0 0 1 7 12.3 Z" fill={color} />
        </svg>
      );
    case "inconsistent":
      return (
        <svg {...common}>
          <rect x="1.5" y="3" width="7" height="2.6" fill={color} />
          <rect x="5.5" y="8.4" width="7" height="2.6" fill={color} />
        </svg>
      );
    case "unbalanced":
      return (
        <svg {...common}>
          <path d="M2 9.5 L12 4.5" stroke={color} strokeWidth="1.8" />
          <path d="M7 7 L5 12.5 L9 12.5 Z" fill={color} />
        </svg>
      );
    default:
      return (
        <svg {...common}>
          <path d="M7 1.5 L13 12.5 L1 12.5 Z" fill={color} />
          <rect x="6.2" y="5" width="1.6" height="4.2" fill="#fff" />
          <rect x="6.2" y="10" width="1.6" height="1.4" fill="#fff" />
        </svg>
      );
  }
}

export function StatusBadge({ status }: { status: ReactionStatus }) {
  const s = STYLE[status] ?? STYLE.invalid;
  return (
    <span className="inline-flex items-center gap-1.5" data-status={status}>
      <Glyph status={status} color={s.color} />
      <span style={{ color: s.color }} className="font-medium">
        {s.text}
      </span>
    </span>
  );
}

/** AG Grid cell renderer for the status column. */
export function StatusCell(props: { value?: ReactionStatus }) {
  return props.value ? <StatusBadge status={props.value} /> : null;
}
