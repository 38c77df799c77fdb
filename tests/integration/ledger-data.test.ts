import { beforeAll, describe, expect, test } from "vitest";
import { api, BASE_URL, DEMO, newProject, signUp, tokenFor, unique } from "./helpers";

/**
 * Levels, species, calculations and protocols through the API: creation, alias reuse, validation that
 * stores nothing, permissions of every route, optimistic locking, history and the grid's all-or-nothing paste.
 */
type Who = { token?: string; cookie?: string };
const call = (path: string, who: Who, method = "GET", body?: unknown) =>
  api(path, { method, token: who.token, body, headers: who.cookie ? { Cookie: who.cookie } : {} });

let projectId: number;
let owner: Who;
let editor: Who;
let auditor: Who;
let viewer: Who;
let stranger: Who;
const p = (rest: string) => `/api/v1/projects/${projectId}${rest}`;

beforeAll(async () => {
  const editorEmail = `${unique("editor")}@example.test`;
  const editorCookie = await signUp(editorEmail);
  const strangerCookie = await signUp(`${unique("stranger")}@example.test`);
  const made = await newProject(DEMO.chemist, [
    { email: editorEmail, role: "editor" },
    { email: DEMO.supervisor, role: "auditor" },
    { email: DEMO.coauthor, role: "viewer" },
  ]);
  projectId = made.id;
  owner = { token: made.token };
  editor = { cookie: editorCookie };
  auditor = { token: await tokenFor(DEMO.supervisor) };
  viewer = { token: await tokenFor(DEMO.coauthor) };
  stranger = { cookie: strangerCookie };
});

describe("creating through the API", () => {
  test("a level, its alias reused (200), a species, a calculation and a protocol", async () => {
    const level = await call(p("/levels"), owner, "POST", { method: "B3LYP-D3(BJ)", basis: "def2-SVP" });
    expect(level.status).toBe(201);
    expect(level.body.level).toMatchObject({ key: expect.any(String), name: "B3LYP-D3(BJ)/def2-SVP" });
    // 6-31G** and 6-31G(d,p) name the same basis; D3BJ = D3(BJ) (PRODUCT.md §2).
    const alias = await call(p("/levels"), owner, "POST", { method: "b3lyp", dispersion: "D3BJ", basis: "def2svp" });
    expect(alias.status).toBe(200);
    expect(alias.body.level.id).toBe(level.body.level.id);
    expect(alias.body.reused).toBe(true);
    const pople1 = await call(p("/levels"), owner, "POST", { method: "M06-2X", basis: "6-31G**" });
    const pople2 = await call(p("/levels"), owner, "POST", { method: "M06-2X", basis: "6-31G(d,p)" });
    expect([pople1.status, pople2.status]).toEqual([201, 200]);
    const zero = await call(p("/levels"), owner, "POST", { method: "B3LYP-D3(0)", basis: "def2-SVP" });
    expect(zero.status).toBe(201);
    expect(zero.body.level.id).not.toBe(level.body.level.id);

    const water = await call(p("/species"), owner, "POST", {
      label: "H2O",
      smiles: "O",
      geometry: { format: "xyz", data: "3\nwater\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692" },
      symmetryNumber: 2,
    });
    expect(water.status).toBe(201);
    expect(water.body.species).toMatchObject({ label: "H2O", formula: "H2O", charge: 0, multiplicity: 1, hasGeometry: true });

    const calc = await call(p("/calculations"), owner, "POST", {
      species: "H2O",
      level: "B3LYP-D3BJ/def2SVP",
      electronicEnergy: "-76.4089123456789012",
      frequencies: [1627.1, 3793.2, 3898.5],
      thermal: { temperature: 298.15, zpe: "0.021305", enthalpyCorrection: "0.025084", gibbsCorrection: "0.003667" },
    });
    expect(calc.status).toBe(201);
    // The energy comes back exactly as entered, as a decimal string in hartree.
    expect(calc.body.calculation.electronicEnergy).toBe("-76.4089123456789012");
    expect(calc.body.calculation.level.id).toBe(level.body.level.id);

    const protocol = await call(p("/protocols"), owner, "POST", { name: "gas", energyLevel: level.body.level.key });
    expect(protocol.status).toBe(201);
    expect(protocol.body.protocol).toMatchObject({ name: "gas", temperature: 298.15, standardState: "1 atm", isDefault: true });
    const second = await call(p("/protocols"), owner, "POST", {
      name: "solution",
      energyLevel: zero.body.level.id,
      thermalLevel: level.body.level.id,
      standardState: "1 M",
      lowFrequency: { treatment: "grimme", cutoff: 100 },
    });
    expect(second.status).toBe(201);
    expect(second.body.protocol.isDefault).toBe(false);
    expect(second.body.protocol.notation).toBe("B3LYP-D3(0)/def2-SVP // B3LYP-D3(BJ)/def2-SVP");
    const pick = await call(p(`/protocols/${second.body.protocol.id}`), editor, "PATCH", { isDefault: true });
    expect(pick.status).toBe(200);
    expect(pick.body.protocol.isDefault).toBe(true);
    const project = await call(`/api/v1/projects/${projectId}`, owner);
    expect(project.body.project.defaultProtocolId).toBe(second.body.protocol.id);
  });
});

describe("bad input is refused with the field named, and nothing is stored", () => {
  const count = async (kind: string) => ((await call(p(`/${kind}`), owner)).body[kind] as unknown[]).length;

  test.each([
    ["species", { label: "CH2", formula: "CH2", multiplicity: 2 }, "multiplicity"],
    ["species", { label: "bad geo", formula: "C2H4" }, "label"],
    ["species", { label: "ethene", smiles: "C=C", geometry: { format: "xyz", data: "C 0 0 0\nC 0 0 1.33" } }, "geometry"],
    ["species", { label: "nothing" }, "formula"],
    ["calculations", { species: "TS9", level: "B3LYP-D3(BJ)/def2-SVP", electronicEnergy: "-1.5" }, "species"],
    ["calculations", { species: "H2O", level: "PBE/def2-QZVP", electronicEnergy: "-76.4" }, "level"],
    ["calculations", { species: "H2O", level: "B3LYP-D3(BJ)/def2-SVP", electronicEnergy: "12.5" }, "electronicEnergy"],
    ["calculations", { species: "H2O", level: "B3LYP-D3(BJ)/def2-SVP", electronicEnergy: "minus seventy" }, "electronicEnergy"],
    ["protocols", { name: "hot", energyLevel: "B3LYP-D3(BJ)/def2-SVP", temperature: -5 }, "temperature"],
    ["protocols", { name: "odd", energyLevel: "nope/nothing" }, "energyLevel"],
  ])("POST %s %j → 422 on %s", async (kind, body, field) => {
    const before = await count(kind);
    const res = await call(p(`/${kind}`), owner, "POST", body);
    expect(res.status).toBe(422);
    expect(res.body.error.details.map((d: { field: string }) => d.field)).toContain(field);
    expect(await count(kind)).toBe(before);
  });

  test("the unknown species is named in the message", async () => {
    const res = await call(p("/calculations"), owner, "POST", { species: "TS9", level: 1, electronicEnergy: "-1" });
    expect(res.body.error.message).toBe('species "TS9" is not in this project');
  });

  test("an impossible multiplicity says why", async () => {
    const res = await call(p("/species"), owner, "POST", { label: "CH2x", formula: "CH2", multiplicity: 2 });
    // CH2 has 8 electrons: an even count allows only odd multiplicities (common practice).
    expect(res.body.error.message).toMatch(/8 electrons/);
  });
});

describe("optimistic locking and history", () => {
  test("a stale version is refused with 409 and the current values; the accepted edit is in the history", async () => {
    const created = await call(p("/species"), owner, "POST", { label: "NH3", formula: "NH3", symmetryNumber: 3 });
    const id = created.body.species.id;
    const first = await call(p(`/species/${id}`), owner, "PATCH", { notes: "pyramidal", version: 1 });
    expect(first.status).toBe(200);
    expect(first.body.species.version).toBe(2);
    const stale = await call(p(`/species/${id}`), editor, "PATCH", { symmetryNumber: 6, version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.current).toMatchObject({ id, version: 2, symmetryNumber: 3 });
    const history = await call(p(`/history?objectType=species&objectId=${id}`), owner);
    expect(history.status).toBe(200);
    expect(history.body.history.map((h: { action: string }) => h.action)).toEqual(["update", "create"]);
    expect(history.body.history[0].newValues).toMatchObject({ notes: "pyramidal" });
  });
});

describe("deletes based on a stale view", () => {
  /** One object of each kind, created and then edited once, so that version 1 is stale and 2 is current. */
  async function setUp(basis: string) {
    const tag = unique("d").replace(/-/g, "");
    const level = (await call(p("/levels"), owner, "POST", { method: "M06-2X", basis })).body.level;
    expect(level.version).toBe(1);
    const species = (await call(p("/species"), owner, "POST", { label: `HF${tag}`, formula: "HF" })).body.species;
    const conformer = (await call(p(`/species/${species.id}/conformers`), owner, "POST", { label: "c1" })).body.conformer;
    const calc = (await call(p("/calculations"), owner, "POST", { species: species.id, level: level.id, electronicEnergy: "-100.4" })).body.calculation;
    const protocol = (await call(p("/protocols"), owner, "POST", { name: `pr${tag}`, energyLevel: level.id })).body.protocol;
    const items = [
      { type: "calculation", id: calc.id, path: p(`/calculations/${calc.id}`), read: p(`/calculations/${calc.id}`), edit: { electronicEnergy: "-100.41" } },
      { type: "protocol", id: protocol.id, path: p(`/protocols/${protocol.id}`), read: p(`/protocols/${protocol.id}`), edit: { temperature: 310 } },
      { type: "conformer", id: conformer.id, path: p(`/species/${species.id}/conformers/${conformer.id}`), read: p(`/species/${species.id}/conformers`), edit: { label: "c1a" } },
      { type: "species", id: species.id, path: p(`/species/${species.id}`), read: p(`/species/${species.id}`), edit: { notes: "edited" } },
      { type: "level", id: level.id, path: p(`/levels/${level.id}`), read: p(`/levels/${level.id}`), edit: { method: "M06-2X", basis } },
    ];
    for (const it of items) {
      const edited = await call(it.path, editor, "PATCH", { ...it.edit, version: 1 });
      expect(edited.status, `${it.type} ${JSON.stringify(edited.body)}`).toBe(200);
    }
    return items;
  }
  const stillThere = async (it: { type: string; id: number; read: string }) => {
    const res = await call(it.read, owner);
    if (it.type !== "conformer") return res.status === 200;
    return (res.body.conformers as { id: number }[]).some((c) => c.id === it.id);
  };

  test("a stale version is refused with 409 and the current values, and nothing is deleted", async () => {
    for (const [i, it] of (await setUp("def2-TZVPP")).entries()) {
      // Half of them send the version in the query, half in a JSON body: both are accepted.
      const stale = i % 2 ? await call(`${it.path}?version=1`, owner, "DELETE") : await call(it.path, owner, "DELETE", { version: 1 });
      expect(stale.status, it.type).toBe(409);
      expect(stale.body.error.code, it.type).toBe("stale_version");
      expect(stale.body.error.current, it.type).toMatchObject({ id: it.id, version: 2 });
      expect(await stillThere(it), it.type).toBe(true);
      const history = await call(p(`/history?objectType=${it.type}&objectId=${it.id}`), owner);
      expect(history.body.history.map((h: { action: string }) => h.action), it.type).not.toContain("delete");
    }
  });

  test("the current version deletes, with a history row holding the old values; a bad version is bad input", async () => {
    const items = await setUp("def2-QZVP");
    const bad = await call(`${items[0]!.path}?version=abc`, owner, "DELETE");
    expect(bad.status).toBe(422);
    expect(bad.body.error.details[0].field).toBe("version");
    for (const [i, it] of items.entries()) {
      const del = i % 2 ? await call(`${it.path}?version=2`, editor, "DELETE") : await call(it.path, editor, "DELETE", { version: 2 });
      expect(del.status, `${it.type} ${JSON.stringify(del.body)}`).toBe(204);
      expect(await stillThere(it), it.type).toBe(false);
      const history = await call(p(`/history?objectType=${it.type}&objectId=${it.id}`), owner);
      expect(history.body.history[0], it.type).toMatchObject({ action: "delete", oldValues: expect.objectContaining({ id: it.id, version: 2 }) });
    }
  });

  test("without a version a delete still works (scripts)", async () => {
    const species = (await call(p("/species"), owner, "POST", { label: unique("Ne").replace(/-/g, ""), formula: "Ne" })).body.species;
    await call(p(`/species/${species.id}`), owner, "PATCH", { notes: "moved on", version: 1 });
    expect((await call(p(`/species/${species.id}`), owner, "DELETE")).status).toBe(204);
    expect((await call(p(`/species/${species.id}`), owner)).status).toBe(404);
  });
});

describe("the species page", () => {
  test("shows who stored each calculation and when, and who last updated it when that was a later edit", async () => {
    const name = `Ines Quarles ${unique("q")}`;
    const email = `${unique("storer")}@example.test`;
    const storer = { cookie: await signUp(email, undefined, name) };
    const added = await fetch(`${BASE_URL}/projects/${projectId}/members`, {
      method: "POST",
      body: new URLSearchParams({ intent: "add", email, role: "editor" }),
      headers: { Authorization: `Bearer ${owner.token}`, "Content-Type": "application/x-www-form-urlencoded" },
      redirect: "manual",
    });
    expect(added.status).toBeLessThan(400);
    const species = (await call(p("/species"), storer, "POST", { label: unique("Kr").replace(/-/g, ""), formula: "Kr" })).body.species;
    const levels = (await call(p("/levels"), owner)).body.levels as { id: number }[];
    const kept = (await call(p("/calculations"), storer, "POST", { species: species.id, level: levels[0]!.id, electronicEnergy: "-2752.1" })).body.calculation;
    const made = (await call(p("/calculations"), storer, "POST", { species: species.id, level: levels[1]!.id, electronicEnergy: "-2752.2" })).body.calculation;
    const changed = await call(p(`/calculations/${made.id}`), editor, "PATCH", { electronicEnergy: "-2752.25", version: made.version });
    expect(changed.status).toBe(200);

    const res = await fetch(`${BASE_URL}/projects/${projectId}/species/${species.id}`, { headers: { Authorization: `Bearer ${viewer.token}` } });
    expect(res.status).toBe(200);
    const html = await res.text();
    // "YYYY-MM-DD HH:MM UTC" from the stored ISO 8601 timestamps the API reports.
    const utc = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
    expect(html).toContain(`by ${name}, ${utc(kept.createdAt)}`);
    expect(html).toContain(`by ${name}, ${utc(made.createdAt)}`);
    // The editor signed up under the helper's default name.
    expect(html).toContain(`updated by Test Person, ${utc(changed.body.calculation.updatedAt)}`);
    expect(html.match(/data-testid="calculation-stored-by"/g)).toHaveLength(2);
    expect(html.match(/updated by /g)).toHaveLength(1);
  });
});

describe("the calculations grid", () => {
  test("a block with one bad cell stores nothing and lists the cell; a good block stores every cell", async () => {
    await call(p("/species"), owner, "POST", { label: "CO", formula: "CO" });
    const levels = (await call(p("/levels"), owner)).body.levels as { id: number; key: string }[];
    const [l1, l2] = [levels[0]!.id, levels[1]!.id];
    const before = ((await call(p("/calculations"), owner)).body.calculations as unknown[]).length;
    const bad = await call(p("/calculations/grid"), owner, "POST", {
      cells: [
        { species: "CO", level: l1, electronicEnergy: "-113.3", row: 0, column: 0 },
        { species: "CO", level: l2, electronicEnergy: "-113.31", row: 0, column: 1 },
        { species: "NH3", level: l1, electronicEnergy: "oops", row: 1, column: 0 },
        { species: "NH3", level: l2, electronicEnergy: "-56.5", row: 1, column: 1 },
      ],
    });
    expect(bad.status).toBe(422);
    expect(bad.body.error.details).toEqual([expect.objectContaining({ row: 1, column: 0, field: "cells[2].electronicEnergy" })]);
    expect(((await call(p("/calculations"), owner)).body.calculations as unknown[]).length).toBe(before);

    const good = await call(p("/calculations/grid"), editor, "POST", {
      cells: [
        { species: "CO", level: l1, electronicEnergy: "-113.300000000001" },
        { species: "CO", level: l2, electronicEnergy: "-113.31" },
        { species: "NH3", level: l1, electronicEnergy: "-56.5" },
        { species: "NH3", level: l2, electronicEnergy: "-56.51" },
      ],
    });
    expect(good.status).toBe(200);
    expect(good.body.grid).toEqual({ created: 4, updated: 0, unchanged: 0 });
    const grid = await call(p("/calculations/grid"), owner);
    const co = grid.body.rows.find((r: { label: string }) => r.label === "CO");
    expect(co.cells[String(l1)].energy).toBe("-113.300000000001");
    const history = await call(p("/history?objectType=calculation&limit=10"), owner);
    expect(history.body.history.filter((h: { summary: string }) => h.summary.startsWith("Grid:")).length).toBe(4);
  });
});

describe("permissions of every route", () => {
  const routes: { path: () => string; write?: { method: string; body: unknown } }[] = [
    { path: () => p("/levels"), write: { method: "POST", body: { method: "PBE0", basis: "def2-TZVP" } } },
    { path: () => p("/species"), write: { method: "POST", body: { label: unique("X").replace(/-/g, ""), formula: "He" } } },
    { path: () => p("/calculations"), write: { method: "POST", body: { species: "H2O", level: "B3LYP-D3(BJ)/def2-SVP", electronicEnergy: "-76.1" } } },
    { path: () => p("/protocols"), write: { method: "POST", body: { name: unique("pr"), energyLevel: "B3LYP-D3(BJ)/def2-SVP" } } },
    { path: () => p("/calculations/grid"), write: { method: "POST", body: { cells: [{ species: "H2O", level: "B3LYP-D3(BJ)/def2-SVP", electronicEnergy: "-76.2" }] } } },
    { path: () => p("/history") },
    { path: () => p("/species/H2O"), write: { method: "PATCH", body: { notes: "x" } } },
    { path: () => p("/species/H2O/conformers"), write: { method: "POST", body: { label: unique("c") } } },
  ];

  test("reads: members yes, non-member 404, no token 401", async () => {
    for (const r of routes) {
      for (const who of [owner, editor, auditor, viewer]) expect((await call(r.path(), who)).status, r.path()).toBe(200);
      expect((await call(r.path(), stranger)).status, r.path()).toBe(404);
      expect((await call(r.path(), {})).status, r.path()).toBe(401);
    }
  });

  test("writes: owner and editor yes, auditor and viewer 403, non-member 404, no token 401", async () => {
    for (const r of routes.filter((x) => x.write)) {
      for (const who of [auditor, viewer]) expect((await call(r.path(), who, r.write!.method, r.write!.body)).status, r.path()).toBe(403);
      expect((await call(r.path(), stranger, r.write!.method, r.write!.body)).status, r.path()).toBe(404);
      expect((await call(r.path(), {}, r.write!.method, r.write!.body)).status, r.path()).toBe(401);
      const ok = await call(r.path(), editor, r.write!.method, r.write!.body);
      expect([200, 201], `${r.path()} ${JSON.stringify(ok.body)}`).toContain(ok.status);
    }
  });

  test("per-item routes of levels, calculations and protocols: PATCH and DELETE", async () => {
    const level = (await call(p("/levels"), owner, "POST", { method: "TPSS", basis: "def2-SVP" })).body.level;
    const calc = (await call(p("/calculations"), owner, "POST", { species: "H2O", level: level.id, electronicEnergy: "-76.3" })).body.calculation;
    const protocol = (await call(p("/protocols"), owner, "POST", { name: unique("tpss"), energyLevel: level.id })).body.protocol;
    for (const [path, body] of [
      [p(`/levels/${level.id}`), { method: "TPSS", basis: "def2-SVP", version: level.version }],
      [p(`/calculations/${calc.id}`), { electronicEnergy: "-76.31", version: calc.version }],
      [p(`/protocols/${protocol.id}`), { temperature: 310, version: protocol.version }],
    ] as const) {
      for (const who of [owner, editor, auditor, viewer]) expect((await call(path, who)).status).toBe(200);
      expect((await call(path, stranger)).status).toBe(404);
      for (const who of [auditor, viewer]) {
        expect((await call(path, who, "PATCH", body)).status).toBe(403);
        expect((await call(path, who, "DELETE")).status).toBe(403);
      }
      expect((await call(path, stranger, "PATCH", body)).status).toBe(404);
      expect((await call(path, {}, "PATCH", body)).status).toBe(401);
      expect((await call(path, editor, "PATCH", body)).status).toBe(200);
      expect((await call(path, editor, "PATCH", body)).status).toBe(409);
    }
    // A level still in use is kept; removing its users first lets it go.
    expect((await call(p(`/levels/${level.id}`), editor, "DELETE")).status).toBe(409);
    expect((await call(p(`/calculations/${calc.id}`), editor, "DELETE")).status).toBe(204);
    expect((await call(p(`/protocols/${protocol.id}`), owner, "DELETE")).status).toBe(204);
    expect((await call(p(`/levels/${level.id}`), owner, "DELETE")).status).toBe(204);
    // Gone: the URL names nothing any more (404), while an unknown level in a body is bad input (422).
    expect((await call(p(`/levels/${level.id}`), owner)).status).toBe(404);
    expect((await call(p("/species/no-such-species"), owner)).status).toBe(404);
    expect((await call(p("/protocols/no-such-protocol"), owner)).status).toBe(404);
    const badRef = await call(p("/calculations"), owner, "POST", { species: "H2O", level: level.id, electronicEnergy: "-76.3" });
    expect(badRef.status).toBe(422);
    expect(badRef.body.error.details[0].field).toBe("level");
  });

  test("per-item routes of species and conformers: PATCH and DELETE", async () => {
    const species = (await call(p("/species"), owner, "POST", { label: unique("Ar").replace(/-/g, ""), formula: "Ar" })).body.species;
    const conformer = (await call(p(`/species/${species.id}/conformers`), owner, "POST", { label: "c1" })).body.conformer;
    const speciesPath = p(`/species/${species.id}`);
    const conformerPath = p(`/species/${species.id}/conformers/${conformer.id}`);
    for (const [path, body] of [
      [conformerPath, { label: "c2", version: conformer.version }],
      [speciesPath, { notes: "noble", version: species.version }],
    ] as const) {
      for (const who of [auditor, viewer]) {
        expect((await call(path, who, "PATCH", body)).status, path).toBe(403);
        expect((await call(path, who, "DELETE")).status, path).toBe(403);
      }
      expect((await call(path, stranger, "PATCH", body)).status, path).toBe(404);
      expect((await call(path, stranger, "DELETE")).status, path).toBe(404);
      expect((await call(path, {}, "PATCH", body)).status, path).toBe(401);
      expect((await call(path, {}, "DELETE")).status, path).toBe(401);
      expect((await call(path, editor, "PATCH", body)).status, path).toBe(200);
      expect((await call(path, editor, "PATCH", body)).status, path).toBe(409);
    }
    // Nothing the refused requests asked for happened.
    const conformers = (await call(p(`/species/${species.id}/conformers`), owner)).body.conformers as { id: number; label: string }[];
    expect(conformers).toEqual([expect.objectContaining({ id: conformer.id, label: "c2" })]);
    expect((await call(conformerPath, editor, "DELETE")).status).toBe(204);
    expect((await call(speciesPath, editor, "DELETE")).status).toBe(204);
  });

  test("the pages answer members and hide nothing the server would allow", async () => {
    for (const page of ["species", "levels", "calculations", "protocols"]) {
      const res = await fetch(`${BASE_URL}/projects/${projectId}/${page}`, { headers: { Authorization: `Bearer ${viewer.token}` } });
      expect(res.status, page).toBe(200);
      const html = await res.text();
      expect(html).not.toMatch(/Add species|Add level|Add protocol|Paste block/);
    }
  });
});
