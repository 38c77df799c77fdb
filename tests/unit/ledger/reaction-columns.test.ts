import { describe, expect, test } from "vitest";
import { formatEnergyValue, formatScientific, reactionColumns, STATUS_RANK } from "~/components/grids/reaction-columns";

describe("reaction ledger formatters", () => {
  test("energies are rounded for reading: 2 decimals in kcal/mol and kJ/mol, 3 in eV (PRODUCT.md §9)", () => {
    expect(formatEnergyValue(-32.19456, "kcal/mol")).toBe("−32.19");
    expect(formatEnergyValue(134.705, "kJ/mol")).toBe("134.71");
    expect(formatEnergyValue(-1.39612, "eV")).toBe("−1.396");
    expect(formatEnergyValue(-0.001, "kcal/mol")).toBe("0.00");
    expect(formatEnergyValue(null, "kcal/mol")).toBe("—");
  });

  test("rate and equilibrium constants in scientific notation", () => {
    expect(formatScientific(6.25e12)).toBe("6.25 × 10¹²");
    expect(formatScientific(3.1e-5)).toBe("3.10 × 10⁻⁵");
    expect(formatScientific(1.49)).toBe("1.49");
    expect(formatScientific(null)).toBe("—");
    expect(formatScientific(0)).toBe("< 10⁻³⁰⁸");
  });

  test("columns name the unit and carry the safety caution next to ΔH and k", () => {
    const cols = reactionColumns({ unit: "kJ/mol", temperatureK: 298.15 });
    const dH = cols.find((c) => c.colId === "deltaH")!;
    expect(dH.headerName).toContain("kJ/mol");
    expect(dH.headerTooltip).toContain("calorimetric");
    const k = cols.find((c) => c.colId === "rateConstant")!;
    expect(k.headerName).toContain("298.15 K");
    expect(k.headerTooltip).toContain("thermal runaway");
  });

  test("status sorts worst first", () => {
    expect(STATUS_RANK.invalid).toBeLessThan(STATUS_RANK.incomplete);
    expect(STATUS_RANK.ok).toBe(Math.max(...Object.values(STATUS_RANK)));
  });
});
