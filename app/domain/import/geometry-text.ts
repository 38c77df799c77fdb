import type { Geometry } from "../thermo";

/** A standard XYZ block (Å) for one structure. */
export function xyzText(g: Pick<Geometry, "symbols" | "coordinates">, comment = ""): string {
  const lines = g.coordinates.map((c, i) => `${g.symbols[i]!.padEnd(2)} ${c.map((x) => x.toFixed(8).padStart(14)).join(" ")}`);
  return `${g.symbols.length}\n${comment.replace(/[\r\n]+/g, " ")}\n${lines.join("\n")}\n`;
}

export function countsOfSymbols(symbols: readonly string[]): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const s of symbols) counts[s] = (counts[s] ?? 0) + 1;
  return counts;
}
