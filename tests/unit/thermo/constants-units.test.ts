import { describe, expect, it } from "vitest";
import {
  HARTREE_TO_KJ_PER_MOL, HARTREE_TO_KCAL_PER_MOL, HARTREE_TO_EV, HARTREE_TO_CM1, R_GAS, PRIMARY_CONSTANTS, BOHR_TO_ANGSTROM,
  ThermoInputError, convertEnergy, energy, hartree, kcalPerMol, addEnergies, parseEnergyUnit, convertTemperature, convertPressure,
  sumHartree, hartreeDifference, ENERGY_UNITS, toHartreeDecimal, decimalTextToHartree,
} from "../../../app/domain/thermo/index";

describe("CODATA 2018 conversion factors", () => {
  // Expected values: CODATA 2018 recommended values (NIST "Fundamental Physical Constants", energy
  // conversion table), typed here from that table; the code derives them from E_h, N_A, e, h, c.
  const rel = 1e-12; // the table gives 13–14 significant digits; a retyped or wrong constant fails at 1e-7 or worse
  it.each([
    ["kJ/mol", HARTREE_TO_KJ_PER_MOL, 2625.4996394799],
    ["kcal/mol", HARTREE_TO_KCAL_PER_MOL, 627.5094740631],
    ["eV", HARTREE_TO_EV, 27.211386245988],
    ["cm-1", HARTREE_TO_CM1, 219474.6313632],
  ])("1 hartree in %s", (_u, got, expected) => {
    expect(Math.abs(got / expected - 1)).toBeLessThan(rel);
  });
  it("R = N_A k = 8.314462618 J/(mol K) (CODATA 2018, exact)", () => {
    expect(R_GAS).toBeCloseTo(8.314462618, 9);
  });
  it("Bohr radius 0.529177210903 Å (CODATA 2018)", () => {
    expect(BOHR_TO_ANGSTROM).toBeCloseTo(0.529177210903, 12);
  });
  it("every primary constant names its CODATA entry and exactness", () => {
    for (const c of PRIMARY_CONSTANTS) {
      expect(c.name.length).toBeGreaterThan(2);
      expect(typeof c.exact).toBe("boolean");
    }
    const exact = PRIMARY_CONSTANTS.filter((c) => c.exact).map((c) => c.symbol).sort();
    // 2019 SI: h, e, k, N_A, c exact; calorie, atm, bar by definition (CODATA 2018 / IUPAC)
    expect(exact).toEqual(["N_A", "atm", "bar", "c", "cal_th", "eV", "h", "k"].sort());
  });
});

describe("energy conversions", () => {
  it("thermochemical calorie: 1 kcal/mol = 4.184 kJ/mol (definition)", () => {
    expect(convertEnergy(kcalPerMol(1), "kJ/mol").value).toBeCloseTo(4.184, 12);
  });
  it("1 eV = 96.485332 kJ/mol (CODATA 2018: e N_A = Faraday constant 96485.33212 C/mol)", () => {
    expect(convertEnergy(energy(1, "eV"), "kJ/mol").value).toBeCloseTo(96.48533212, 7);
  });
  it("round-trips every pair of units (property)", () => {
    for (const a of ENERGY_UNITS) for (const b of ENERGY_UNITS) {
      for (const v of [-1234.5678, -0.0012, 1e-7, 3.5, 98765.4321]) {
        const back = convertEnergy(convertEnergy(energy(v, a), b), a).value;
        expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-14);
      }
    }
  });
  it("refuses to add different units at compile time and at run time", () => {
    const a = kcalPerMol(1);
    const b = hartree(1);
    // @ts-expect-error kcal/mol + hartree must not compile
    expect(() => addEnergies(a, b)).toThrow(ThermoInputError);
    expect(addEnergies(a, kcalPerMol(2)).value).toBe(3);
  });
  it("rejects NaN", () => {
    expect(() => energy(Number.NaN, "kcal/mol")).toThrow(ThermoInputError);
  });
});

describe("parseEnergyUnit", () => {
  it.each([
    ["kcal/mol", "kcal/mol"], ["kcal mol-1", "kcal/mol"], ["kcal mol^-1", "kcal/mol"], ["KCAL/MOL", "kcal/mol"],
    ["kJ/mol", "kJ/mol"], ["kj mol-1", "kJ/mol"], ["eV", "eV"], ["Eh", "hartree"], ["hartree", "hartree"], ["au", "hartree"],
    ["cm-1", "cm-1"], ["cm^-1", "cm-1"], ["J/mol", "J/mol"],
  ])("%s → %s", (text, unit) => {
    expect(parseEnergyUnit(text)).toBe(unit);
  });
  it("lists what it accepts when it refuses", () => {
    try {
      parseEnergyUnit("kcal");
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ThermoInputError);
      expect((e as Error).message).toMatch(/accepted: .*kcal\/mol.*hartree.*cm-1/);
      expect((e as ThermoInputError).field).toBe("unit");
    }
  });
});

describe("temperature and pressure", () => {
  it("25 °C = 298.15 K (definition of the Celsius scale)", () => {
    expect(convertTemperature(25, "C", "K")).toBeCloseTo(298.15, 10);
    expect(convertTemperature(298.15, "K", "C")).toBeCloseTo(25, 10);
  });
  it("rejects temperatures at or below absolute zero", () => {
    expect(() => convertTemperature(-273.15, "C", "K")).toThrow(ThermoInputError);
  });
  it("1 atm = 101325 Pa = 1.01325 bar (definition)", () => {
    expect(convertPressure(1, "atm", "Pa")).toBe(101325);
    expect(convertPressure(1, "atm", "bar")).toBeCloseTo(1.01325, 12);
    expect(convertPressure(100, "kPa", "atm")).toBeCloseTo(1e5 / 101325, 12);
  });
});

describe("decimal sums of absolute energies", () => {
  it("keeps 1e-10 hartree where binary floating point would not", () => {
    // 2 × (−76.4089234512) − (−152.8178469023) = −0.0000000001 exactly (decimal arithmetic)
    const s = sumHartree([
      { coefficient: 2, energyHartree: "-76.4089234512" },
      { coefficient: -1, energyHartree: "-152.8178469023" },
    ]);
    expect(s.toString()).toBe("-1e-10");
    expect(hartreeDifference("-1000.000001", "-1000.000000").toString()).toBe("-0.000001");
  });
  it("accepts Fortran D exponents and rejects text", () => {
    expect(toHartreeDecimal("-0.76408D+02").toString()).toBe("-76.408");
    expect(() => toHartreeDecimal("-76.4 kcal")).toThrow(ThermoInputError);
  });
});

describe("decimalTextToHartree", () => {
  it.each([
    // 1 Eh = 627.5094740631 kcal/mol = 2625.4996394799 kJ/mol = 27.211386245988 eV (CODATA 2018)
    ["-627.5094740631", "kcal/mol", -1],
    ["2625.4996394799", "kJ/mol", 1],
    ["27.211386245988", "eV", 1],
  ] as const)("reads %s %s as %s hartree to 1e-12", (text, unit, expected) => {
    expect(Math.abs(Number(decimalTextToHartree(text, unit)) - expected)).toBeLessThan(1e-12);
  });

  it("keeps every digit of a hartree value", () => {
    expect(decimalTextToHartree("-1234.567890123456789", "hartree")).toBe("-1234.567890123456789");
  });
});
