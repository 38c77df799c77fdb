import { describe, expect, test } from "vitest";
import { parseTemplateCsv, readDecimal, templateCsv, parseImportFile } from "~/domain/import";
import { decimalTextToHartree } from "~/domain/thermo";

const HEAD = "Species,Formula,Charge,Multiplicity,Level,Electronic energy (hartree)";

describe("the CSV template reader", () => {
  test("reads the template it offers: every example row, no problem", () => {
    const parsed = parseTemplateCsv(templateCsv());
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows.map((r) => r.species.label)).toEqual(["HCN", "MeO-styrene", "TS-HCN-add"]);
    expect(parsed.rows[2]!.species.kind).toBe("transition-state");
    expect(parsed.rows[0]!.calculation!.frequencies).toEqual([727.1, 727.1, 2207.9, 3446.2]);
  });

  test("a UTF-8 byte-order mark, CRLF line ends and surrounding spaces are read as if absent", () => {
    const text = "\uFEFF" + HEAD + "\r\n  H2O , H2O , 0 , 1 , B3LYP/def2-SVP ,  -76.3898123456  \r\n";
    const parsed = parseTemplateCsv(new TextEncoder().encode(text));
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows[0]!.species.label).toBe("H2O");
    expect(parsed.rows[0]!.calculation!.electronicEnergyHartree).toBe("-76.3898123456");
  });

  test("`;` as separator takes `,` as the decimal mark", () => {
    const text = HEAD.replace(/,/g, ";") + "\n" + "H2O;H2O;0;1;B3LYP/def2-SVP;-76,3898123456\n";
    const parsed = parseTemplateCsv(text);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows[0]!.calculation!.electronicEnergyHartree).toBe("-76.3898123456");
  });

  test("a decimal point in a `;` file is refused by name, with row and column", () => {
    const text = HEAD.replace(/,/g, ";") + "\n" + "H2O;H2O;0;1;B3LYP/def2-SVP;-76,3898\nOH;HO;0;2;B3LYP/def2-SVP;-75.7\n";
    const parsed = parseTemplateCsv(text);
    expect(parsed.problems).toHaveLength(1);
    expect(parsed.problems[0]).toMatchObject({ row: 3, column: "Electronic energy (hartree)" });
    expect(parsed.problems[0]!.message).toMatch(/decimal point/);
  });

  test("a heading row with both `,` and `;` is refused (never guessed)", () => {
    const parsed = parseTemplateCsv("Species;Formula,Level\nA;H2,x\n");
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems[0]).toMatchObject({ row: 1 });
    expect(parsed.problems[0]!.message).toMatch(/commas.*semicolons/);
  });

  test("tab-separated text is refused by name (its decimal mark cannot be told)", () => {
    const parsed = parseTemplateCsv(HEAD.replace(/,/g, "\t") + "\nH2O\tH2O\t0\t1\tB3LYP/def2-SVP\t-76.3898123456\n");
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems).toEqual([{ row: 1, column: "", message: expect.stringMatching(/separated by tabs/) }]);
  });

  test("a Unicode minus (U+2212) is a minus", () => {
    const parsed = parseTemplateCsv(`${HEAD}\nH2O,H2O,0,1,B3LYP/def2-SVP,\u221276.3898123456\n`);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows[0]!.calculation!.electronicEnergyHartree).toBe("-76.3898123456");
  });

  test("scientific notation is read exactly (1.2E-3 is 0.0012) when it keeps its digits", () => {
    expect(readDecimal("1.2E-3", ".")).toMatchObject({ ok: true, scientific: true });
    const head = "Species,Formula,Level,Electronic energy (hartree),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree),Thermal temperature (K)";
    const parsed = parseTemplateCsv(`${head}\nH2O,H2O,B3LYP/def2-SVP,-7.638981234567E+01,2.1E-2,2.5E-2,4.0E-3,298.15\n`);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows[0]!.calculation!.electronicEnergyHartree).toBe("-76.38981234567");
    expect(parsed.rows[0]!.calculation!.thermal!.zpeHartree).toBe("0.021");
  });

  test("an absolute energy shortened by a spreadsheet (-7.63898E+01) is refused, not guessed", () => {
    const parsed = parseTemplateCsv(`${HEAD}\nH2O,H2O,0,1,B3LYP/def2-SVP,-7.63898E+01\n`);
    expect(parsed.problems).toHaveLength(1);
    expect(parsed.problems[0]).toMatchObject({ row: 2, column: "Electronic energy (hartree)" });
    expect(parsed.problems[0]!.message).toMatch(/significant digits/);
  });

  test("kcal/mol named in the heading is converted to hartree with the CODATA 2018 factor", () => {
    // 1 hartree = 627.5094740631 kcal/mol (CODATA 2018 hartree energy × N_A / 4184 J/kcal).
    const parsed = parseTemplateCsv(`Species,Formula,Level,Electronic energy (kcal/mol)\nH2O,H2O,B3LYP/def2-SVP,-47934.77\n`);
    expect(parsed.problems).toEqual([]);
    expect(Number(parsed.rows[0]!.calculation!.electronicEnergyHartree)).toBeCloseTo(-47934.77 / 627.5094740631, 9);
    // 1 hartree = 2625.4996394799 kJ/mol (CODATA 2018)
    expect(Number(decimalTextToHartree("-2625.4996394799", "kJ/mol"))).toBeCloseTo(-1, 10);
  });

  test("an unknown unit in a heading is refused at row 1 naming the column", () => {
    const parsed = parseTemplateCsv(`Species,Formula,Level,Electronic energy (kcal)\nA,H2,B3LYP/def2-SVP,-1\n`);
    expect(parsed.problems[0]).toMatchObject({ row: 1, column: "Electronic energy (kcal)" });
    expect(parsed.problems[0]!.message).toMatch(/Unknown unit/);
  });

  test("an unknown column is refused at row 1", () => {
    const parsed = parseTemplateCsv(`Species,Formula,Level,Energy\nA,H2,B3LYP/def2-SVP,-1\n`);
    expect(parsed.problems[0]).toMatchObject({ row: 1, column: "Energy" });
  });

  test("every problem of a file is listed, not only the first", () => {
    const text = `${HEAD}\nA,H2,zero,1,B3LYP/def2-SVP,-1.1\nB,H2,0,1,,-1.1\nC,H2,0,1,B3LYP/def2-SVP,abc\n`;
    const parsed = parseTemplateCsv(text);
    expect(parsed.problems.map((p) => [p.row, p.column])).toEqual([
      [2, "Charge"],
      [3, "Level"],
      [4, "Electronic energy (hartree)"],
    ]);
  });

  test("a missing level is refused by row and column", () => {
    const parsed = parseTemplateCsv(`Species,Formula,Method,Basis,Electronic energy (hartree)\nA,H2,B3LYP,,-1.17\n`);
    expect(parsed.problems).toEqual([{ row: 2, column: "Basis", message: "Give the basis with the method" }]);
  });

  test("an unterminated quote is reported", () => {
    const parsed = parseTemplateCsv(`${HEAD}\nA,"H2,0,1,B3LYP/def2-SVP,-1.17\n`);
    expect(parsed.problems.some((p) => /never closed/.test(p.message))).toBe(true);
  });

  test("format detection: a .csv file is read as the template", async () => {
    const parsed = await parseImportFile("mine.csv", new TextEncoder().encode(templateCsv()));
    expect(parsed?.format).toBe("csv");
  });
});
