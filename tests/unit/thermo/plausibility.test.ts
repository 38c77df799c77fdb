import { describe, expect, test } from "vitest";
import { atomicEnergyEstimate, energyPlausibility } from "~/domain/thermo/plausibility";

describe("rough plausibility of absolute energies", () => {
  // Exact non-relativistic total energies of neutral atoms, hartree (from memory; Chakravorty, Gwaltney,
  // Davidson & Parpia, Phys. Rev. A 1993, 47, 3649): C −37.8450, O −75.0673, Ne −128.9376, Ar −527.540.
  test.each([
    [6, -37.845],
    [8, -75.0673],
    [10, -128.9376],
    [18, -527.54],
  ])("Z = %i is estimated within 3 %% of %f Eh", (z, exact) => {
    expect(Math.abs(atomicEnergyEstimate(z) / exact - 1)).toBeLessThan(0.03);
  });

  test("water near −76.4 Eh (a typical DFT value, from memory) is plausible", () => {
    expect(energyPlausibility({ H: 2, O: 1 }, "-76.4089").plausible).toBe(true);
  });

  test("the same energy typed in kcal/mol (× 627.509, CODATA 2018 factor) is caught and named", () => {
    const r = energyPlausibility({ H: 2, O: 1 }, String(-76.4089 * 627.5094740631));
    expect(r.plausible).toBe(false);
    expect(r.message).toMatch(/kcal\/mol/);
  });

  test("a positive energy is caught", () => {
    expect(energyPlausibility({ C: 6, H: 6 }, "232.2").plausible).toBe(false);
  });

  test("a Pd complex with an effective core potential (Pd ≈ −127 Eh with def2-ECP, from memory) is accepted", () => {
    // PdCl2: Cl all-electron ≈ −460.1 Eh each (from memory), Pd with ECP ≈ −127 Eh.
    expect(energyPlausibility({ Pd: 1, Cl: 2 }, String(-127 - 2 * 460.1)).plausible).toBe(true);
  });
});
