import ExcelJS from "exceljs";
import { describe, expect, test } from "vitest";
import { parseImportFile, parseQcschema, parseTemplateXlsx, parseXyzFile, templateXlsx } from "~/domain/import";

// Bohr radius 0.529177210903 Å (CODATA 2018).
const BOHR = 0.529177210903;

/** A water result written to the published QCSchema output layout (geometry in bohr). */
const water = {
  schema_name: "qcschema_output",
  schema_version: 1,
  driver: "energy",
  model: { method: "B3LYP-D3(BJ)", basis: "def2-TZVP" },
  molecule: {
    schema_name: "qcschema_molecule",
    schema_version: 2,
    name: "water",
    symbols: ["O", "H", "H"],
    geometry: [0, 0, -0.1294, 0, -1.4941, 1.0274, 0, 1.4941, 1.0274],
    molecular_charge: 0,
    molecular_multiplicity: 1,
  },
  return_result: -76.4661290745,
  properties: { return_energy: -76.4661290745 },
  success: true,
  provenance: { creator: "example" },
};

describe("QCSchema results", () => {
  test("one result: level from model, species from molecule, geometry converted from bohr to Å", () => {
    const parsed = parseQcschema(JSON.stringify(water));
    expect(parsed.problems).toEqual([]);
    const r = parsed.rows[0]!;
    expect(r.species).toMatchObject({ label: "water", formula: "H2O", charge: 0, multiplicity: 1 });
    expect(r.level).toMatchObject({ method: "B3LYP-D3(BJ)", basis: "def2-TZVP" });
    expect(r.calculation!.electronicEnergyHartree).toBe("-76.4661290745");
    const h = r.species.geometryXyz!.split("\n")[3]!.trim().split(/\s+/).map(Number);
    expect(h[2]).toBeCloseTo(-1.4941 * BOHR, 7);
    expect(h[3]).toBeCloseTo(1.0274 * BOHR, 7);
  });

  test("an array and JSON lines are read entry by entry; without molecule.name the label is the formula", () => {
    const noName = { ...water, molecule: { ...water.molecule, name: undefined } };
    expect(parseQcschema(JSON.stringify([water, noName])).rows.map((r) => r.species.label)).toEqual(["water", "H2O"]);
    const lines = `${JSON.stringify(water)}\n${JSON.stringify(noName)}\n`;
    expect(parseQcschema(lines).rows).toHaveLength(2);
  });

  test("energy from properties.return_energy when the driver is not energy; frequencies from extras.frequencies_cm1", () => {
    const grad = { ...water, driver: "gradient", return_result: [0, 0, 0, 0, 0, 0, 0, 0, 0], extras: { frequencies_cm1: [1648.2, 3810.4, 3912.9] } };
    const r = parseQcschema(JSON.stringify(grad)).rows[0]!;
    expect(r.calculation!.electronicEnergyHartree).toBe("-76.4661290745");
    expect(r.calculation!.frequencies).toEqual([1648.2, 3810.4, 3912.9]);
  });

  test("a wrong schema_name, a failed result, a missing basis and a short geometry are each named", () => {
    const bad = { ...water, schema_name: "qcschema_input", success: false, model: { method: "B3LYP" }, molecule: { ...water.molecule, geometry: [0, 0, 0] } };
    const parsed = parseQcschema(JSON.stringify([water, bad]));
    expect(parsed.rows).toHaveLength(1);
    expect(parsed.problems.map((p) => [p.row, p.column])).toEqual([
      [2, "schema_name"],
      [2, "success"],
      [2, "model.basis"],
      [2, "molecule.geometry"],
    ]);
  });

  test("ghost atoms (molecule.real false) are left out of the formula and the geometry, and the note says so", () => {
    // A counterpoise-style entry: a water with the basis functions of a second water on ghost centres
    // (QCSchema molecule: `real` is an array of booleans parallel to `symbols`).
    const withGhosts = {
      ...water,
      molecule: {
        ...water.molecule,
        symbols: ["O", "H", "H", "O", "H", "H"],
        geometry: [...water.molecule.geometry, 0, 0, 5.5, 0, -1.4941, 6.6568, 0, 1.4941, 6.6568],
        real: [true, true, true, false, false, false],
      },
    };
    const parsed = parseQcschema(JSON.stringify(withGhosts));
    expect(parsed.problems).toEqual([]);
    const r = parsed.rows[0]!;
    // Hill order without carbon is alphabetical: H2O (Hill, J. Am. Chem. Soc. 22, 478 (1900)).
    expect(r.species.formula).toBe("H2O");
    const xyz = r.species.geometryXyz!.trim().split("\n");
    expect(xyz[0]!.trim()).toBe("3");
    expect(xyz.slice(2).map((l) => l.trim().split(/\s+/)[0])).toEqual(["O", "H", "H"]);
    expect(Number(xyz[4]!.trim().split(/\s+/)[3])).toBeCloseTo(1.0274 * BOHR, 7);
    expect(r.calculation!.sourceNote).toMatch(/3 ghost atoms left out/);

    // A ghost in the middle keeps the atoms after it paired with their own coordinates.
    const middle = { ...water, molecule: { ...water.molecule, symbols: ["O", "He", "H", "H"], geometry: [0, 0, -0.1294, 9, 9, 9, 0, -1.4941, 1.0274, 0, 1.4941, 1.0274], real: [true, false, true, true] } };
    const m = parseQcschema(JSON.stringify(middle)).rows[0]!;
    expect(m.species.formula).toBe("H2O");
    expect(m.species.geometryXyz).toBe(r.species.geometryXyz);
  });

  test("molecule.real that is not one boolean per symbol, or leaves no real atom, is refused with the field named", () => {
    const short = { ...water, molecule: { ...water.molecule, real: [true, false] } };
    const words = { ...water, molecule: { ...water.molecule, real: ["yes", "no", "no"] } };
    const none = { ...water, molecule: { ...water.molecule, real: [false, false, false] } };
    const parsed = parseQcschema(JSON.stringify([short, words, none]));
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems.map((p) => [p.row, p.column])).toEqual([
      [1, "molecule.real"],
      [2, "molecule.real"],
      [3, "molecule.real"],
    ]);
  });

  test("without a basis, a method that carries its own (3c composite, semiempirical) is accepted; a plain method is refused", () => {
    const entry = (model: Record<string, unknown>) => ({ ...water, model });
    const parsed = parseQcschema(
      JSON.stringify([
        entry({ method: "r2SCAN-3c", basis: "" }),
        entry({ method: "B97-3c" }),
        entry({ method: "GFN2-xTB", basis: null }),
        entry({ method: "PM7", basis: "  " }),
        entry({ method: "B3LYP", basis: "" }),
        entry({ method: "CCSD(T)" }),
      ]),
    );
    expect(parsed.rows.map((r) => r.level)).toEqual(
      ["r2SCAN-3c", "B97-3c", "GFN2-xTB", "PM7"].map((method) => ({ method, basis: "built-in", dispersion: null, solvation: null })),
    );
    expect(parsed.rows[0]!.calculation!.sourceNote).toMatch(/no basis given: r2SCAN-3c carries its own/);
    expect(parsed.problems.map((p) => [p.row, p.column])).toEqual([
      [5, "model.basis"],
      [6, "model.basis"],
    ]);
    expect(parsed.problems[0]!.message).toMatch(/B3LYP needs a basis set/);
    // A basis given with a composite is kept as written.
    expect(parseQcschema(JSON.stringify(entry({ method: "r2SCAN-3c", basis: "def2-mTZVPP" }))).rows[0]!.level).toMatchObject({ basis: "def2-mTZVPP" });
  });

  test("format detection by extension and content", async () => {
    expect((await parseImportFile("run.json", new TextEncoder().encode(JSON.stringify(water))))?.format).toBe("qcschema");
    expect((await parseImportFile("noext", new TextEncoder().encode(JSON.stringify(water))))?.format).toBe("qcschema");
  });
});

describe("XYZ files", () => {
  const frame = (comment: string, dz = 0) => `3\n${comment}\nO 0.000000 0.000000 ${(0.117 + dz).toFixed(6)}\nH 0.000000 -0.757 -0.469\nH 0.000000 0.757 -0.469\n`;

  test("several frames of one species become its conformers (c1, c2, ...)", () => {
    const parsed = parseXyzFile(frame("species=water") + frame("species=water", 0.01), "scan.xyz");
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows.map((r) => [r.species.label, r.conformer?.label])).toEqual([
      ["water", "c1"],
      ["water", "c2"],
    ]);
    expect(parsed.rows[1]!.row).toBe(6);
  });

  test("one frame: the comment word names the species, else the file name does", () => {
    expect(parseXyzFile(frame("HCN-adduct")).rows[0]!.species.label).toBe("HCN-adduct");
    expect(parseXyzFile(frame("optimised geometry, final"), "MeO-styrene.xyz").rows[0]!.species.label).toBe("MeO-styrene");
    expect(parseXyzFile(frame("x"), "a.xyz").rows[0]!.conformer).toBeNull();
  });

  test("a frame with a bad atom line is refused with its line", () => {
    const parsed = parseXyzFile("3\nwater\nO 0 0 0\nH 0 zero 0\nH 0 1 0\n");
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems[0]).toMatchObject({ row: 4 });
  });
});

describe("XLSX template", () => {
  test("the offered XLSX template reads back with its example rows", async () => {
    const parsed = await parseTemplateXlsx(await templateXlsx());
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows.map((r) => r.calculation!.electronicEnergyHartree)).toEqual(["-93.4461027381", "-424.8812630544", "-518.2987713065"]);
  });

  test("a text cell with a non-number is refused with its spreadsheet row and heading", async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet("x");
    ws.addRow(["Species", "Formula", "Level", "Electronic energy (hartree)"]);
    ws.addRow(["A", "H2", "B3LYP/def2-SVP", -1.17]);
    ws.addRow(["B", "H2", "B3LYP/def2-SVP", "n/a"]);
    const parsed = await parseTemplateXlsx(new Uint8Array(await wb.xlsx.writeBuffer()));
    expect(parsed.rows).toHaveLength(1);
    expect(parsed.problems).toEqual([{ row: 3, column: "Electronic energy (hartree)", message: 'Electronic energy "n/a" is not a number' }]);
  });
});
