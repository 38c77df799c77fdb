/**
 * Geometries: XYZ parsing (Å), principal moments of inertia, linearity.
 */
import { element, normaliseSymbol } from "./elements";
import { ThermoInputError } from "./errors";

export type Vec3 = [number, number, number];
export interface Geometry {
  symbols: string[];
  /** Cartesian coordinates in ångström. */
  coordinates: Vec3[];
  comment?: string;
}
export type MassModel = "isotopic" | "average";

function parseAtomLine(line: string, lineNo: number): { symbol: string; xyz: Vec3 } {
  const parts = line.trim().split(/[\s,]+/);
  if (parts.length < 4) throw new ThermoInputError("geometry", `Line ${lineNo}: expected "symbol x y z", got ${JSON.stringify(line.trim())}.`);
  const symbol = normaliseSymbol(parts[0]!);
  if (!symbol) throw new ThermoInputError("geometry", `Line ${lineNo}: unknown element ${JSON.stringify(parts[0])}.`);
  const xyz = parts.slice(1, 4).map((p) => Number(p.replace(/[dD]/, "e"))) as Vec3;
  if (xyz.some((v) => !Number.isFinite(v))) throw new ThermoInputError("geometry", `Line ${lineNo}: coordinates must be numbers, got ${JSON.stringify(line.trim())}.`);
  return { symbol, xyz };
}

/**
 * Parses XYZ text: one or several frames ("N", comment line, N atom lines), or bare "Sym x y z" lines
 * without a header (one frame). Symbols may be atomic numbers or carry a numeric label ("C12").
 */
export function parseXyz(text: string): Geometry[] {
  if (typeof text !== "string" || text.trim() === "") throw new ThermoInputError("geometry", "geometry must be non-empty XYZ text.");
  const lines = text.replace(/\r\n?/g, "\n").split("\n");
  let i = 0;
  while (i < lines.length && lines[i]!.trim() === "") i++;
  const frames: Geometry[] = [];
  if (/^\s*\d+\s*$/.test(lines[i]!)) {
    while (i < lines.length) {
      if (lines[i]!.trim() === "") { i++; continue; }
      const header = lines[i]!.trim();
      if (!/^\d+$/.test(header)) throw new ThermoInputError("geometry", `Line ${i + 1}: expected an atom count to start frame ${frames.length + 1}, got ${JSON.stringify(header)}.`);
      const n = Number(header);
      if (n < 1) throw new ThermoInputError("geometry", `Line ${i + 1}: a frame needs at least one atom.`);
      const comment = lines[i + 1] ?? "";
      const frame: Geometry = { symbols: [], coordinates: [], comment: comment.trim() };
      for (let k = 0; k < n; k++) {
        const ln = i + 2 + k;
        if (ln >= lines.length || lines[ln]!.trim() === "") {
          throw new ThermoInputError("geometry", `Frame ${frames.length + 1} announces ${n} atoms but has ${k}.`);
        }
        const a = parseAtomLine(lines[ln]!, ln + 1);
        frame.symbols.push(a.symbol);
        frame.coordinates.push(a.xyz);
      }
      frames.push(frame);
      i += 2 + n;
    }
  } else {
    const frame: Geometry = { symbols: [], coordinates: [] };
    for (; i < lines.length; i++) {
      if (lines[i]!.trim() === "") continue;
      const a = parseAtomLine(lines[i]!, i + 1);
      frame.symbols.push(a.symbol);
      frame.coordinates.push(a.xyz);
    }
    frames.push(frame);
  }
  return frames;
}

/** Atomic masses (u) for a list of symbols. */
export function atomMasses(symbols: readonly string[], masses: MassModel = "isotopic"): Float64Array {
  if (masses !== "isotopic" && masses !== "average") throw new ThermoInputError("masses", `masses must be "isotopic" or "average" (got ${JSON.stringify(masses)}).`);
  const out = new Float64Array(symbols.length);
  for (let i = 0; i < symbols.length; i++) {
    const el = element(symbols[i]!);
    if (!el) throw new ThermoInputError(`symbols[${i}]`, `Unknown element ${JSON.stringify(symbols[i])}.`);
    out[i] = masses === "isotopic" ? el.isotopicMass : el.atomicWeight;
  }
  return out;
}

/**
 * Eigenvalues of a symmetric 3×3 matrix by cyclic Jacobi rotations (Numerical Recipes §11.1), ascending.
 * `a` is [a00, a01, a02, a11, a12, a22].
 */
export function symmetricEigenvalues3(a00: number, a01: number, a02: number, a11: number, a12: number, a22: number): Vec3 {
  const m = [[a00, a01, a02], [a01, a11, a12], [a02, a12, a22]];
  const scale = Math.abs(a00) + Math.abs(a11) + Math.abs(a22) + Math.abs(a01) + Math.abs(a02) + Math.abs(a12);
  if (scale === 0) return [0, 0, 0];
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = Math.abs(m[0]![1]!) + Math.abs(m[0]![2]!) + Math.abs(m[1]![2]!);
    if (off <= 1e-15 * scale) break;
    for (let p = 0; p < 2; p++) {
      for (let q = p + 1; q < 3; q++) {
        const apq = m[p]![q]!;
        if (apq === 0) continue;
        const theta = (m[q]![q]! - m[p]![p]!) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < 3; k++) { // A ← Jᵀ A J
          const akp = m[k]![p]!, akq = m[k]![q]!;
          m[k]![p] = c * akp - s * akq;
          m[k]![q] = s * akp + c * akq;
        }
        for (let k = 0; k < 3; k++) {
          const apk = m[p]![k]!, aqk = m[q]![k]!;
          m[p]![k] = c * apk - s * aqk;
          m[q]![k] = s * apk + c * aqk;
        }
      }
    }
  }
  const ev = [m[0]![0]!, m[1]![1]!, m[2]![2]!].sort((x, y) => x - y);
  return [ev[0]!, ev[1]!, ev[2]!];
}

/**
 * Principal moments of inertia (u Å², ascending): eigenvalues of the inertia tensor about the centre of mass,
 * I = Σ m (r² 1 − r rᵀ).
 */
export function principalMoments(symbols: readonly string[], coordinates: ReadonlyArray<readonly number[]>, masses: MassModel | Float64Array = "isotopic"): Vec3 {
  validateGeometry(symbols, coordinates);
  const m = masses instanceof Float64Array ? masses : atomMasses(symbols, masses);
  return principalMomentsFromMasses(m, coordinates);
}

/** Same as principalMoments, with masses already looked up (hot path). */
export function principalMomentsFromMasses(m: Float64Array, coordinates: ReadonlyArray<readonly number[]>): Vec3 {
  const n = m.length;
  let mt = 0, cx = 0, cy = 0, cz = 0;
  for (let i = 0; i < n; i++) {
    const r = coordinates[i]!;
    const mi = m[i]!;
    mt += mi; cx += mi * r[0]!; cy += mi * r[1]!; cz += mi * r[2]!;
  }
  cx /= mt; cy /= mt; cz /= mt;
  let xx = 0, yy = 0, zz = 0, xy = 0, xz = 0, yz = 0;
  for (let i = 0; i < n; i++) {
    const r = coordinates[i]!;
    const mi = m[i]!;
    const x = r[0]! - cx, y = r[1]! - cy, z = r[2]! - cz;
    xx += mi * x * x; yy += mi * y * y; zz += mi * z * z;
    xy += mi * x * y; xz += mi * x * z; yz += mi * y * z;
  }
  const ev = symmetricEigenvalues3(yy + zz, -xy, -xz, xx + zz, -yz, xx + yy);
  // Round-off can leave −1e-16 on a linear molecule's axis.
  return [Math.max(0, ev[0]), Math.max(0, ev[1]), Math.max(0, ev[2])];
}

/**
 * Linear when the smallest moment vanishes: I_A < 1e-3 u Å² (and the two others agree to 1e-3 relative).
 * Chosen on purpose: the smallest non-zero moment of a real bent molecule is ~0.6 u Å² (H2O) or more, while
 * an optimised linear molecule shows ~1e-8 u Å² of noise; 1e-3 u Å² corresponds to bending H–C≡C–H by ~0.5°.
 */
export const LINEAR_MOMENT_TOLERANCE = 1e-3;
export function isLinear(moments: readonly number[]): boolean {
  const [a, b, c] = moments as Vec3;
  if (c < LINEAR_MOMENT_TOLERANCE) return false; // an atom (or a point): not a linear molecule
  return a < LINEAR_MOMENT_TOLERANCE && Math.abs(c - b) <= 1e-3 * c;
}
export function isAtom(moments: readonly number[]): boolean {
  return moments[2]! < LINEAR_MOMENT_TOLERANCE;
}

/** Checks symbols and coordinates agree in length and hold finite numbers. */
export function validateGeometry(symbols: readonly string[], coordinates: ReadonlyArray<readonly number[]>): void {
  if (!Array.isArray(symbols) || symbols.length === 0) throw new ThermoInputError("symbols", "symbols must be a non-empty list of element symbols.");
  if (!Array.isArray(coordinates)) throw new ThermoInputError("coordinates", "coordinates must be a list of [x, y, z] in Å.");
  if (coordinates.length !== symbols.length) {
    throw new ThermoInputError("coordinates", `${symbols.length} symbols but ${coordinates.length} coordinate rows.`);
  }
  for (let i = 0; i < coordinates.length; i++) {
    const r = coordinates[i];
    if (!r || r.length !== 3 || !Number.isFinite(r[0]) || !Number.isFinite(r[1]) || !Number.isFinite(r[2])) {
      throw new ThermoInputError(`coordinates[${i}]`, `coordinates[${i}] must be three finite numbers [x, y, z] in Å.`);
    }
  }
}
