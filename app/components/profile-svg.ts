/**
 * The energy-profile drawing: a pure function from states to an SVG string, used by the pathway page
 * and by the diagram.svg download alike (so the figure on screen and in the manuscript are the same).
 *
 * Layout of our own: states sit as short horizontal levels along the reaction coordinate, minima in ink,
 * transition states in copper with a "‡" tag and a raised cap; dashed connectors join neighbours; each
 * level carries its value above and its label below. A second series (another protocol) is drawn in
 * steel with hollow levels and its values below the first's, for comparison.
 */
import { niceStep, tickDecimals } from "./chart-scale";
import { formatSigned } from "./number-format";

export type ProfileState = { label: string; kind: "minimum" | "transition-state"; value: number | null };
export type ProfileSeries = { name: string; states: ProfileState[] };
export type ProfileOptions = {
  unit: string;
  /** What is drawn, e.g. "ΔG" or "ΔE". */
  quantity?: string;
  title?: string;
  /** The main series' name in the legend (e.g. its protocol). */
  name?: string;
  compare?: ProfileSeries | null;
  width?: number;
  height?: number;
  decimals?: number;
};

const INK = "#1f2430";
const COPPER = "#b4531c";
const STEEL = "#3d6b8c";
const MUTED = "#6b7080";
const RULE = "#dcd7cc";

export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

/** Round tick values spanning [min, max]: steps of 1, 2 or 5 × 10ⁿ, about `count` of them. */
export function niceTicks(min: number, max: number, count = 6): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return [];
  if (min === max) {
    min -= 1;
    max += 1;
  }
  const step = niceStep((max - min) / Math.max(count, 1));
  const out: number[] = [];
  for (let v = Math.ceil(min / step) * step; v <= max + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : +v.toPrecision(12));
  return out;
}

/** A value for a label: fixed decimals, a real minus sign. */
export const formatProfileValue = formatSigned;

export function renderProfileSvg(states: ProfileState[], options: ProfileOptions): string {
  const width = options.width ?? 880;
  const height = options.height ?? 420;
  const decimals = options.decimals ?? (options.unit === "eV" ? 3 : options.unit === "hartree" ? 5 : options.unit === "cm-1" ? 0 : 1);
  const quantity = options.quantity ?? "ΔG";
  const series: Array<ProfileSeries & { color: string; main: boolean }> = [{ name: options.name ?? "", states, color: INK, main: true }];
  if (options.compare) series.push({ ...options.compare, color: STEEL, main: false });

  const n = Math.max(...series.map((s) => s.states.length), 1);
  const values = series.flatMap((s) => s.states.map((x) => x.value)).filter((v): v is number => v !== null && Number.isFinite(v));
  const top = options.title ? 44 : 24;
  const legendH = options.compare ? 22 : 0;
  const margin = { left: 70, right: 20, top: top + legendH + 18, bottom: 56 };
  const plotW = width - margin.left - margin.right;
  const plotH = height - margin.top - margin.bottom;
  const lo = values.length ? Math.min(...values, 0) : -1;
  const hi = values.length ? Math.max(...values, 0) : 1;
  const pad = (hi - lo || 1) * 0.08;
  const ticks = niceTicks(lo - pad, hi + pad, 6);
  const yMin = Math.min(lo - pad, ticks[0] ?? lo);
  const yMax = Math.max(hi + pad, ticks[ticks.length - 1] ?? hi);
  const y = (v: number) => margin.top + plotH - ((v - yMin) / (yMax - yMin || 1)) * plotH;
  const slot = plotW / n;
  const levelW = Math.min(slot * 0.56, 90);
  const cx = (i: number) => margin.left + slot * (i + 0.5);
  const f = (v: number) => v.toFixed(1);

  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="'Noto Sans', 'DejaVu Sans', Arial, sans-serif" font-size="12" role="img" aria-label="${escapeXml(`${options.title ?? "Energy profile"} (${quantity}, ${options.unit})`)}">`,
  );
  parts.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="#ffffff"/>`);
  if (options.title) parts.push(`<text x="${margin.left}" y="26" font-size="15" font-weight="700" fill="${INK}">${escapeXml(options.title)}</text>`);
  if (options.compare) {
    let lx = margin.left;
    const ly = top + 8;
    for (const s of series) {
      parts.push(`<line x1="${lx}" y1="${ly}" x2="${lx + 26}" y2="${ly}" stroke="${s.color}" stroke-width="3"${s.main ? "" : ' stroke-dasharray="6 3"'}/>`);
      parts.push(`<text x="${lx + 32}" y="${ly + 4}" fill="${s.color}">${escapeXml(s.name || (s.main ? "this protocol" : "comparison"))}</text>`);
      lx += 40 + Math.min(340, 7 * (s.name.length || 12));
    }
  }
  // axis and grid
  for (const t of ticks) {
    if (t < yMin || t > yMax) continue;
    parts.push(`<line x1="${margin.left}" y1="${f(y(t))}" x2="${width - margin.right}" y2="${f(y(t))}" stroke="${RULE}" stroke-width="${t === 0 ? 1.2 : 0.6}"${t === 0 ? "" : ' stroke-dasharray="2 3"'}/>`);
    parts.push(`<text x="${margin.left - 8}" y="${f(y(t) + 4)}" text-anchor="end" fill="${MUTED}">${formatProfileValue(t, tickDecimals(ticks[1]! - ticks[0]!))}</text>`);
  }
  parts.push(`<line x1="${margin.left}" y1="${margin.top}" x2="${margin.left}" y2="${margin.top + plotH}" stroke="${INK}" stroke-width="1"/>`);
  const axisLabel = `${quantity} / ${options.unit === "cm-1" ? "cm⁻¹" : options.unit}`;
  parts.push(`<text transform="translate(18 ${f(margin.top + plotH / 2)}) rotate(-90)" text-anchor="middle" fill="${INK}">${escapeXml(axisLabel)}</text>`);
  parts.push(`<text x="${f(margin.left + plotW / 2)}" y="${height - 10}" text-anchor="middle" fill="${MUTED}">reaction coordinate</text>`);

  series.forEach((s, si) => {
    // connectors first, so levels sit on top
    for (let i = 0; i + 1 < s.states.length; i++) {
      const a = s.states[i]!, b = s.states[i + 1]!;
      if (a.value === null || b.value === null) continue;
      parts.push(`<line x1="${f(cx(i) + levelW / 2)}" y1="${f(y(a.value))}" x2="${f(cx(i + 1) - levelW / 2)}" y2="${f(y(b.value))}" stroke="${s.color}" stroke-width="1.2" stroke-dasharray="4 3" opacity="0.8"/>`);
    }
    s.states.forEach((st, i) => {
      const x0 = cx(i) - levelW / 2, x1 = cx(i) + levelW / 2;
      if (st.value === null) {
        if (s.main) parts.push(`<text x="${f(cx(i))}" y="${f(margin.top + plotH / 2)}" text-anchor="middle" fill="${MUTED}" font-style="italic">not computed</text>`);
        return;
      }
      const yy = y(st.value);
      const ts = st.kind === "transition-state";
      const color = s.main ? (ts ? COPPER : INK) : STEEL;
      parts.push(`<line x1="${f(x0)}" y1="${f(yy)}" x2="${f(x1)}" y2="${f(yy)}" stroke="${color}" stroke-width="${s.main ? 3.5 : 2.5}" stroke-linecap="round"${s.main ? "" : ' stroke-dasharray="6 3"'} data-state="${escapeXml(st.label)}" data-kind="${st.kind}"/>`);
      if (ts && s.main) parts.push(`<path d="M ${f(cx(i) - 6)} ${f(yy - 3)} L ${f(cx(i))} ${f(yy - 9)} L ${f(cx(i) + 6)} ${f(yy - 3)}" fill="none" stroke="${COPPER}" stroke-width="1.5"/>`);
      const valueText = formatProfileValue(st.value, decimals);
      if (s.main) {
        parts.push(`<text x="${f(cx(i))}" y="${f(yy - (ts ? 13 : 7))}" text-anchor="middle" font-weight="700" fill="${color}">${valueText}</text>`);
        parts.push(`<text x="${f(cx(i))}" y="${f(yy + 17)}" text-anchor="middle" fill="${INK}">${escapeXml(st.label)}${ts ? ' <tspan fill="' + COPPER + '">‡</tspan>' : ""}</text>`);
      } else {
        parts.push(`<text x="${f(cx(i))}" y="${f(yy + (si ? 31 : 17))}" text-anchor="middle" fill="${STEEL}" font-size="11">(${valueText})</text>`);
      }
    });
  });
  parts.push("</svg>");
  return parts.join("\n");
}

/** The states of a pathway answer (GET …/pathways/:id) as drawn: relative G, else relative E for every state. */
export function profileStatesOf(
  states: ReadonlyArray<{ label: string; kind: "minimum" | "transition-state"; relativeE: number | null; relativeG: number | null }>,
  quantity: "auto" | "G" | "E" = "auto",
): { quantity: "ΔG" | "ΔE"; states: ProfileState[] } {
  const useG = quantity === "G" || (quantity === "auto" && states.length > 0 && states.every((s) => s.relativeG !== null));
  return {
    quantity: useG ? "ΔG" : "ΔE",
    states: states.map((s) => ({ label: s.label, kind: s.kind, value: useG ? s.relativeG : s.relativeE })),
  };
}
