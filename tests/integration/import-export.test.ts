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

  const cases: [string, string, number, string, RegExp][] = [
    ["a non-number", `${head}\n${good.replace("HCN", "A").replace("CHN", "H2")}\nB,H2,0,1,B3LYP/def2-SVP,about -1.1\n`, 3, "Electronic energy (hartree)", /not a number/],
    ["a positive electronic energy", `${head}\nB,H2,0,1,B3LYP/def2-SVP,1.17\n`, 2, "Electronic energy (hartree)", /negative/],
    ["an implausible energy for the formula (kcal/mol in a hartree column)", `${head}\nB,H2,0,1,B3LYP/def2-SVP,-734.2\n`, 2, "Electronic energy (hartree)", /Implausible/],
    ["an unknown unit", "Species,Formula,Level,Electronic energy (kcal)\nB,H2,B3LYP/def2-SVP,-1.17\n", 1, "Electronic energy (kcal)", /Unknown unit/],
    ["a duplicate row", `${head}\nB,H2,0,1,B3LYP/def2-SVP,-1.17\nB,H2,0,1,B3LYP/def2-SVP,-1.17\n`, 3, "Species", /Duplicate row/],
    ["a conflicting value for a stored calculation", `${head}\nHCN,CHN,0,1,B3LYP-D3(BJ)/def2-TZVP,-93.4461999999\n`, 2, "Electronic energy (hartree)", /Conflicting value/],
    ["an impossible multiplicity", `${head}\nB,H2,0,2,B3LYP/def2-SVP,-1.17\n`, 2, "Multiplicity", /impossible/],
    ["a missing level", `${head}\nB,H2,0,1,,-1.17\n`, 2, "Level", /Missing level/],
  ];

  test.each(cases)("%s", async (_name, text, row, column, message) => {
    const before = await ledgerState(p.id, p.token);
    const r = await upload(`/api/v1/projects/${p.id}/imports`, p.token, "broken.csv", text, "text/csv");
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
  test("every value matches the ledger API", async () => {
    const p = await newProject();
    const head = "Species,Formula,Kind,Level,Electronic energy (hartree),Thermal temperature (K),ZPE (hartree),Enthalpy correction (hartree),Gibbs correction (hartree)";
    const csv = [
      head,
      "HCN,CHN,minimum,B3LYP-D3(BJ)/def2-TZVP,-93.4461027381,298.15,0.015721,0.019026,-0.004911",
      "MeO-styrene,C9H10O,minimum,B3LYP-D3(BJ)/def2-TZVP,-424.8812630544,298.15,0.164832,0.175203,0.127115",
      "TS-add,C10H11NO,transition state,B3LYP-D3(BJ)/def2-TZVP,-518.2987713065,298.15,0.181113,0.193457,0.139874",
      "Nitrile,C10H11NO,minimum,B3LYP-D3(BJ)/def2-TZVP,-518.3571209954,298.15,0.184204,0.196122,0.144410",
    ].join("\n");
    expect((await upload(`/api/v1/projects/${p.id}/imports`, p.token, "si.csv", csv)).status).toBe(201);
    const xyz = "3\nspecies=HCN\nC 0.0 0.0 0.0\nN 0.0 0.0 1.157\nH 0.0 0.0 -1.066\n";
    expect((await upload(`/api/v1/projects/${p.id}/imports`, p.token, "hcn.xyz", xyz)).status).toBe(201);
    const proto = await api(`/api/v1/projects/${p.id}/protocols`, { token: p.token, body: { name: "stored corrections", energyLevel: "B3LYP-D3(BJ)/def2-TZVP", thermalSource: "stored" } });
    expect(proto.status).toBe(201);
    const rx = await api(`/api/v1/projects/${p.id}/reactions`, { token: p.token, body: { equation: "HCN + MeO-styrene -> Nitrile", transitionState: "TS-add" } });
    expect(rx.status).toBe(201);

    const ledger = await api(`/api/v1/projects/${p.id}/reactions?unit=kJ/mol`, { token: p.token });
    const calcs = (await api(`/api/v1/projects/${p.id}/calculations`, { token: p.token })).body.calculations;
    const file = await download(`/api/v1/projects/${p.id}/export.xlsx?unit=kJ/mol`, p.token);
    expect(file.status).toBe(200);
    const wb = XLSX.read(file.bytes, { type: "array" });
    expect(wb.SheetNames).toEqual(["Cover", "Levels", "Protocols", "Species", "Calculations", "Species by protocol", "Reactions", "Pathways", "Audit", "Coordinates"]);
    const rows = (name: string) => XLSX.utils.sheet_to_json<Record<string, unknown>>(wb.Sheets[name]!, { defval: null });

    const cover = XLSX.utils.sheet_to_json<unknown[]>(wb.Sheets.Cover!, { header: 1 });
    expect(cover.some((r) => r[0] === "Physical constants" && r[1] === "CODATA 2018")).toBe(true);
    expect(cover.some((r) => r[0] === "State" && String(r[1]).startsWith("Live state"))).toBe(true);

    const calcSheet = rows("Calculations");
    expect(calcSheet).toHaveLength(calcs.length);
    for (const c of calcs) {
      const r = calcSheet.find((x) => x["Calculation id"] === c.id)!;
      expect(r["Electronic energy as stored (hartree, text)"]).toBe(c.electronicEnergy);
      expect(typeof r["Electronic energy (hartree)"]).toBe("number");
      expect(r["Electronic energy (hartree)"]).toBe(Number(c.electronicEnergy));
      expect(r["ZPE (hartree)"]).toBe(Number(c.thermal.zpe));
      expect(r["Gibbs correction (hartree)"]).toBe(Number(c.thermal.gibbsCorrection));
    }

    const reactionSheet = rows("Reactions");
    expect(reactionSheet).toHaveLength(ledger.body.reactions.length);
    const keys: [string, string][] = [
      ["deltaE", "ΔE (kJ/mol)"], ["deltaEZPE", "ΔE+ZPE (kJ/mol)"], ["deltaH", "ΔH (kJ/mol)"], ["deltaG", "ΔG (kJ/mol)"],
      ["barrierE", "ΔE‡ (kJ/mol)"], ["barrierG", "ΔG‡ (kJ/mol)"], ["rateConstant", "k (Eyring, from ΔG‡)"], ["equilibriumConstant", "K (from ΔG, dimensionless)"],
    ];
    for (const r of ledger.body.reactions) {
      const x = reactionSheet.find((y) => y["Reaction id"] === r.id)!;
      expect(x.Equation).toBe(r.equation);
      expect(x.Status).toBe(r.status);
      for (const [k, heading] of keys) {
        expect(r.values[k], k).not.toBeNull();
        expect(x[heading], heading).toBe(r.values[k]);
      }
    }

    const coords = XLSX.utils.sheet_to_json<unknown[]>(wb.Sheets.Coordinates!, { header: 1, defval: null });
    const at = coords.findIndex((r) => r[0] === "HCN");
    expect(coords[at + 1]).toEqual(["Charge", 0, null, null, null]);
    expect(coords[at + 3]![1]).toBe(Number(calcs.find((c: any) => c.species.label === "HCN").electronicEnergy));
    expect(coords[at + 5]).toEqual(["C", 0, 0, 0, null]);
    expect(coords[at + 6]![3]).toBe(1.157);

    const csvOut = await download(`/api/v1/projects/${p.id}/export.csv?unit=kJ/mol`, p.token);
    const text = new TextDecoder().decode(csvOut.bytes);
    expect(text).toContain("-518.3571209954");
    expect(text).toContain("ΔG‡ (kJ/mol)");
  });
});
