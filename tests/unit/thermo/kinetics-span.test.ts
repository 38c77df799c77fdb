import { describe, expect, it } from "vitest";
import {
  thermalFrequency, eyringRate, halfLifeFirstOrder, barrierForHalfLife, equilibriumConstant, boltzmannPopulations,
  ensembleFreeEnergy, energeticSpan, solutionStandardStateCorrection, resolveStandardState, kcalPerMol, kJPerMol,
  convertEnergy, ThermoInputError, HARTREE_TO_KCAL_PER_MOL, HDecimal,
} from "../../../app/domain/thermo/index";
import type { SpanState } from "../../../app/domain/thermo/index";

const h = 6.62607015e-34, k = 1.380649e-23, NA = 6.02214076e23; // CODATA 2018 exact
const R = NA * k;

describe("standard state", () => {
  it("1 atm → 1 mol/L ≈ +1.89 kcal/mol at 298.15 K (common practice)", () => {
    expect(solutionStandardStateCorrection({ temperatureK: 298.15, from: "1 atm" }).kcalPerMol).toBeCloseTo(1.894, 3);
  });
  it("1 bar → 1 mol/L ≈ +1.90 kcal/mol at 298.15 K (common practice)", () => {
    expect(solutionStandardStateCorrection({ temperatureK: 298.15, from: "1 bar" }).kcalPerMol).toBeCloseTo(1.902, 3);
  });
  it("water as reagent at 55.34 mol/L: RT ln(55.34 · c°RT/P°) ≈ 4.27 kcal/mol (common practice)", () => {
    const c = solutionStandardStateCorrection({ temperatureK: 298.15, concentrationMolL: 55.34 });
    expect(c.kcalPerMol).toBeCloseTo(1.894 + (R * 298.15 * Math.log(55.34)) / 4184, 3);
    expect(c.kcalPerMol).toBeCloseTo(4.27, 2);
    expect(c.hartree * HARTREE_TO_KCAL_PER_MOL).toBeCloseTo(c.kcalPerMol, 12);
  });
  it("protocol standard states", () => {
    expect(resolveStandardState("1 bar", 298.15)).toMatchObject({ pressurePa: 1e5, correctionHartree: 0 });
    expect(resolveStandardState("1 M", 298.15).pressurePa).toBe(101325);
    expect(() => resolveStandardState("2 M" as never, 298.15)).toThrow(ThermoInputError);
    expect(() => solutionStandardStateCorrection({ temperatureK: 298.15, concentrationMolL: 0 })).toThrow(ThermoInputError);
  });
});

describe("Eyring and equilibria", () => {
  it("k_B T/h at 298.15 K = 6.2124e12 s⁻¹ (from the CODATA 2018 exact k and h)", () => {
    expect(thermalFrequency(298.15) / 6.2124e12).toBeCloseTo(1, 4);
  });
  it("ΔG‡ ≈ 17.4 kcal/mol gives about one turnover per second at 298.15 K (common practice)", () => {
    const kr = eyringRate(kcalPerMol(17.4), 298.15);
    expect(kr).toBeGreaterThan(0.5);
    expect(kr).toBeLessThan(2);
  });
  it("κ scales k; units do not matter", () => {
    const a = eyringRate(kcalPerMol(20), 298.15, 0.5);
    const b = eyringRate(convertEnergy(kcalPerMol(20), "kJ/mol"), 298.15);
    expect(a / b).toBeCloseTo(0.5, 12);
  });
  it("half-life and the barrier for a half-life are inverse", () => {
    const t = 3600;
    const dG = barrierForHalfLife(t, 298.15);
    expect(dG.unit).toBe("kcal/mol");
    expect(halfLifeFirstOrder(eyringRate(dG, 298.15))).toBeCloseTo(t, 6);
    // hand arithmetic: ΔG‡ = RT ln(k_B T t½ / (h ln 2)) ≈ 22.52 kcal/mol for one hour at 298.15 K
    expect(dG.value).toBeCloseTo((R * 298.15 * Math.log(((k * 298.15) / h) * t / Math.LN2)) / 4184, 10);
    expect(dG.value).toBeCloseTo(22.52, 2);
  });
  it("K = exp(−ΔG/RT): ΔG = −RT ln 10 gives K = 10", () => {
    expect(equilibriumConstant(kJPerMol((-R * 298.15 * Math.log(10)) / 1000), 298.15)).toBeCloseTo(10, 10);
  });
  it("rejects T ≤ 0, κ ≤ 0, k ≤ 0", () => {
    expect(() => eyringRate(kcalPerMol(10), 0)).toThrow(ThermoInputError);
    expect(() => eyringRate(kcalPerMol(10), 298.15, 0)).toThrow(ThermoInputError);
    expect(() => halfLifeFirstOrder(0)).toThrow(ThermoInputError);
  });
});

describe("Boltzmann ensembles", () => {
  it("two conformers 1 kcal/mol apart", () => {
    const RT = (R * 298.15) / 4184;
    const p = boltzmannPopulations([kcalPerMol(0), kcalPerMol(1)], 298.15);
    expect(p[0]).toBeCloseTo(1 / (1 + Math.exp(-1 / RT)), 12);
    const g = ensembleFreeEnergy([kcalPerMol(0), kcalPerMol(1)], 298.15);
    expect(g.value).toBeCloseTo(-RT * Math.log(1 + Math.exp(-1 / RT)), 12);
  });
  it("n identical conformers lower G by RT ln n", () => {
    const g = ensembleFreeEnergy([kcalPerMol(5), kcalPerMol(5), kcalPerMol(5)], 298.15);
    expect(g.value).toBeCloseTo(5 - ((R * 298.15) / 4184) * Math.log(3), 12);
  });
  it("absolute hartree strings: stable and exact around the minimum", () => {
    const g = ensembleFreeEnergy(["-2345.678901234567", "-2345.678901234567"], 298.15);
    const shift = (R * 298.15 * Math.log(2)) / (4.3597447222071e-18 * NA);
    // the decimal result keeps every digit of the minimum: G_ens − G_min is exactly the float correction
    expect(new HDecimal(g).minus("-2345.678901234567").toNumber()).toBeCloseTo(-shift, 15);
    expect(g.startsWith("-2345.6795")).toBe(true); // −2345.678901 − 0.000654 (hand)
    const p = boltzmannPopulations(["-1000.0", "-999.0"], 298.15); // 627 kcal/mol apart: no overflow
    expect(p).toEqual([1, 0]);
  });
});

describe("energetic span model (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101)", () => {
  const T = 298.15;
  const RT = (R * T) / 4184;
  const kTh = (k * T) / h;
  const cycleA: SpanState[] = [
    { label: "I1", kind: "minimum", G: 0 },
    { label: "T1", kind: "transition-state", G: 12 },
    { label: "I2", kind: "minimum", G: -8 },
    { label: "T2", kind: "transition-state", G: 14 },
    { label: "I1'", kind: "minimum", G: -15 }, // first state after one turnover: ΔGr = −15
  ];
  it("hand-derived case: δE = 22 (T2 − I2), TOF from the full expression", () => {
    // Terms T_i − I_j − δG'_ij (δG' = ΔGr when T_i comes after I_j):
    // (T1,I1) 12 + 15 = 27; (T1,I2) T1 before I2: 12 + 8 = 20; (T2,I1) 14 + 15 = 29; (T2,I2) 14 + 8 + 15 = 37.
    const sum = Math.exp(27 / RT) + Math.exp(20 / RT) + Math.exp(29 / RT) + Math.exp(37 / RT);
    const tof = (kTh * (Math.exp(15 / RT) - 1)) / sum;
    const r = energeticSpan({ states: cycleA, temperatureK: T });
    expect(r.deltaE).toBeCloseTo(22, 12);
    expect(r.tdts).toBe("T2");
    expect(r.tdi).toBe("I2");
    expect(r.tof / tof).toBeCloseTo(1, 10);
    expect(tof).toBeCloseTo(4.6468e-4, 7); // hand number, computed separately
    expect(r.countedStates).toEqual(["I1", "T1", "I2", "T2"]);
    expect(r.degreeOfTofControl.T2).toBeCloseTo(Math.exp(29 / RT) / sum + Math.exp(37 / RT) / sum, 12);
  });
  it("a TDTS before the TDI takes ΔGr into the span", () => {
    const r = energeticSpan({
      states: [
        { label: "A", kind: "minimum", G: 0 }, { label: "TSa", kind: "transition-state", G: 20 },
        { label: "B", kind: "minimum", G: -15 }, { label: "TSb", kind: "transition-state", G: -10 },
        { label: "A'", kind: "minimum", G: -5 },
      ],
      temperatureK: T,
    });
    expect(r.tdts).toBe("TSa");
    expect(r.tdi).toBe("B");
    expect(r.deltaE).toBeCloseTo(20 + 15 - 5, 12);
  });
  it("same result when ΔGr is given instead of the final state", () => {
    const a = energeticSpan({ states: cycleA, temperatureK: T });
    const b = energeticSpan({ states: cycleA.slice(0, -1), temperatureK: T, reactionEnergy: kcalPerMol(-15) });
    expect(b.tof).toBeCloseTo(a.tof, 15);
  });

  // Independent route: the steady state of the cycle's rate equations with Eyring rate constants.
  function steadyState(G: number[], kinds: string[], dGr: number) {
    // Elementary steps I_a → T → I_b around the cycle; I after the last TS is I_0 + ΔGr.
    const I: number[] = [], Ts: number[] = [];
    kinds.forEach((kd, i) => (kd === "m" ? I : Ts).push(G[i]!));
    const n = I.length;
    const kf = Ts.map((t, i) => kTh * Math.exp(-(t - I[i]!) / RT));
    const kb = Ts.map((t, i) => kTh * Math.exp(-(t - (i + 1 < n ? I[i + 1]! : I[0]! + dGr)) / RT));
    // dx_i/dt = kf[i-1] x[i-1] − kb[i-1] x[i] − kf[i] x[i] + kb[i] x[i+1] = 0, Σx = 1
    const A: number[][] = [];
    const bvec: number[] = [];
    for (let i = 0; i < n; i++) {
      const row = new Array(n).fill(0);
      const p = (i - 1 + n) % n, q = (i + 1) % n;
      row[p] += kf[p]!;
      row[i] -= kb[p]! + kf[i]!;
      row[q] += kb[i]!;
      A.push(row);
      bvec.push(0);
    }
    A[n - 1] = new Array(n).fill(1);
    bvec[n - 1] = 1;
    // Gaussian elimination with partial pivoting
    for (let col = 0; col < n; col++) {
      let piv = col;
      for (let r = col + 1; r < n; r++) if (Math.abs(A[r]![col]!) > Math.abs(A[piv]![col]!)) piv = r;
      [A[col], A[piv]] = [A[piv]!, A[col]!];
      [bvec[col], bvec[piv]] = [bvec[piv]!, bvec[col]!];
      for (let r = 0; r < n; r++) {
        if (r === col) continue;
        const f = A[r]![col]! / A[col]![col]!;
        for (let cc = col; cc < n; cc++) A[r]![cc]! -= f * A[col]![cc]!;
        bvec[r]! -= f * bvec[col]!;
      }
    }
    const x = bvec.map((v, i) => v / A[i]![i]!);
    return kf[0]! * x[0]! - kb[0]! * x[1 % n]!;
  }
  const G3 = [0, 8, 2, 9, -1, 7.5];
  const K3 = ["m", "t", "m", "t", "m", "t"];
  const states3: SpanState[] = G3.map((g, i) => ({ label: `S${i}`, kind: K3[i] === "m" ? "minimum" : "transition-state", G: g }));
  it.each([-3, -0.5, 2])("TOF agrees with the steady state of the rate equations (ΔGr = %d kcal/mol)", (dGr) => {
    const r = energeticSpan({ states: [...states3, { label: "end", kind: "minimum", G: dGr }], temperatureK: T });
    expect(r.tof / steadyState(G3, K3, dGr)).toBeCloseTo(1, 9);
  });
  it("hand case agrees with the steady state too", () => {
    const r = energeticSpan({ states: cycleA, temperatureK: T });
    expect(r.tof / steadyState([0, 12, -8, 14], ["m", "t", "m", "t"], -15)).toBeCloseTo(1, 9);
  });
  it("degree of TOF control equals −∂ln TOF/∂(G_TS/RT) and +∂ln TOF/∂(G_I/RT) of the steady state", () => {
    const dGr = -3;
    const r = energeticSpan({ states: [...states3, { label: "end", kind: "minimum", G: dGr }], temperatureK: T });
    const eps = 1e-5;
    G3.forEach((_, i) => {
      const up = [...G3], dn = [...G3];
      up[i]! += eps; dn[i]! -= eps;
      const d = (Math.log(steadyState(up, K3, dGr)) - Math.log(steadyState(dn, K3, dGr))) / (2 * eps / RT);
      const x = K3[i] === "t" ? -d : d;
      expect(r.degreeOfTofControl[`S${i}`]).toBeCloseTo(x, 5);
    });
    const sumT = G3.reduce((s, _, i) => s + (K3[i] === "t" ? r.degreeOfTofControl[`S${i}`]! : 0), 0);
    expect(sumT).toBeCloseTo(1, 12);
  });
  it("rejects impossible cycles", () => {
    expect(() => energeticSpan({ states: [{ label: "A", kind: "transition-state", G: 0 }, { label: "B", kind: "minimum", G: 0 }], temperatureK: T })).toThrow(ThermoInputError);
    expect(() => energeticSpan({ states: cycleA, temperatureK: 0 })).toThrow(ThermoInputError);
    expect(() => energeticSpan({ states: [{ label: "A", kind: "minimum", G: 0 }, { label: "B", kind: "minimum", G: -1 }], temperatureK: T })).toThrow(/no transition state/);
    expect(() => energeticSpan({ states: [...cycleA.slice(0, 4), { label: "X", kind: "transition-state", G: 1 }], temperatureK: T })).toThrow(ThermoInputError);
  });
});
