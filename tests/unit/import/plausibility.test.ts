import { describe, expect, test } from "vitest";
import { electronicEnergyPlausibility } from "~/domain/thermo";

describe("plausibility of an electronic energy for its formula", () => {
  test("benzene near −232.3 hartree (a typical B3LYP value, from memory) passes", () => {
    expect(electronicEnergyPlausibility({ C: 6, H: 6 }, -232.3)).toEqual({ ok: true });
  });
  test("a positive energy is refused as positive", () => {
    expect(electronicEnergyPlausibility({ C: 6, H: 6 }, 5.2)).toMatchObject({ ok: false, reason: "positive" });
  });
  test("benzene's energy written in kcal/mol (× 627.509, CODATA 2018) is too deep", () => {
    expect(electronicEnergyPlausibility({ C: 6, H: 6 }, -232.3 * 627.5094740631)).toMatchObject({ ok: false, reason: "too-negative" });
  });
  test("a number a factor of ten too shallow is refused; a semi-empirical method is let through", () => {
    expect(electronicEnergyPlausibility({ C: 6, H: 6 }, -23.2)).toMatchObject({ ok: false, reason: "too-shallow" });
    // GFN2-xTB total energies of benzene are near −15.9 Eh (from memory): another scale.
    expect(electronicEnergyPlausibility({ C: 6, H: 6 }, -15.9, { semiempirical: true })).toEqual({ ok: true });
  });
  test("a nickel complex with a small-core potential on Ni (Ni ≈ −170 Eh with LANL2DZ, from memory) passes", () => {
    // Ni(PH3)2: P ≈ −341.2 Eh each, H ≈ −0.5 Eh each (from memory).
    expect(electronicEnergyPlausibility({ Ni: 1, P: 2, H: 6 }, -170 - 2 * 341.2 - 6 * 0.5)).toEqual({ ok: true });
  });
});
