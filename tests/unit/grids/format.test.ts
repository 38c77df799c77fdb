import { describe, expect, test } from "vitest";
import {
  formatCharge, formatHartree, formatImaginary, formatKind, formatMultiplicity, parseHartreeInput, parseIntCell, parseKind,
  parseTsvBlock, placeBlock,
} from "../../../app/components/grids/format";
import { cellFlagClass, levelColId, levelIdOfCol } from "../../../app/components/grids/calculation-columns";
import { imaginaryModeProblem } from "../../../app/components/grids/species-columns";

describe("energy cells", () => {
  test("display rounds half-up to 6 decimals while the stored text keeps its digits", () => {
    // Expected values worked by hand (decimal rounding of the written digits).
    expect(formatHartree("-1234.5678904999")).toBe("-1234.567890");
    expect(formatHartree("-1234.5678905")).toBe("-1234.567891");
    expect(formatHartree("-93.5")).toBe("-93.500000");
    expect(formatHartree("-76.4D0")).toBe("-76.400000");
    expect(formatHartree(null)).toBe("");
  });

  test("typed and pasted energies: spreadsheet minus signs and spaces are read, words are not", () => {
    expect(parseHartreeInput("\u22121234.5")).toEqual({ ok: true, value: "-1234.5" });
    expect(parseHartreeInput(" -76.42 ")).toEqual({ ok: true, value: "-76.42" });
    expect(parseHartreeInput("-7.6D+01")).toEqual({ ok: true, value: "-7.6D+01" });
    expect(parseHartreeInput("")).toEqual({ ok: true, value: null });
    expect(parseHartreeInput("n/a").ok).toBe(false);
  });
});

describe("species cells", () => {
  test("charge and multiplicity read back what they show", () => {
    expect(formatCharge(1)).toBe("+1");
    expect(formatCharge(-2)).toBe("−2");
    expect(formatCharge(0)).toBe("0");
    expect(parseIntCell("−2")).toBe(-2);
    expect(parseIntCell("+1")).toBe(1);
    expect(parseIntCell("3 (triplet)")).toBe(3);
    expect(parseIntCell("x")).toBeNull();
    // Spin names: 2S+1 = 1 singlet, 2 doublet, 3 triplet (common practice).
    expect(formatMultiplicity(1)).toBe("1 (singlet)");
    expect(formatMultiplicity(2)).toBe("2 (doublet)");
    expect(formatMultiplicity(3)).toBe("3 (triplet)");
  });

  test("kinds", () => {
    expect(parseKind("TS")).toBe("transition-state");
    expect(parseKind("minimum")).toBe("minimum");
    expect(parseKind("banana")).toBeNull();
    expect(formatKind("transition-state")).toBe("transition state");
    expect(formatImaginary(null)).toBe("—");
  });

  test("imaginary modes against the kind: a transition state has exactly one (common practice)", () => {
    expect(imaginaryModeProblem({ kind: "transition-state", imaginaryModes: 1 })).toBeNull();
    expect(imaginaryModeProblem({ kind: "transition-state", imaginaryModes: 2 })).toMatch(/exactly one/);
    expect(imaginaryModeProblem({ kind: "minimum", imaginaryModes: 1 })).toMatch(/no imaginary/);
    expect(imaginaryModeProblem({ kind: "minimum", imaginaryModes: null })).toBeNull();
  });
});

describe("pasting a block", () => {
  test("tab-separated rows, Windows line ends and a trailing newline", () => {
    expect(parseTsvBlock("-1.1\t-2.2\r\n-3.3\t-4.4\r\n")).toEqual([
      ["-1.1", "-2.2"],
      ["-3.3", "-4.4"],
    ]);
  });

  test("the block lands right and down of the anchor; what falls off the grid is counted", () => {
    const block = parseTsvBlock("-1\t-2\n-3\t-4");
    const { cells, outside } = placeBlock(block, { row: 1, column: 0 }, [10, 11, 12], [100, 101]);
    expect(outside).toBe(0);
    expect(cells.map((c) => [c.species, c.level, c.electronicEnergy])).toEqual([
      [11, 100, "-1"],
      [11, 101, "-2"],
      [12, 100, "-3"],
      [12, 101, "-4"],
    ]);
    expect(placeBlock(block, { row: 2, column: 1 }, [10, 11, 12], [100, 101]).outside).toBe(3);
  });

  test("an empty pasted cell changes nothing; an unreadable one is sent as typed for the server to name", () => {
    const { cells } = placeBlock([["", "abc"]], { row: 0, column: 0 }, [1], [5, 6]);
    expect(cells).toEqual([
      { species: 1, level: 5, electronicEnergy: null, row: 0, column: 0 },
      { species: 1, level: 6, electronicEnergy: "abc", row: 0, column: 1 },
    ]);
  });

  test("level column ids and flag classes", () => {
    expect(levelIdOfCol(levelColId(42))).toBe(42);
    expect(levelIdOfCol("species")).toBeNull();
    expect(cellFlagClass({ calculationId: 1, energy: "-1", version: 1, count: 1, hasFrequencies: false, flags: [] })).toBe("");
    expect(cellFlagClass({ calculationId: 1, energy: "-1", version: 1, count: 1, hasFrequencies: false, flags: [{ code: "not-converged", severity: "error", message: "" }] })).toMatch(/bad/);
  });
});
