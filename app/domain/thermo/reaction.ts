/**
 * Reactions: equation parsing, element/charge/electron balance, and reaction arithmetic
 * ΔX = Σν·X(products) − Σν·X(reactants) on absolute energies in hartree (exact decimal sums).
 *
 * Equation syntax (documented for users):
 *  - one arrow: `->`, `→`, `=>`, `⟶`, or `<=>` / `⇌` for an equilibrium;
 *  - terms separated by ` + ` WITH WHITESPACE around the plus (so labels may carry charges: `NH4+ + OH-`);
 *  - a stoichiometric coefficient is a number (integer, decimal or fraction like `1/2`) followed by
 *    whitespace: `2 B`. `2B` is the LABEL "2B" (compound labels such as `1`, `2a`, `3-TS` are common
 *    in papers), so a term of digits only, e.g. `3`, is compound 3, and `2 3` is two of compound 3.
 */
import type Decimal from "decimal.js";
import { ThermoInputError, requireFinite } from "./errors";
import type { ElementCounts } from "./formula";
import { element } from "./elements";
import { HDecimal, energy, toHartreeDecimal } from "./units";
import type { HartreeInput, Quantity } from "./units";

export interface EquationTerm {
  label: string;
  coefficient: number;
}
export interface ParsedEquation {
  reactants: EquationTerm[];
  products: EquationTerm[];
  reversible: boolean;
}

const ARROWS = /\s*(<=>|⇌|->|→|=>|⟶)\s*/g;

function parseSide(text: string, side: "reactants" | "products", whole: string): EquationTerm[] {
  if (text.trim() === "") throw new ThermoInputError("equation", `The ${side} side of ${JSON.stringify(whole)} is empty.`);
  const terms: EquationTerm[] = [];
  const byLabel = new Map<string, EquationTerm>();
  for (const raw of text.trim().split(/\s+\+\s+/)) {
    const t = raw.trim();
    if (t === "" || t === "+") throw new ThermoInputError("equation", `An empty term on the ${side} side of ${JSON.stringify(whole)}.`);
    const m = /^(\d+(?:\.\d+)?(?:\/\d+)?|\.\d+)\s+(\S.*)$/.exec(t);
    let coefficient = 1;
    let label = t;
    if (m) {
      const [num, den] = m[1]!.split("/");
      coefficient = Number(num) / (den ? Number(den) : 1);
      label = m[2]!.trim();
      if (!Number.isFinite(coefficient) || coefficient <= 0) {
        throw new ThermoInputError("equation", `Coefficient ${JSON.stringify(m[1])} of ${label} must be a positive number.`);
      }
    }
    if (/\s/.test(label)) throw new ThermoInputError("equation", `Cannot read term ${JSON.stringify(t)}: write "2 B" (coefficient, space, label) and separate terms with " + ".`);
    const prev = byLabel.get(label);
    if (prev) prev.coefficient += coefficient; // A + A -> A2 is the same as 2 A -> A2
    else {
      const term = { label, coefficient };
      byLabel.set(label, term);
      terms.push(term);
    }
  }
  return terms;
}

/** Parses `A + 2 B -> C` (rules above). */
export function parseEquation(text: string): ParsedEquation {
  if (typeof text !== "string" || text.trim() === "") throw new ThermoInputError("equation", 'equation must be text like "A + 2 B -> C".');
  const arrows = [...text.matchAll(ARROWS)];
  if (arrows.length === 0) throw new ThermoInputError("equation", `No arrow in ${JSON.stringify(text)}; write "A + B -> C" (also →, =>, <=>).`);
  if (arrows.length > 1) throw new ThermoInputError("equation", `More than one arrow in ${JSON.stringify(text)}.`);
  const a = arrows[0]!;
  const left = text.slice(0, a.index);
  const right = text.slice(a.index! + a[0].length);
  return {
    reactants: parseSide(left, "reactants", text),
    products: parseSide(right, "products", text),
    reversible: a[1] === "<=>" || a[1] === "⇌",
  };
}

// ---------- balance ----------
export interface BalanceTerm {
  coefficient: number;
  counts: ElementCounts;
  charge: number;
  label?: string;
}
export interface BalanceResult {
  balanced: boolean;
  /** products − reactants, only the elements that do not balance. */
  elementDiff: Record<string, number>;
  /** products − reactants. */
  chargeDiff: number;
  /** products − reactants (follows from elements and charge). */
  electronDiff: number;
  message: string;
}

const TOL = 1e-9;
function sideTotals(terms: readonly BalanceTerm[], side: string) {
  const counts: Record<string, number> = {};
  let charge = 0;
  let electrons = 0;
  terms.forEach((t, i) => {
    const f = `${side}[${i}]`;
    const c = requireFinite(t.coefficient, `${f}.coefficient`);
    if (c <= 0) throw new ThermoInputError(`${f}.coefficient`, `${f}.coefficient must be positive.`);
    const q = requireFinite(t.charge ?? 0, `${f}.charge`);
    charge += c * q;
    electrons -= c * q;
    for (const [el, n] of Object.entries(t.counts ?? {})) {
      const e = element(el);
      if (!e) throw new ThermoInputError(`${f}.counts`, `Unknown element "${el}" in ${t.label ?? f}.`);
      counts[el] = (counts[el] ?? 0) + c * n;
      electrons += c * n * e.z;
    }
  });
  return { counts, charge, electrons };
}
const fmt = (x: number) => String(Math.round(x * 1e6) / 1e6);

/** Element, charge and electron balance; the message names each element or the charge that does not balance. */
export function checkBalance(reaction: { reactants: readonly BalanceTerm[]; products: readonly BalanceTerm[] }): BalanceResult {
  const r = sideTotals(reaction.reactants, "reactants");
  const p = sideTotals(reaction.products, "products");
  const elementDiff: Record<string, number> = {};
  const problems: string[] = [];
  for (const el of [...new Set([...Object.keys(r.counts), ...Object.keys(p.counts)])].sort()) {
    const d = (p.counts[el] ?? 0) - (r.counts[el] ?? 0);
    if (Math.abs(d) > TOL) {
      elementDiff[el] = d;
      problems.push(`${el}: ${fmt(r.counts[el] ?? 0)} on the reactant side, ${fmt(p.counts[el] ?? 0)} on the product side`);
    }
  }
  let chargeDiff = p.charge - r.charge;
  if (Math.abs(chargeDiff) <= TOL) chargeDiff = 0;
  else problems.push(`charge: ${fmt(r.charge)} on the reactant side, ${fmt(p.charge)} on the product side`);
  let electronDiff = p.electrons - r.electrons;
  if (Math.abs(electronDiff) <= TOL) electronDiff = 0;
  else problems.push(`electrons: ${fmt(r.electrons)} on the reactant side, ${fmt(p.electrons)} on the product side`);
  const balanced = problems.length === 0;
  return { balanced, elementDiff, chargeDiff, electronDiff, message: balanced ? "Balanced." : `Does not balance: ${problems.join("; ")}.` };
}

// ---------- reaction arithmetic ----------
export interface SpeciesEnergiesInput {
  /** Absolute electronic energy, hartree (decimal string preferred). */
  electronicEnergy: HartreeInput;
  /** Corrections per particle, hartree. */
  zpe?: number | null;
  enthalpyCorrection?: number | null;
  gibbsCorrection?: number | null;
  /** Standard-state correction added to G (e.g. 1 atm → 1 M), hartree. */
  standardStateCorrection?: number | null;
}
export interface SpeciesEnergies {
  E: Decimal;
  EZPE: Decimal | null;
  H: Decimal | null;
  G: Decimal | null;
}
export type EnergyKind = keyof SpeciesEnergies;

/** E, E+ZPE, H = E + H_corr, G = E + G_corr + ΔG°(standard state), exact decimals in hartree. */
export function speciesEnergies(input: SpeciesEnergiesInput, field = "species"): SpeciesEnergies {
  const E = toHartreeDecimal(input.electronicEnergy, `${field}.electronicEnergy`);
  const opt = (v: number | null | undefined, f: string) => (v === null || v === undefined ? null : new HDecimal(requireFinite(v, `${field}.${f}`)));
  const zpe = opt(input.zpe, "zpe");
  const h = opt(input.enthalpyCorrection, "enthalpyCorrection");
  const g = opt(input.gibbsCorrection, "gibbsCorrection");
  const ss = opt(input.standardStateCorrection, "standardStateCorrection") ?? new HDecimal(0);
  return { E, EZPE: zpe ? E.plus(zpe) : null, H: h ? E.plus(h) : null, G: g ? E.plus(g).plus(ss) : null };
}

export interface ReactionTerm {
  coefficient: number;
  value: HartreeInput | null;
  label?: string;
}
export interface Delta {
  /** Exact difference, hartree, as a decimal string. */
  hartree: string;
  quantity: Quantity<"hartree">;
}

function toDelta(d: Decimal): Delta {
  return { hartree: d.toString(), quantity: energy(d.toNumber(), "hartree") };
}

/** Σν·X(products) − Σν·X(reactants) in hartree; null if any value is missing. */
export function reactionDelta(reactants: readonly ReactionTerm[], products: readonly ReactionTerm[]): Delta | null {
  let sum = new HDecimal(0);
  for (const [terms, sign, side] of [[products, 1, "products"], [reactants, -1, "reactants"]] as const) {
    for (let i = 0; i < terms.length; i++) {
      const t = terms[i]!;
      const c = requireFinite(t.coefficient, `${side}[${i}].coefficient`);
      if (c <= 0) throw new ThermoInputError(`${side}[${i}].coefficient`, "Coefficients must be positive.");
      if (t.value === null || t.value === undefined) return null;
      sum = sum.plus(toHartreeDecimal(t.value, `${side}[${i}].value`).times(c * sign));
    }
  }
  return toDelta(sum);
}

/** Barrier = X(TS) − Σν·X(reactants), hartree; null if a value is missing. */
export function barrierDelta(reactants: readonly ReactionTerm[], transitionState: HartreeInput | null): Delta | null {
  if (transitionState === null || transitionState === undefined) return null;
  return reactionDelta(reactants, [{ coefficient: 1, value: transitionState }]);
}

export interface ReactionEnergiesInput {
  reactants: ReadonlyArray<{ coefficient: number; energies: SpeciesEnergies; label?: string }>;
  products: ReadonlyArray<{ coefficient: number; energies: SpeciesEnergies; label?: string }>;
  transitionState?: SpeciesEnergies | null;
}
export interface ReactionEnergies {
  deltaE: Delta | null;
  deltaEZPE: Delta | null;
  deltaH: Delta | null;
  deltaG: Delta | null;
  barrierE: Delta | null;
  barrierEZPE: Delta | null;
  barrierH: Delta | null;
  barrierG: Delta | null;
}

/** ΔE, Δ(E+ZPE), ΔH, ΔG and the barriers against the reactants; a value that can be computed is given even when another cannot. */
export function reactionEnergies(input: ReactionEnergiesInput): ReactionEnergies {
  const pick = (k: EnergyKind) => {
    const r = input.reactants.map((t) => ({ coefficient: t.coefficient, value: t.energies[k] }));
    const p = input.products.map((t) => ({ coefficient: t.coefficient, value: t.energies[k] }));
    return { delta: reactionDelta(r, p), barrier: input.transitionState ? barrierDelta(r, input.transitionState[k]) : null };
  };
  const E = pick("E"), Z = pick("EZPE"), H = pick("H"), G = pick("G");
  return {
    deltaE: E.delta, deltaEZPE: Z.delta, deltaH: H.delta, deltaG: G.delta,
    barrierE: E.barrier, barrierEZPE: Z.barrier, barrierH: H.barrier, barrierG: G.barrier,
  };
}

/**
 * Profile barriers: for each transition state in an ordered pathway, the barrier against the lowest
 * minimum that precedes it (values relative, any one unit).
 */
export function profileBarriers(states: ReadonlyArray<{ label: string; kind: "minimum" | "transition-state"; value: number }>): Array<{ label: string; barrier: number; from: string }> {
  const out: Array<{ label: string; barrier: number; from: string }> = [];
  let low: { label: string; value: number } | null = null;
  states.forEach((s, i) => {
    requireFinite(s.value, `states[${i}].value`);
    if (s.kind === "transition-state") {
      if (!low) throw new ThermoInputError(`states[${i}]`, `Transition state ${s.label} has no minimum before it.`);
      out.push({ label: s.label, barrier: s.value - low.value, from: low.label });
    } else if (s.kind === "minimum") {
      if (!low || s.value < low.value) low = { label: s.label, value: s.value };
    } else throw new ThermoInputError(`states[${i}].kind`, 'kind must be "minimum" or "transition-state".');
  });
  return out;
}
