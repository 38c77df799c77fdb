/**
 * Energetic span model of a catalytic cycle: Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101
 * (and J. Phys. Chem. A 2008, 112, 6032).
 *
 * Input convention: the cycle is given ONCE around, in order, starting at the resting state (state 0,
 * a minimum). Either
 *   (a) without `reactionEnergy`: the last state is the first state after one turnover (catalyst +
 *       products), a minimum; its G relative to state 0 is the reaction energy ΔGr, and it is NOT counted
 *       again as an intermediate (it duplicates state 0); or
 *   (b) with `reactionEnergy` ΔGr: every state given is counted, and the cycle closes back on state 0.
 * Energies may be numbers in kcal/mol or Quantities; all are taken relative to state 0.
 *
 *   TOF = (k_B T/h) (e^{−ΔGr/RT} − 1) / Σ_ij e^{(T_i − I_j − δG'_ij)/RT}
 *
 * with ΔGr < 0 for an exergonic cycle and δG'_ij = ΔGr when transition state T_i comes AFTER
 * intermediate I_j in the listed cycle, 0 when it comes before (the paper's rule "ΔGr if i > j").
 * Dividing through by e^{−ΔGr/RT} shows the meaning: a TS before the intermediate is met only in the
 * next turnover, ΔGr lower. The energetic span is δE = T_TDTS − I_TDI if the TDTS comes after the TDI,
 * T_TDTS − I_TDI + ΔGr if before; TDTS and TDI are the states of largest degree of TOF control
 *   X_TOF,i = Σ_j e^{(T_i − I_j − δG'_ij)/RT} / Σ_ij …,  X_TOF,j = Σ_i e^{(T_i − I_j − δG'_ij)/RT} / Σ_ij …
 * The full expression is exact for a cycle of elementary steps with Eyring rate constants (checked in
 * the tests against the steady state of the rate equations).
 */
import { R_GAS } from "./constants";
import { ThermoInputError, requireFinite, requireTemperature } from "./errors";
import { assertQuantity, J_PER_MOL } from "./units";
import type { Quantity } from "./units";
import { thermalFrequency } from "./kinetics";

export interface SpanState {
  label: string;
  kind: "minimum" | "transition-state";
  /** Relative free energy: a number in kcal/mol, or a Quantity. */
  G: number | Quantity;
}
export interface EnergeticSpanInput {
  states: readonly SpanState[];
  temperatureK: number;
  /** ΔGr of one turnover; see the input convention (b). */
  reactionEnergy?: number | Quantity;
}
export interface EnergeticSpanResult {
  unit: "kcal/mol";
  /** Energetic span δE, kcal/mol. */
  deltaE: number;
  tdts: string;
  tdi: string;
  /** Full-expression TOF, s⁻¹ (negative if the cycle runs backwards, ΔGr > 0). */
  tof: number;
  /** (k_B T/h) e^{−δE/RT}, s⁻¹: the span approximation. */
  tofFromSpan: number;
  reactionEnergy: number;
  /** Degree of TOF control of each counted state (transition states and intermediates), by label. */
  degreeOfTofControl: Record<string, number>;
  /** Labels of the states counted in the sums, in cycle order. */
  countedStates: string[];
}

const KCAL = J_PER_MOL["kcal/mol"];
function toJ(v: number | Quantity, field: string): number {
  if (typeof v === "number") return requireFinite(v, field) * KCAL;
  const q = assertQuantity(v, field);
  return q.value * J_PER_MOL[q.unit];
}

export function energeticSpan(input: EnergeticSpanInput): EnergeticSpanResult {
  const T = requireTemperature(input.temperatureK);
  const states = input.states;
  if (!Array.isArray(states) || states.length < 2) throw new ThermoInputError("states", "A cycle needs at least a resting state and a transition state.");
  states.forEach((s, i) => {
    if (!s || typeof s.label !== "string" || s.label.trim() === "") throw new ThermoInputError(`states[${i}].label`, `states[${i}] needs a label.`);
    if (s.kind !== "minimum" && s.kind !== "transition-state") throw new ThermoInputError(`states[${i}].kind`, `states[${i}].kind must be "minimum" or "transition-state".`);
  });
  if (states[0]!.kind !== "minimum") throw new ThermoInputError("states[0].kind", "The cycle must start at its resting state, a minimum.");
  const g0 = toJ(states[0]!.G, "states[0].G");
  let counted: readonly SpanState[];
  let dGr: number;
  if (input.reactionEnergy === undefined || input.reactionEnergy === null) {
    const last = states[states.length - 1]!;
    if (last.kind !== "minimum") throw new ThermoInputError(`states[${states.length - 1}].kind`, "The last state (the first after one turnover) must be a minimum; or give reactionEnergy.");
    dGr = toJ(last.G, `states[${states.length - 1}].G`) - g0;
    counted = states.slice(0, -1);
  } else {
    dGr = toJ(input.reactionEnergy, "reactionEnergy");
    counted = states;
  }
  const labels = new Set<string>();
  for (const s of counted) {
    if (labels.has(s.label)) throw new ThermoInputError("states", `Label ${JSON.stringify(s.label)} appears twice in the cycle.`);
    labels.add(s.label);
  }
  const ts: Array<{ i: number; label: string; g: number }> = [];
  const im: Array<{ i: number; label: string; g: number }> = [];
  counted.forEach((s, i) => {
    const g = toJ(s.G, `states[${i}].G`) - g0;
    (s.kind === "transition-state" ? ts : im).push({ i, label: s.label, g });
  });
  if (ts.length === 0) throw new ThermoInputError("states", "The cycle has no transition state.");

  const RT = R_GAS * T;
  // exponents (T_i − I_j − δG'_ij)/RT with δG'_ij = ΔGr when T_i comes after I_j; log-sum-exp form
  const ex: number[][] = ts.map((t) => im.map((m) => (t.g - m.g - (t.i > m.i ? dGr : 0)) / RT));
  let max = -Infinity;
  for (const row of ex) for (const e of row) if (e > max) max = e;
  const w = ex.map((row) => row.map((e) => Math.exp(e - max)));
  let total = 0;
  for (const row of w) for (const x of row) total += x;

  // numerator e^{−ΔGr/RT} − 1 in log form with its sign
  const a = -dGr / RT;
  const sign = a > 0 ? 1 : a < 0 ? -1 : 0;
  const logAbsNum = a > 30 ? a + Math.log1p(-Math.exp(-a)) : Math.log(Math.abs(Math.expm1(a)) || Number.MIN_VALUE);
  const kTh = thermalFrequency(T);
  const tof = sign === 0 ? 0 : sign * kTh * Math.exp(logAbsNum - max - Math.log(total));

  const x: Record<string, number> = {};
  let bestT = 0, bestI = 0, bestTX = -1, bestIX = -1;
  ts.forEach((t, i) => {
    const v = w[i]!.reduce((p, q) => p + q, 0) / total;
    x[t.label] = v;
    if (v > bestTX) { bestTX = v; bestT = i; }
  });
  im.forEach((m, j) => {
    let v = 0;
    for (let i = 0; i < ts.length; i++) v += w[i]![j]!;
    v /= total;
    x[m.label] = v;
    if (v > bestIX) { bestIX = v; bestI = j; }
  });
  const tdts = ts[bestT]!, tdi = im[bestI]!;
  const spanJ = tdts.g - tdi.g + (tdts.i < tdi.i ? dGr : 0);
  return {
    unit: "kcal/mol",
    deltaE: spanJ / KCAL,
    tdts: tdts.label,
    tdi: tdi.label,
    tof,
    tofFromSpan: kTh * Math.exp(-spanJ / RT),
    reactionEnergy: dGr / KCAL,
    degreeOfTofControl: x,
    countedStates: counted.map((s) => s.label),
  };
}
