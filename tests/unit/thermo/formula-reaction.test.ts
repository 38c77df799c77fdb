import { describe, expect, it } from "vitest";
import {
  parseFormula, formulaFromSmiles, molarMass, electronCount, isMultiplicityPossible, assertMultiplicity, hillFormula,
  parseEquation, checkBalance, reactionDelta, speciesEnergies, reactionEnergies, profileBarriers, convertEnergy, energy,
  ThermoInputError, HARTREE_TO_KCAL_PER_MOL,
} from "../../../app/domain/thermo/index";

describe("parseFormula", () => {
  it.each([
    ["H2O", { H: 2, O: 1 }, 0],
    ["Ca(OH)2", { Ca: 1, O: 2, H: 2 }, 0],
    ["CuSO4·5H2O", { Cu: 1, S: 1, O: 9, H: 10 }, 0],
    ["CuSO4.5H2O", { Cu: 1, S: 1, O: 9, H: 10 }, 0],
    ["CuSO4*5H2O", { Cu: 1, S: 1, O: 9, H: 10 }, 0],
    ["[Fe(CN)6]3-", { Fe: 1, C: 6, N: 6 }, -3],
    ["NH4+", { N: 1, H: 4 }, 1],
    ["C5H5N^+", { C: 5, H: 5, N: 1 }, 1],
    ["SO4^2-", { S: 1, O: 4 }, -2],
    ["SO4 2-", { S: 1, O: 4 }, -2],
    ["Fe+3", { Fe: 1 }, 3],
    ["Fe³⁺", { Fe: 1 }, 3],
    ["SO₄²⁻", { S: 1, O: 4 }, -2],
    ["OH-", { O: 1, H: 1 }, -1],
    ["Co", { Co: 1 }, 0],
    ["CO", { C: 1, O: 1 }, 0],
  ])("%s", (text, counts, charge) => {
    expect(parseFormula(text)).toEqual({ counts, charge });
  });
  it.each(["Xy2", "C6H6)", "(CH3", "", "C0", "CuSO4·"])("rejects %j naming the field", (bad) => {
    try {
      parseFormula(bad);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ThermoInputError);
      expect((e as ThermoInputError).field).toBe("formula");
    }
  });
  it("Hill notation: C, H, then alphabetical; without carbon all alphabetical (Hill, JACS 1900, 22, 478)", () => {
    expect(hillFormula(parseFormula("CH3CH2OH").counts)).toBe("C2H6O");
    expect(hillFormula(parseFormula("H2SO4").counts)).toBe("H2O4S");
    expect(hillFormula(parseFormula("NaCl").counts)).toBe("ClNa");
    expect(parseFormula(hillFormula({ S: 1, O: 4 }, -2))).toEqual({ counts: { O: 4, S: 1 }, charge: -2 });
  });
});

describe("SMILES via openchemlib", () => {
  it.each([
    ["c1ccccc1", { C: 6, H: 6 }, 0],
    ["CC(=O)[O-]", { C: 2, H: 3, O: 2 }, -1],
    ["C[N+](C)(C)C", { C: 4, H: 12, N: 1 }, 1],
    ["O", { H: 2, O: 1 }, 0],
  ])("%s", (smiles, counts, charge) => {
    expect(formulaFromSmiles(smiles)).toEqual({ counts, charge });
  });
  it("rejects bad SMILES", () => {
    expect(() => formulaFromSmiles("C1CC(")).toThrow(ThermoInputError);
  });
});

describe("masses, electrons, multiplicity", () => {
  it("molar mass of water 18.015 g/mol (IUPAC standard atomic weights, from memory)", () => {
    expect(molarMass({ H: 2, O: 1 })).toBeCloseTo(18.015, 3);
    expect(molarMass(parseFormula("CuSO4·5H2O").counts)).toBeCloseTo(249.68, 1); // from memory: 249.685
  });
  it("electron counts", () => {
    expect(electronCount({ H: 2, O: 1 }, 0)).toBe(10);
    expect(electronCount({ N: 1, H: 4 }, 1)).toBe(10);
    expect(electronCount({ O: 1, H: 1 }, -1)).toBe(10);
    expect(() => electronCount({ H: 1 }, 2)).toThrow(ThermoInputError);
  });
  it("multiplicity rules: parity and at most N+1 (common practice)", () => {
    expect(isMultiplicityPossible(16, 3)).toBe(true); // O2 triplet
    expect(isMultiplicityPossible(16, 2)).toBe(false);
    expect(isMultiplicityPossible(1, 2)).toBe(true); // H atom doublet
    expect(isMultiplicityPossible(1, 1)).toBe(false);
    expect(isMultiplicityPossible(2, 3)).toBe(true);
    expect(isMultiplicityPossible(2, 5)).toBe(false); // more unpaired electrons than electrons
    expect(isMultiplicityPossible(0, 1)).toBe(true); // H+
    expect(isMultiplicityPossible(4, 0)).toBe(false);
    for (let n = 0; n < 20; n++) for (let m = 1; m < 25; m++) {
      expect(isMultiplicityPossible(n, m)).toBe(m - 1 <= n && (n - m + 1) % 2 === 0);
    }
    expect(() => assertMultiplicity(16, 2)).toThrow(/even number of electrons/);
  });
});

describe("parseEquation", () => {
  it("reads coefficients, arrows and charged labels", () => {
    expect(parseEquation("A + 2 B -> C")).toEqual({
      reactants: [{ label: "A", coefficient: 1 }, { label: "B", coefficient: 2 }], products: [{ label: "C", coefficient: 1 }], reversible: false,
    });
    expect(parseEquation("NH4+ + OH- → NH3 + H2O").reactants.map((t) => t.label)).toEqual(["NH4+", "OH-"]);
    expect(parseEquation("1/2 O2 + H2 => H2O").reactants[0]).toEqual({ label: "O2", coefficient: 0.5 });
    expect(parseEquation("A <=> B").reversible).toBe(true);
  });
  it("a digit directly before a label belongs to the label (documented rule)", () => {
    expect(parseEquation("2B -> 3").reactants[0]).toEqual({ label: "2B", coefficient: 1 });
    expect(parseEquation("2 3 -> 4a").reactants[0]).toEqual({ label: "3", coefficient: 2 });
  });
  it("merges repeated labels", () => {
    expect(parseEquation("A + A -> A2").reactants).toEqual([{ label: "A", coefficient: 2 }]);
  });
  it.each(["A + B", "A -> B -> C", " -> B", "A -> ", "0 A -> B", "A + + B -> C"])("rejects %j", (s) => {
    expect(() => parseEquation(s)).toThrow(ThermoInputError);
  });
});

describe("checkBalance", () => {
  const f = (s: string) => parseFormula(s);
  it("balanced combustion", () => {
    const r = checkBalance({
      reactants: [{ coefficient: 1, ...f("CH4") }, { coefficient: 2, ...f("O2") }],
      products: [{ coefficient: 1, ...f("CO2") }, { coefficient: 2, ...f("H2O") }],
    });
    expect(r.balanced).toBe(true);
    expect(r.message).toBe("Balanced.");
  });
  it("names the element that does not balance", () => {
    const r = checkBalance({
      reactants: [{ coefficient: 1, ...f("CH4") }, { coefficient: 1, ...f("O2") }],
      products: [{ coefficient: 1, ...f("CO2") }, { coefficient: 2, ...f("H2O") }],
    });
    expect(r.balanced).toBe(false);
    expect(r.elementDiff).toEqual({ O: 2 });
    expect(r.message).toMatch(/O: 2 on the reactant side, 4 on the product side/);
    expect(r.electronDiff).toBe(16);
  });
  it("names a charge imbalance", () => {
    const r = checkBalance({ reactants: [{ coefficient: 1, ...f("NH3") }], products: [{ coefficient: 1, ...f("NH4+") }] });
    expect(r.elementDiff).toEqual({ H: 1 });
    expect(r.chargeDiff).toBe(1);
    expect(r.electronDiff).toBe(0); // H+ carries no electron
    expect(r.message).toMatch(/charge: 0 on the reactant side, 1 on the product side/);
  });
});

describe("reaction arithmetic", () => {
  it("Hess's law: CH4 + 2 O2 → CO2 + 2 H2O(l) = −890.3 kJ/mol", () => {
    // ΔfH°(298.15 K), kJ/mol, CODATA Key Values / NIST-JANAF (from memory): CH4 −74.87, O2 0, CO2 −393.51, H2O(l) −285.83.
    // Standard enthalpy of combustion of methane −890.3 kJ/mol (from memory, standard tables); rounding of the inputs: ±0.1.
    const h = (kj: number) => convertEnergy(energy(kj, "kJ/mol"), "hartree");
    const d = reactionDelta(
      [{ coefficient: 1, value: h(-74.87) }, { coefficient: 2, value: h(0) }],
      [{ coefficient: 1, value: h(-393.51) }, { coefficient: 2, value: h(-285.83) }],
    )!;
    expect(convertEnergy(d.quantity, "kJ/mol").value).toBeCloseTo(-890.3, 1);
  });
  it("E, E+ZPE, H, G differences and barriers in exact decimals; missing values give null", () => {
    const a = speciesEnergies({ electronicEnergy: "-100.000001", zpe: 0.01, enthalpyCorrection: 0.02, gibbsCorrection: -0.01 });
    const b = speciesEnergies({ electronicEnergy: "-50.0000005", zpe: 0.004, enthalpyCorrection: 0.008 });
    const ts = speciesEnergies({ electronicEnergy: "-99.990001", zpe: 0.009, enthalpyCorrection: 0.019, gibbsCorrection: -0.008 });
    const r = reactionEnergies({ reactants: [{ coefficient: 1, energies: a }], products: [{ coefficient: 2, energies: b }], transitionState: ts });
    expect(r.deltaE!.hartree).toBe("0"); // 2 × −50.0000005 − (−100.000001)
    expect(r.deltaEZPE!.hartree).toBe("-0.002");
    expect(r.deltaH!.hartree).toBe("-0.004");
    expect(r.deltaG).toBeNull();
    expect(r.barrierE!.hartree).toBe("0.01");
    expect(r.barrierG!.quantity.value * HARTREE_TO_KCAL_PER_MOL).toBeCloseTo(0.012 * 627.5094740631, 9);
  });
  it("rejects energies in another unit at run time", () => {
    expect(() => reactionDelta([{ coefficient: 1, value: energy(1, "kcal/mol") as never }], [])).toThrow(ThermoInputError);
  });
  it("profile barriers against the lowest preceding minimum", () => {
    const b = profileBarriers([
      { label: "A", kind: "minimum", value: 0 }, { label: "TS1", kind: "transition-state", value: 10 },
      { label: "B", kind: "minimum", value: -5 }, { label: "TS2", kind: "transition-state", value: 8 },
    ]);
    expect(b).toEqual([{ label: "TS1", barrier: 10, from: "A" }, { label: "TS2", barrier: 13, from: "B" }]);
  });
});
