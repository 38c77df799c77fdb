import { createHash } from "node:crypto";
import * as XLSX from "xlsx";
import { beforeAll, describe, expect, test } from "vitest";
import { api, BASE_URL, DEMO, newProject, tokenFor } from "./helpers";

/** Imports, provenance files and the Supporting Information workbook, through the served app. */
async function upload(path: string, token: string, name: string, bytes: Uint8Array | string, type = "application/octet-stream") {
  const form = new FormData();
  form.append("file", new Blob([typeof bytes === "string" ? bytes : new Uint8Array(bytes)], { type }), name);
  const res = await fetch(BASE_URL + path, { method: "POST", body: form, headers: { Authorization: `Bearer ${token}` } });
  const text = await res.text();
  let body: any = text;
  try {
    body = JSON.parse(text);
  } catch {
    /* keep text */
  }
  return { status: res.status, body };
}

async function download(path: string, token: string) {
  const res = await fetch(BASE_URL + path, { headers: { Authorization: `Bearer ${token}` } });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

/** Species and calculations as the API lists them, for "nothing changed" comparisons. */
async function ledgerState(projectId: number, token: string) {
  const [s, c, l] = await Promise.all([
    api(`/api/v1/projects/${projectId}/species`, { token }),
    api(`/api/v1/projects/${projectId}/calculations`, { token }),
    api(`/api/v1/projects/${projectId}/levels`, { token }),
  ]);
  return { species: s.body.species, calculations: c.body.calculations, levels: l.body.levels };
}

// Bohr radius 0.529177210903 Å (CODATA 2018).
const BOHR_A = 0.529177210903;

describe("import: the template the app offers", () => {
  let p: { id: number; token: string };
  beforeAll(async () => {
    p = await newProject();
  });

  test("downloaded, previewed (nothing written), then stored, and found in the calculations", async () => {
    const t = await download(`/api/v1/projects/${p.id}/imports/template.csv`, p.token);
    expect(t.status).toBe(200);
    const before = await ledgerState(p.id, p.token);
    const dry = await upload(`/api/v1/projects/${p.id}/imports?dryRun=1`, p.token, "template.csv", t.bytes, "text/csv");
    expect(dry.status).toBe(200);
    expect(dry.body.import.summary.calculations.created).toBe(3);
    expect(dry.body.import.summary.species.created).toBe(3);
    expect(await ledgerState(p.id, p.token)).toEqual(before);

    const done = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "template.csv", t.bytes, "text/csv");
    expect(done.status).toBe(201);
    const after = await ledgerState(p.id, p.token);
    const energies = Object.fromEntries(after.calculations.map((c: any) => [c.species.label, c.electronicEnergy]));
    // The values of the template's example rows, as written in the template file.
    const rows = new TextDecoder().decode(t.bytes).trim().split(/\r\n/).slice(1).map((l) => l.split(","));
    for (const r of rows) expect(energies[r[0]!]).toBe(r[11]);
    expect(after.levels.map((l: any) => l.key)).toEqual(["b3lyp-d3(bj)/def2tzvp smd(toluene)"]);
    const hcn = after.calculations.find((c: any) => c.species.label === "HCN");
    expect(hcn.thermal).toMatchObject({ temperature: 298.15, zpe: "0.015721" });

    const again = await upload(`/api/v1/projects/${p.id}/imports?dryRun=1`, p.token, "template.csv", t.bytes, "text/csv");
    expect(again.body.import.summary.calculations).toEqual({ created: 0, updated: 0, unchanged: 3 });
  });

  test("the XLSX template imports too", async () => {
    const q = await newProject();
    const t = await download(`/api/v1/projects/${q.id}/imports/template.xlsx`, q.token);
    const done = await upload(`/api/v1/projects/${q.id}/imports`, q.token, "template.xlsx", t.bytes);
    expect(done.status).toBe(201);
    expect(done.body.import.summary.calculations.created).toBe(3);
  });
});

describe("import: the dry run says what would be created, updated or left alone, and the conflicts", () => {
  const head = "Species,Formula,Level,Electronic energy (hartree),Thermal temperature (K),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree)";
  let p: { id: number; token: string };
  beforeAll(async () => {
    p = await newProject();
    const seed = `Species,Formula,Level,Electronic energy (hartree)\nHCN,CHN,B3LYP/def2-SVP,-93.3935\nH2O,H2O,B3LYP/def2-SVP,-76.3898\n`;
    expect((await upload(`/api/v1/projects/${p.id}/imports`, p.token, "seed.csv", seed)).status).toBe(201);
  });

  test("filling missing values is an update, an identical row is left alone, a new label creates", async () => {
    const before = await ledgerState(p.id, p.token);
    const text = `${head}\nHCN,CHN,B3LYP/def2-SVP,-93.3935,298.15,0.0157,0.0190,-0.0049\nH2O,H2O,B3LYP/def2-SVP,-76.38980,,,,\nNH3,H3N,B3LYP/def2-SVP,-56.5478,,,,\n`;
    const r = await upload(`/api/v1/projects/${p.id}/imports?dryRun=1`, p.token, "fill.csv", text);
    expect(r.status).toBe(200);
    expect(r.body.import).toMatchObject({ dryRun: true, committed: false });
    expect(r.body.import.items.map((i: any) => [i.row, i.species, i.action])).toEqual([
      [2, "HCN", "update"],
      [3, "H2O", "unchanged"],
      [4, "NH3", "create"],
    ]);
    expect(r.body.import.species.find((s: any) => s.label === "NH3")).toMatchObject({ action: "create", formula: "H3N" });
    expect(await ledgerState(p.id, p.token)).toEqual(before);
  });

  test("a conflict with a stored value is refused, and the report still lists it beside what would be created", async () => {
    const before = await ledgerState(p.id, p.token);
    const text = `${head}\nHCN,CHN,B3LYP/def2-SVP,-93.3936,,,,\nNH3,H3N,B3LYP/def2-SVP,-56.5478,,,,\n`;
    const r = await upload(`/api/v1/projects/${p.id}/imports?dryRun=1`, p.token, "conflict.csv", text);
    expect(r.status).toBe(422);
    expect(r.body.error.details).toEqual([expect.objectContaining({ row: 2, column: "Electronic energy (hartree)" })]);
    expect(r.body.error.details[0].message).toMatch(/Conflicting value.*-93\.3935.*-93\.3936/);
    expect(r.body.error.report.items.map((i: any) => [i.row, i.action])).toEqual([
      [2, "conflict"],
      [3, "create"],
    ]);
    expect(await ledgerState(p.id, p.token)).toEqual(before);
  });
});

describe("import: QCSchema and XYZ", () => {
  test("a QCSchema result (geometry in bohr) lands on the level typed as B3LYP + D3(BJ), with its geometry in Å", async () => {
    const p = await newProject();
    const level = await api(`/api/v1/projects/${p.id}/levels`, { token: p.token, body: { method: "B3LYP", basis: "def2-TZVP", dispersion: "D3(BJ)" } });
    expect(level.status).toBe(201);
    const result = {
      schema_name: "qcschema_output",
      schema_version: 1,
      driver: "energy",
      model: { method: "B3LYP-D3(BJ)", basis: "def2-TZVP" },
      molecule: {
        schema_name: "qcschema_molecule",
        schema_version: 2,
        symbols: ["C", "N", "H"],
        geometry: [0, 0, 0, 0, 0, 2.1864, 0, 0, -2.0140],
        molecular_charge: 0,
        molecular_multiplicity: 1,
      },
      return_result: -93.4460110237,
      properties: { return_energy: -93.4460110237 },
      success: true,
      provenance: { creator: "example" },
    };
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "hcn.json", JSON.stringify(result), "application/json");
    expect(r.status).toBe(201);
    expect(r.body.import.summary.levels).toEqual({ created: 0, reused: 1 });
    const state = await ledgerState(p.id, p.token);
    expect(state.levels).toHaveLength(1);
    expect(state.species.map((s: any) => s.label)).toEqual(["CHN"]);
    expect(state.calculations[0]).toMatchObject({ electronicEnergy: "-93.4460110237", level: { id: level.body.level.id } });
    const sp = await api(`/api/v1/projects/${p.id}/species/${state.species[0].id}`, { token: p.token });
    const lines = sp.body.species.geometry.data.trim().split("\n");
    expect(Number(lines[3].trim().split(/\s+/)[3])).toBeCloseTo(2.1864 * BOHR_A, 5);
  });

  test("a semiempirical result without a basis and with ghost atoms: stored at the method's built-in basis, ghosts left out", async () => {
    const p = await newProject();
    const result = {
      schema_name: "qcschema_output",
      schema_version: 1,
      driver: "energy",
      model: { method: "GFN2-xTB", basis: "" },
      molecule: {
        schema_name: "qcschema_molecule",
        schema_version: 2,
        name: "water",
        symbols: ["O", "H", "H", "Ne"],
        geometry: [0, 0, -0.1294, 0, -1.4941, 1.0274, 0, 1.4941, 1.0274, 0, 0, 6],
        real: [true, true, true, false],
      },
      // GFN2-xTB total energy of water, about -5.07 hartree (from memory).
      return_result: -5.0705443,
      success: true,
    };
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "water-xtb.json", JSON.stringify(result), "application/json");
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const state = await ledgerState(p.id, p.token);
    expect(state.levels.map((l: any) => l.name)).toEqual(["GFN2-xTB/built-in"]);
    expect(state.species.map((s: any) => [s.label, s.formula])).toEqual([["water", "H2O"]]);
    expect(state.calculations[0].source).toMatch(/1 ghost atom left out/);
    const sp = await api(`/api/v1/projects/${p.id}/species/water`, { token: p.token });
    expect(sp.body.species.geometry.data.trim().split("\n")[0].trim()).toBe("3");
  });

  test("a multi-frame XYZ file becomes conformers of one species", async () => {
    const p = await newProject();
    const frame = (n: number, z: number) => `3\nspecies=water conformer=w${n}\nO 0.0 0.0 ${z.toFixed(4)}\nH 0.0 -0.757 -0.469\nH 0.0 0.757 -0.469\n`;
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "water.xyz", frame(1, 0.117) + frame(2, 0.127) + frame(3, 0.137));
    expect(r.status).toBe(201);
    expect(r.body.import.summary.conformers.created).toBe(3);
    const state = await ledgerState(p.id, p.token);
    expect(state.species).toHaveLength(1);
    const sp = await api(`/api/v1/projects/${p.id}/species/water`, { token: p.token });
    expect(sp.body.species.conformers.map((c: any) => c.label)).toEqual(["w1", "w2", "w3"]);
  });
});

describe("import: broken files are refused whole, with row and column, and change nothing", () => {
  let p: { id: number; token: string };
  const head = "Species,Formula,Charge,Multiplicity,Level,Electronic energy (hartree)";
  const good = "HCN,CHN,0,1,B3LYP-D3(BJ)/def2-TZVP,-93.4461027381";
  beforeAll(async () => {
    p = await newProject();
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "seed.csv", `${head}\n${good}\n`);
    expect(r.status).toBe(201);
  });

  const qcschemaWithoutBasis = JSON.stringify({
    schema_name: "qcschema_output", schema_version: 1, driver: "energy", model: { method: "B3LYP" },
    molecule: { schema_name: "qcschema_molecule", schema_version: 2, symbols: ["H", "H"], geometry: [0, 0, 0, 0, 0, 1.4] },
    return_result: -1.17, properties: { return_energy: -1.17 }, success: true, provenance: { creator: "example" },
  });
  const cases: [string, string, number, string, RegExp, string?][] = [
    ["a non-number", `${head}\n${good.replace("HCN", "A").replace("CHN", "H2")}\nB,H2,0,1,B3LYP/def2-SVP,about -1.1\n`, 3, "Electronic energy (hartree)", /not a number/],
    ["a positive electronic energy", `${head}\nB,H2,0,1,B3LYP/def2-SVP,1.17\n`, 2, "Electronic energy (hartree)", /negative/],
    ["an implausible energy for the formula (kcal/mol in a hartree column)", `${head}\nB,H2,0,1,B3LYP/def2-SVP,-734.2\n`, 2, "Electronic energy (hartree)", /Implausible/],
    ["an unknown unit", "Species,Formula,Level,Electronic energy (kcal)\nB,H2,B3LYP/def2-SVP,-1.17\n", 1, "Electronic energy (kcal)", /Unknown unit/],
    ["a duplicate row", `${head}\nB,H2,0,1,B3LYP/def2-SVP,-1.17\nB,H2,0,1,B3LYP/def2-SVP,-1.17\n`, 3, "Species", /Duplicate row/],
    ["a conflicting value for a stored calculation", `${head}\nHCN,CHN,0,1,B3LYP-D3(BJ)/def2-TZVP,-93.4461999999\n`, 2, "Electronic energy (hartree)", /Conflicting value/],
    ["an impossible multiplicity", `${head}\nB,H2,0,2,B3LYP/def2-SVP,-1.17\n`, 2, "Multiplicity", /impossible/],
    ["a missing level", `${head}\nB,H2,0,1,,-1.17\n`, 2, "Level", /Missing level/],
    ["a decimal comma in a comma-separated file", `${head}\nB,H2,0,1,B3LYP/def2-SVP,"-1,17"\n`, 2, "Electronic energy (hartree)", /decimal comma/],
    ["an energy a spreadsheet shortened in scientific notation", `${head}\nB,H2,0,1,B3LYP/def2-SVP,-1.17E+00\n`, 2, "Electronic energy (hartree)", /significant digits/],
    ["a QCSchema result without a basis", qcschemaWithoutBasis, 1, "model.basis", /Missing level/, "h2.json"],
    ["an XYZ frame with a coordinate that is not a number", "3\nwater\nO 0 0 0\nH 0 zero 0\nH 0 1 0\n", 4, "atoms", /coordinates must be numbers/, "water.xyz"],
  ];

  test.each(cases)("%s", async (_name, text, row, column, message, name = "broken.csv") => {
    const before = await ledgerState(p.id, p.token);
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, name, text);
    expect(r.status).toBe(422);
    expect(r.body.error.code).toBe("import_refused");
    const hit = r.body.error.details.find((d: any) => d.row === row && d.column === column);
    expect(hit, JSON.stringify(r.body.error.details)).toBeTruthy();
    expect(hit.message).toMatch(message);
    expect(await ledgerState(p.id, p.token)).toEqual(before);
  });

  test("a file with good rows and one bad row stores none of them", async () => {
    const before = await ledgerState(p.id, p.token);
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "mixed.csv", `${head}\nC,H2,0,1,B3LYP/def2-SVP,-1.17\nD,H2,0,5,B3LYP/def2-SVP,-1.17\n`);
    expect(r.status).toBe(422);
    expect(await ledgerState(p.id, p.token)).toEqual(before);
  });

  test("a viewer may not import (403), and a file without rows is refused", async () => {
    const q = await newProject(DEMO.chemist, [{ email: DEMO.coauthor, role: "viewer" }]);
    const r = await upload(`/api/v1/projects/${q.id}/imports`, await tokenFor(DEMO.coauthor), "x.csv", `${head}\n${good}\n`);
    expect(r.status).toBe(403);
    const empty = await upload(`/api/v1/projects/${q.id}/imports`, q.token, "x.csv", `${head}\n`);
    expect(empty.status).toBe(422);
    expect(empty.body.error.details[0]).toMatchObject({ row: 2 });
  });
});

describe("provenance files", () => {
  test("upload and download keep the bytes (SHA-256 checked); over the 20 MB default limit answers 413", async () => {
    const p = await newProject();
    await upload(`/api/v1/projects/${p.id}/imports`, p.token, "one.csv", "Species,Formula,Level,Electronic energy (hartree)\nHCN,CHN,B3LYP/def2-SVP,-93.39\n");
    const calc = (await api(`/api/v1/projects/${p.id}/calculations`, { token: p.token })).body.calculations[0];
    const bytes = new Uint8Array(50_000).map((_, i) => (i * 7919) % 251);
    const sha = createHash("sha256").update(bytes).digest("hex");
    const up = await upload(`/api/v1/projects/${p.id}/calculations/${calc.id}/files`, p.token, "job output.log", bytes, "text/plain");
    expect(up.status).toBe(201);
    expect(up.body.file).toMatchObject({ sizeBytes: 50_000, sha256: sha, calculationId: calc.id });
    const list = await api(`/api/v1/projects/${p.id}/calculations/${calc.id}/files`, { token: p.token });
    expect(list.body.files.map((f: any) => f.id)).toEqual([up.body.file.id]);
    const back = await download(up.body.file.downloadUrl, p.token);
    expect(back.status).toBe(200);
    expect(createHash("sha256").update(back.bytes).digest("hex")).toBe(sha);
    expect(back.headers.get("x-content-sha256")).toBe(sha);

    const big = new Uint8Array(21 * 1024 * 1024);
    const over = await upload(`/api/v1/projects/${p.id}/calculations/${calc.id}/files`, p.token, "big.bin", big);
    expect(over.status).toBe(413);
    expect(over.body.error.code).toBe("too_large");
    expect((await api(`/api/v1/projects/${p.id}/files`, { token: p.token })).body.files).toHaveLength(1);
  });
});

describe("export: the Supporting Information workbook read back by a second reader", () => {
  test("every value of every sheet matches the ledger API", async () => {
    const p = await newProject();
    const head =
      "Species,Formula,Kind,Level,Electronic energy (hartree),Frequencies (cm-1),Thermal temperature (K),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree),Converged,Source note";
    const csv = [
      head,
      "HCN,CHN,minimum,B3LYP-D3(BJ)/def2-TZVP,-93.4461027381,727.1 727.1 2207.9 3446.2,298.15,0.015721,0.019026,-0.004911,yes,job 1",
      "MeO-styrene,C9H10O,minimum,B3LYP-D3(BJ)/def2-TZVP,-424.8812630544,,298.15,0.164832,0.175203,0.127115,yes,job 2",
      "TS-add,C10H11NO,transition state,B3LYP-D3(BJ)/def2-TZVP,-518.2987713065,-412.3 48.2 61.7,298.15,0.181113,0.193457,0.139874,no,job 3",
      "Nitrile,C10H11NO,minimum,B3LYP-D3(BJ)/def2-TZVP,-518.3571209954,,298.15,0.184204,0.196122,0.144410,yes,job 4",
    ].join("\n");
    expect((await upload(`/api/v1/projects/${p.id}/imports`, p.token, "si.csv", csv)).status).toBe(201);
    const xyz = "3\nspecies=HCN\nC 0.0 0.0 0.0\nN 0.0 0.0 1.157\nH 0.0 0.0 -1.066\n";
    expect((await upload(`/api/v1/projects/${p.id}/imports`, p.token, "hcn.xyz", xyz)).status).toBe(201);
    const protocols = [
      { name: "stored corrections", energyLevel: "B3LYP-D3(BJ)/def2-TZVP", thermalSource: "stored" },
      { name: "stored, 1 M", energyLevel: "B3LYP-D3(BJ)/def2-TZVP", thermalSource: "stored", standardState: "1 M" },
    ];
    for (const body of protocols) expect((await api(`/api/v1/projects/${p.id}/protocols`, { token: p.token, body })).status).toBe(201);
    const rx = await api(`/api/v1/projects/${p.id}/reactions`, { token: p.token, body: { equation: "HCN + MeO-styrene -> Nitrile", transitionState: "TS-add" } });
    expect(rx.status).toBe(201);
    const pw = await api(`/api/v1/projects/${p.id}/pathways`, {
      token: p.token,
      body: {
        name: "addition",
        states: [
          { label: "start", terms: [{ species: "HCN", coefficient: 1 }, { species: "MeO-styrene", coefficient: 1 }] },
          { label: "TS", terms: [{ species: "TS-add", coefficient: 1 }] },
          { label: "product", terms: [{ species: "Nitrile", coefficient: 1 }] },
        ],
      },
    });
    expect(pw.status).toBe(201);

    const get = async (path: string) => (await api(`/api/v1/projects/${p.id}${path}`, { token: p.token })).body;
    const { species, calculations: calcs, levels } = await ledgerState(p.id, p.token);
    const protocolList = (await get("/protocols")).protocols;
    const ledger = await get("/reactions?unit=kJ/mol");
    const pathway = await get(`/pathways/${pw.body.pathway.id}?unit=kJ/mol`);
    const audit = await get("/audit");
    const project = (await get("")).project ?? (await api("/api/v1/projects", { token: p.token })).body.projects.find((x: any) => x.id === p.id);

    const file = await download(`/api/v1/projects/${p.id}/export.xlsx?unit=kJ/mol`, p.token);
    expect(file.status).toBe(200);
    const wb = XLSX.read(file.bytes, { type: "array", cellNF: true, cellStyles: true });
    expect(wb.SheetNames).toEqual(["Cover", "Levels", "Protocols", "Species", "Calculations", "Species by protocol", "Reactions", "Pathways", "Audit", "Coordinates"]);
    const rows = (name: string) => XLSX.utils.sheet_to_json<Record<string, unknown>>(wb.Sheets[name]!, { defval: null });
    const opt = (v: unknown) => (v === null || v === undefined || v === "" ? null : v);

    // Cover: who, when, what state, which constants.
    const cover = new Map(XLSX.utils.sheet_to_json<unknown[]>(wb.Sheets.Cover!, { header: 1 }).map((r) => [r[0], r[1]]));
    expect(cover.get("Project")).toBe(project.name);
    expect(String(cover.get("Exported by"))).toContain(DEMO.chemist);
    expect(Math.abs(Date.parse(String(cover.get("Exported at (UTC)"))) - Date.now())).toBeLessThan(10 * 60 * 1000);
    expect(String(cover.get("State"))).toMatch(/^Live state/);
    expect(cover.get("Unit of computed energies")).toBe("kJ/mol");
    expect(cover.get("Physical constants")).toBe("CODATA 2018");
    expect(cover.has("Conventions")).toBe(true);

    // Levels and protocols.
    const levelSheet = rows("Levels");
    expect(levelSheet).toHaveLength(levels.length);
    for (const l of levels) {
      const r = levelSheet.find((x) => x["Level id"] === l.id)!;
      expect([r.Level, r["Canonical key"], r.Method, r["Basis set"], opt(r.Dispersion), opt(r["Solvation model"]), opt(r.Solvent)]).toEqual([
        l.name, l.key, l.method, l.basis, l.dispersion, l.solvation?.model ?? null, l.solvation?.solvent ?? null,
      ]);
    }
    const protocolSheet = rows("Protocols");
    expect(protocolSheet).toHaveLength(protocolList.length);
    for (const q of protocolList) {
      const r = protocolSheet.find((x) => x["Protocol id"] === q.id)!;
      expect([r.Protocol, r.Default === "yes", r["Energy level"], r["Thermal level"], r["Thermal corrections"], r["Temperature (K)"], r["Standard state"], r["Low-frequency treatment"], r["Low-frequency cutoff (cm-1)"], r["Frequency scale factor"], r.Conformers]).toEqual([
        q.name, q.isDefault, q.energyLevel.name, q.thermalLevel.name, q.thermalSource, q.temperature, q.standardState, q.lowFrequency.treatment, q.lowFrequency.cutoff, q.frequencyScale, q.conformerTreatment,
      ]);
    }

    // Species and every stored value of every calculation.
    const speciesSheet = rows("Species");
    expect(speciesSheet.map((r) => r.Species).sort()).toEqual(species.map((s: any) => s.label).sort());
    for (const s of species) {
      const r = speciesSheet.find((x) => x.Species === s.label)!;
      expect([r.Formula, opt(r.SMILES), r.Charge, r.Multiplicity, r.Kind, r["Symmetry number"]]).toEqual([s.formula, s.smiles, s.charge, s.multiplicity, s.kind, s.symmetryNumber]);
    }
    const calcSheet = rows("Calculations");
    expect(calcSheet).toHaveLength(calcs.length);
    for (const c of calcs) {
      const r = calcSheet.find((x) => x["Calculation id"] === c.id)!;
      expect(r.Species).toBe(c.species.label);
      expect(opt(r.Conformer)).toBe(c.conformer?.label ?? null);
      expect(r.Level).toBe(c.level.name);
      expect(r["Electronic energy as stored (hartree, text)"]).toBe(c.electronicEnergy);
      expect(typeof r["Electronic energy (hartree)"]).toBe("number");
      expect(r["Electronic energy (hartree)"]).toBe(Number(c.electronicEnergy));
      expect(r["Thermal temperature (K)"]).toBe(c.thermal.temperature);
      expect(r["ZPE (hartree)"]).toBe(Number(c.thermal.zpe));
      expect(r["Enthalpy correction (hartree)"]).toBe(Number(c.thermal.enthalpyCorrection));
      expect(r["Gibbs correction (hartree)"]).toBe(Number(c.thermal.gibbsCorrection));
      expect(r["Frequencies (count)"]).toBe(c.frequencies?.length ?? 0);
      expect(opt(r["Frequencies (cm-1, as stored; imaginary negative)"])).toBe(c.frequencies?.length ? c.frequencies.join(" ") : null);
      expect(opt(r["Imaginary modes"])).toBe(c.frequencies ? c.imaginaryModes : null);
      expect(r.Converged).toBe(c.converged ? "yes" : "no");
      expect(r["Source note"]).toBe(c.source);
    }

    // Each species under EACH protocol, against the reaction breakdown of that protocol (all four species are in the reaction).
    const byProtocol = rows("Species by protocol");
    expect(byProtocol).toHaveLength(protocolList.length * species.length);
    for (const q of protocolList) {
      const breakdown = await get(`/reactions/${rx.body.reaction.id}/breakdown?protocol=${q.id}`);
      expect(breakdown.terms).toHaveLength(species.length);
      for (const t of breakdown.terms) {
        const r = byProtocol.find((x) => x.Protocol === q.name && x.Species === t.species.label)!;
        const m = t.members[0];
        expect(r["Thermal corrections"]).toBe(m.thermalSource);
        expect(r["ZPE (hartree)"]).toBe(m.zpeHartree);
        expect(r["Enthalpy correction (hartree)"]).toBe(m.enthalpyCorrectionHartree);
        expect(r["Gibbs correction incl. standard state (hartree)"]).toBeCloseTo(m.gibbsCorrectionHartree + (m.standardStateCorrectionHartree ?? 0), 12);
        for (const [k, heading] of [["E", "E (hartree)"], ["EZPE", "E + ZPE (hartree)"], ["H", "H (hartree)"], ["G", "G (hartree)"]] as const) {
          expect(r[heading], `${q.name} ${t.species.label} ${k}`).toBe(Number(t.absoluteHartree[k]));
        }
        expect(r["G as computed (hartree, text)"]).toBe(t.absoluteHartree.G);
      }
    }

    // Reactions in the chosen unit, the unit in every heading.
    const reactionSheet = rows("Reactions");
    expect(reactionSheet).toHaveLength(ledger.reactions.length);
    const keys: [string, string][] = [
      ["deltaE", "ΔE (kJ/mol)"], ["deltaEZPE", "ΔE+ZPE (kJ/mol)"], ["deltaH", "ΔH (kJ/mol)"], ["deltaG", "ΔG (kJ/mol)"],
      ["barrierE", "ΔE‡ (kJ/mol)"], ["barrierG", "ΔG‡ (kJ/mol)"], ["rateConstant", "k (Eyring, from ΔG‡; unit in the next column)"], ["equilibriumConstant", "K (from ΔG, dimensionless)"],
    ];
    for (const r of ledger.reactions) {
      const x = reactionSheet.find((y) => y["Reaction id"] === r.id)!;
      expect(x.Equation).toBe(r.equation);
      expect(x.Status).toBe(r.status);
      expect(opt(x["Transition state"])).toBe(r.transitionState);
      expect(x["Temperature (K)"]).toBe(r.temperatureK ?? ledger.protocol.temperatureK);
      expect(x["Unit of k"]).toBe(r.rateConstantUnit);
      expect(opt(x.Problems)).toBe(r.problems.length ? r.problems.map((q: any) => q.message).join("; ") : null);
      for (const [k, heading] of keys) {
        expect(r.values[k], k).not.toBeNull();
        expect(x[heading], heading).toBe(r.values[k]);
      }
    }

    // Pathways, state by state.
    const pathwaySheet = rows("Pathways").filter((r) => r.Pathway === "addition");
    expect(pathwaySheet.map((r) => r.State)).toEqual(pathway.states.map((s: any) => s.label));
    pathway.states.forEach((s: any, i: number) => {
      const r = pathwaySheet[i]!;
      expect([r.Position, r.Kind, r["Relative E (kJ/mol)"], r["Relative E+ZPE (kJ/mol)"], r["Relative H (kJ/mol)"], r["Relative G (kJ/mol)"]]).toEqual([
        i + 1, s.kind, s.relativeE, s.relativeEZPE, s.relativeH, s.relativeG,
      ]);
    });

    // Audit findings: every one, word for word.
    const auditSheet = rows("Audit");
    expect(auditSheet).toHaveLength(audit.findings.length);
    expect(audit.findings.length).toBeGreaterThan(0); // TS-add is marked not converged
    for (const f of audit.findings) {
      expect(auditSheet.some((r) => r.Severity === f.severity && r.Rule === f.code && r.Object === `${f.object.type} ${f.object.label}` && r.Finding === f.message), f.message).toBe(true);
    }

    // Coordinates in the SI layout: label, charge, multiplicity, energy, then the block; every atom as stored.
    const coords = XLSX.utils.sheet_to_json<unknown[]>(wb.Sheets.Coordinates!, { header: 1, defval: null });
    const withGeometry = [];
    for (const s of species) {
      const detail = (await get(`/species/${s.id}`)).species;
      if (detail.geometry) withGeometry.push({ s, atoms: detail.geometry.data.trim().split("\n").slice(2).map((l: string) => l.trim().split(/\s+/)) });
    }
    expect(withGeometry.map((g) => g.s.label)).toEqual(["HCN"]);
    for (const { s, atoms } of withGeometry) {
      const at = coords.findIndex((r) => r[0] === s.label);
      expect(coords[at + 1]!.slice(0, 2)).toEqual(["Charge", s.charge]);
      expect(coords[at + 2]!.slice(0, 2)).toEqual(["Multiplicity", s.multiplicity]);
      const calc = calcs.find((c: any) => c.species.id === s.id);
      expect(coords[at + 3]!.slice(0, 2)).toEqual(["Electronic energy (hartree)", Number(calc.electronicEnergy)]);
      expect(coords[at + 3]![4]).toBe(calc.level.name);
      expect(coords[at + 4]!.slice(0, 4)).toEqual(["Atom", "x (Å)", "y (Å)", "z (Å)"]);
      atoms.forEach((a: string[], i: number) => expect(coords[at + 5 + i]!.slice(0, 4)).toEqual([a[0], Number(a[1]), Number(a[2]), Number(a[3])]));
    }

    // Numbers are numbers with number formats; whole numbers look whole; headings frozen; columns sized.
    const cell = (sheet: string, ref: string) => wb.Sheets[sheet]![ref]!;
    expect(cell("Calculations", "E2")).toMatchObject({ t: "n", z: "0.000000000000" });
    expect(cell("Reactions", "F2")).toMatchObject({ t: "n", z: "0.00" });
    const chargeRow = coords.findIndex((r) => r[0] === "Charge") + 1;
    expect(cell("Coordinates", `B${chargeRow}`)).toMatchObject({ t: "n", z: "0" });
    expect(cell("Coordinates", `B${chargeRow + 4}`)).toMatchObject({ t: "n", z: "0.000000" });
    const zip = XLSX.CFB.read(Buffer.from(file.bytes), { type: "buffer" });
    wb.SheetNames.forEach((name, i) => {
      const xml = Buffer.from(XLSX.CFB.find(zip, `/xl/worksheets/sheet${i + 1}.xml`)!.content as Uint8Array).toString("utf8");
      if (name !== "Coordinates") expect(xml, name).toMatch(/<pane [^>]*ySplit="1"[^>]*state="frozen"/);
      expect((wb.Sheets[name]!["!cols"] ?? []).every((c) => c && (c.wch ?? c.width ?? 0) >= 6), name).toBe(true);
    });

    const csvOut = await download(`/api/v1/projects/${p.id}/export.csv?unit=kJ/mol`, p.token);
    const text = new TextDecoder().decode(csvOut.bytes);
    for (const c of calcs) expect(text).toContain(`calculation,${c.id},${c.species.label},,${c.level.name},${c.electronicEnergy},`);
    expect(text).toContain("ΔG‡ (kJ/mol)");
  });
});
