/**
 * The reaction ledger through HTTP: values from entered hartree energies, and the consistency rules
 * (mixed levels, missing data, stored corrections at another temperature, TS modes, balance), the
 * permissions of every route, optimistic locking and the history.
 *
 * Reference values: CODATA 2018 (E_h N_A = 2625.4996394799 kJ/mol, i.e. 627.5094740631 kcal/mol with the
 * thermochemical calorie 4.184 J; R = 8.314462618 J mol⁻¹ K⁻¹; k_B = 1.380649e-23 J/K, h = 6.62607015e-34 J s).
 */
import { beforeAll, describe, expect, test } from "vitest";
import { api, BASE_URL, DEMO, newProject, tokenFor, unique } from "./helpers";

const KCAL_PER_HARTREE = 627.5094740631; // CODATA 2018
const KJ_PER_HARTREE = 2625.4996394799; // CODATA 2018
const R = 8.314462618; // J mol⁻¹ K⁻¹, CODATA 2018
const KB = 1.380649e-23; // J/K, exact (SI 2019)
const H = 6.62607015e-34; // J s, exact (SI 2019)

// Invented but plausible absolute energies (hartree) and stored thermal corrections at 298.15 K.
const E = { CO: -113.309312, H2: -1.179241, MeOH: -115.719004, TS: -115.64321 };
const G = { CO: -0.012145, H2: 0.001634, MeOH: 0.023371, TS: 0.021902 }; // G_corr
const Z = { CO: 0.005041, H2: 0.010048, MeOH: 0.051312, TS: 0.046101 }; // ZPE
const Hc = { CO: 0.008345, H2: 0.013351, MeOH: 0.055621, TS: 0.050455 }; // H_corr

type Ctx = { id: number; token: string };
const post = (ctx: Ctx, path: string, body: unknown) => api(`/api/v1/projects/${ctx.id}${path}`, { token: ctx.token, body });
const get = (ctx: Ctx, path: string, token = ctx.token) => api(`/api/v1/projects/${ctx.id}${path}`, { token });

async function must(ctx: Ctx, path: string, body: unknown) {
  const r = await post(ctx, path, body);
  if (r.status !== 201 && r.status !== 200) throw new Error(`${path} ${r.status} ${JSON.stringify(r.body)}`);
  return r.body;
}

async function species(ctx: Ctx, label: string, formula: string, kind: "minimum" | "transition-state" = "minimum") {
  return (await must(ctx, "/species", { label, formula, kind })).species;
}
async function calc(ctx: Ctx, speciesLabel: string, level: string | number, energy: string | null, thermal?: { temperature: number; zpe: number; enthalpyCorrection: number; gibbsCorrection: number }, frequencies?: number[]) {
  return (await must(ctx, "/calculations", { species: speciesLabel, level, electronicEnergy: energy, ...(thermal ? { thermal } : {}), ...(frequencies ? { frequencies } : {}) })).calculation;
}
const stored = (k: keyof typeof G, temperature = 298.15) => ({ temperature, zpe: Z[k], enthalpyCorrection: Hc[k], gibbsCorrection: G[k] });

describe("reaction ledger", () => {
  let ctx: Ctx;
  let l1: { id: number; key: string };
  let l2: { id: number; key: string };
  let reactionId: number;
  let viewer: string, auditor: string, outsider: string;

  beforeAll(async () => {
    ctx = await newProject(DEMO.chemist, [
      { email: DEMO.coauthor, role: "viewer" },
      { email: DEMO.supervisor, role: "auditor" },
    ]);
    viewer = await tokenFor(DEMO.coauthor);
    auditor = await tokenFor(DEMO.supervisor);
    // The admin is a site admin (sees everything); an outsider is a fresh project's non-member: another owner's project.
    outsider = await tokenFor(DEMO.supervisor);
    l1 = (await must(ctx, "/levels", { method: "wB97X-D", basis: "6-31G**" })).level;
    l2 = (await must(ctx, "/levels", { method: "M06-2X", basis: "def2-TZVP" })).level;
    await species(ctx, "CO", "CO");
    await species(ctx, "H2", "H2");
    await species(ctx, "MeOH", "CH4O");
    await species(ctx, "TS1", "CH4O", "transition-state");
    // Energies pushed with an ALIAS of level 1: ωB97X-D/6-31G(d,p) is the same level.
    await calc(ctx, "CO", "ωB97X-D/6-31G(d,p)", String(E.CO), stored("CO"));
    await calc(ctx, "H2", l1.id, String(E.H2), stored("H2"));
    await calc(ctx, "MeOH", l1.key, String(E.MeOH), stored("MeOH"));
    await calc(ctx, "TS1", l1.id, String(E.TS), stored("TS"), [-1543.2, 312.5, 640.1]);
    await must(ctx, "/protocols", { name: "stored 298", energyLevel: l1.id, thermalSource: "stored", temperature: 298.15, standardState: "1 atm" });
    const r = await must(ctx, "/reactions", { equation: "CO + 2 H2 -> MeOH", transitionState: "TS1" });
    reactionId = r.reaction.id;
  });

  test("an aliased level is reused, not duplicated", async () => {
    const again = await post(ctx, "/levels", { method: "ωB97X-D", basis: "6-31G(d,p)" });
    expect(again.status).toBe(200);
    expect(again.body.level.id).toBe(l1.id);
  });

  test("ΔE, ΔH, ΔG, barriers, k and K match a hand computation from the entered hartree values", async () => {
    const res = await get(ctx, "/reactions?unit=kcal/mol");
    expect(res.status).toBe(200);
    expect(res.body.unit).toBe("kcal/mol");
    const row = res.body.reactions.find((x: { id: number }) => x.id === reactionId);
    expect(row.status).toBe("ok");
    const dE = E.MeOH - E.CO - 2 * E.H2;
    const dG = dE + G.MeOH - G.CO - 2 * G.H2;
    const dH = dE + Hc.MeOH - Hc.CO - 2 * Hc.H2;
    const bE = E.TS - E.CO - 2 * E.H2;
    const bG = bE + G.TS - G.CO - 2 * G.H2;
    expect(row.values.deltaE).toBeCloseTo(dE * KCAL_PER_HARTREE, 6);
    expect(row.values.deltaEZPE).toBeCloseTo((dE + Z.MeOH - Z.CO - 2 * Z.H2) * KCAL_PER_HARTREE, 6);
    expect(row.values.deltaH).toBeCloseTo(dH * KCAL_PER_HARTREE, 6);
    expect(row.values.deltaG).toBeCloseTo(dG * KCAL_PER_HARTREE, 6);
    expect(row.values.barrierE).toBeCloseTo(bE * KCAL_PER_HARTREE, 6);
    expect(row.values.barrierG).toBeCloseTo(bG * KCAL_PER_HARTREE, 6);
    // Eyring k = (k_B T/h) exp(−ΔG‡/RT), K = exp(−ΔG/RT), energies in J/mol.
    const T = 298.15;
    const k = ((KB * T) / H) * Math.exp((-bG * KJ_PER_HARTREE * 1000) / (R * T));
    expect(row.values.rateConstant / k).toBeCloseTo(1, 6);
    const K = Math.exp((-dG * KJ_PER_HARTREE * 1000) / (R * T));
    expect(row.values.equilibriumConstant / K).toBeCloseTo(1, 6);

    const kj = await get(ctx, "/reactions?unit=kJ/mol");
    const rowKj = kj.body.reactions.find((x: { id: number }) => x.id === reactionId);
    expect(kj.body.unit).toBe("kJ/mol");
    expect(rowKj.values.deltaE).toBeCloseTo(dE * KJ_PER_HARTREE, 5);
    expect(rowKj.values.deltaG).toBeCloseTo(dG * KJ_PER_HARTREE, 5);
  });

  test("the breakdown names every term, the calculation used and the contributions", async () => {
    const res = await get(ctx, `/reactions/${reactionId}/breakdown?unit=kcal/mol`);
    expect(res.status).toBe(200);
    const labels = res.body.terms.map((t: { species: { label: string } }) => t.species.label);
    expect(labels).toEqual(["CO", "H2", "MeOH", "TS1"]);
    const h2 = res.body.terms[1];
    expect(h2.coefficient).toBe(2);
    expect(h2.members[0].energyCalculationId).toBeTypeOf("number");
    expect(h2.contributionInUnit.E).toBeCloseTo(-2 * E.H2 * KCAL_PER_HARTREE, 6);
  });

  test("a species with an energy only at another level is refused, naming the species and both levels", async () => {
    await species(ctx, "CH2O", "CH2O");
    await calc(ctx, "CH2O", l2.id, "-114.4792");
    const r = await must(ctx, "/reactions", { equation: "CH2O + H2 -> MeOH" });
    const row = (await get(ctx, "/reactions")).body.reactions.find((x: { id: number }) => x.id === r.reaction.id);
    expect(row.status).toBe("inconsistent");
    expect(row.values.deltaE).toBeNull();
    const p = row.problems.find((x: { code: string }) => x.code === "level_mismatch");
    expect(p.species).toBe("CH2O");
    expect(p.message).toContain("CH2O");
    expect(p.message).toMatch(/wB97X-D|ωB97X-D/);
    expect(p.message).toContain("M06-2X");
  });

  test("a missing calculation makes the row incomplete and names the species; ΔE is still given when only thermal data is missing", async () => {
    await species(ctx, "CH4", "CH4");
    await species(ctx, "H2O", "H2O");
    await calc(ctx, "H2O", l1.id, "-76.4089"); // energy, no thermal data
    const r1 = await must(ctx, "/reactions", { equation: "CO + 3 H2 -> CH4 + H2O" });
    const r2 = await must(ctx, "/reactions", { equation: "MeOH -> CO + 2 H2" });
    await calc(ctx, "CH4", l1.id, "-40.5184"); // energy only
    const rows = (await get(ctx, "/reactions")).body.reactions;
    const row1 = rows.find((x: { id: number }) => x.id === r1.reaction.id);
    expect(row1.status).toBe("incomplete");
    expect(row1.values.deltaE).toBeCloseTo((-40.5184 - 76.4089 - E.CO - 3 * E.H2) * KCAL_PER_HARTREE, 6);
    expect(row1.values.deltaG).toBeNull();
    expect(row1.reasons.deltaG).toMatch(/CH4|H2O/);
    expect(row1.problems.map((p: { species?: string }) => p.species)).toEqual(expect.arrayContaining(["CH4", "H2O"]));
    const row2 = rows.find((x: { id: number }) => x.id === r2.reaction.id);
    expect(row2.status).toBe("ok");

    await species(ctx, "CO2", "CO2");
    const r3 = await must(ctx, "/reactions", { equation: "CO2 + 3 H2 -> MeOH + H2O" });
    const row3 = (await get(ctx, "/reactions")).body.reactions.find((x: { id: number }) => x.id === r3.reaction.id);
    expect(row3.status).toBe("incomplete");
    expect(row3.values.deltaE).toBeNull();
    const p = row3.problems.find((x: { code: string }) => x.code === "missing_calculation");
    expect(p.species).toBe("CO2");
  });

  test("a transition state with two imaginary modes is an error on the row", async () => {
    await species(ctx, "TS2", "CH4O", "transition-state");
    await calc(ctx, "TS2", l1.id, "-115.6401", stored("TS"), [-1210.4, -88.7, 415.2]);
    const r = await must(ctx, "/reactions", { equation: "CO + 2 H2 -> MeOH", transitionState: "TS2" });
    const row = (await get(ctx, "/reactions")).body.reactions.find((x: { id: number }) => x.id === r.reaction.id);
    expect(row.status).toBe("invalid");
    expect(row.values.barrierE).toBeNull();
    expect(row.values.rateConstant).toBeNull();
    expect(row.values.deltaE).not.toBeNull();
    const p = row.problems.find((x: { code: string }) => x.code === "ts_imaginary_modes");
    expect(p.severity).toBe("error");
    expect(p.message).toContain("TS2");
    expect(p.message).toContain("2 imaginary");
  });

  test("an unbalanced equation is an error that says what is off", async () => {
    const r = await must(ctx, "/reactions", { equation: "CO + H2 -> MeOH" });
    const row = (await get(ctx, "/reactions")).body.reactions.find((x: { id: number }) => x.id === r.reaction.id);
    expect(row.status).toBe("unbalanced");
    expect(row.values.deltaE).toBeNull();
    const p = row.problems.find((x: { code: string }) => x.code === "unbalanced");
    expect(p.message).toMatch(/H: 2 on the reactant side, 4 on the product side/);
  });

  test("unknown species in an equation are refused and listed", async () => {
    const res = await post(ctx, "/reactions", { equation: "CO + Foo -> Bar" });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toContain("Foo");
    expect(res.body.error.message).toContain("Bar");
  });

  test("stored corrections at another temperature are not used", async () => {
    await must(ctx, "/protocols", { name: "stored 350", energyLevel: l1.id, thermalSource: "stored", temperature: 350 });
    const res = await get(ctx, `/reactions?protocol=${encodeURIComponent("stored 350")}`);
    expect(res.body.protocol.temperatureK).toBe(350);
    const row = res.body.reactions.find((x: { id: number }) => x.id === reactionId);
    expect(row.status).toBe("inconsistent");
    expect(row.values.deltaG).toBeNull();
    expect(row.values.deltaH).toBeNull();
    expect(row.values.deltaE).toBeCloseTo((E.MeOH - E.CO - 2 * E.H2) * KCAL_PER_HARTREE, 6);
    const p = row.problems.find((x: { code: string }) => x.code === "thermal_temperature_mismatch");
    expect(p.message).toMatch(/298\.15 K/);
    expect(p.message).toMatch(/350 K/);
  });

  test("a pathway gives values relative to the first state and, for a cycle, the energetic span", async () => {
    const created = await must(ctx, "/pathways", {
      name: unique("cycle"),
      cycle: true,
      states: [
        { label: "start", terms: [{ species: "CO" }, { species: "H2", coefficient: 2 }] },
        { label: "TS1", terms: [{ species: "TS1" }] },
        { label: "end", terms: [{ species: "MeOH" }] },
      ],
    });
    const res = await get(ctx, `/pathways/${created.pathway.id}?unit=kcal/mol`);
    expect(res.status).toBe(200);
    const [s0, s1, s2] = res.body.states;
    expect(s0.relativeG).toBeCloseTo(0, 9);
    expect(s1.kind).toBe("transition-state");
    const g0 = E.CO + G.CO + 2 * (E.H2 + G.H2);
    const gTs = (E.TS + G.TS - g0) * KCAL_PER_HARTREE;
    const gEnd = (E.MeOH + G.MeOH - g0) * KCAL_PER_HARTREE;
    expect(s1.relativeG).toBeCloseTo(gTs, 6);
    expect(s2.relativeG).toBeCloseTo(gEnd, 6);
    // One TS after one intermediate: δE = G(TS) − G(start); TOF = (k_B T/h)(1 − e^{ΔGr/RT}) e^{−δE/RT}
    // (Kozuch & Shaik, Acc. Chem. Res. 2011, 44, 101, eq. for a single TS/intermediate pair).
    expect(res.body.energeticSpan.deltaE).toBeCloseTo(gTs, 6);
    expect(res.body.energeticSpan.tdts).toBe("TS1");
    expect(res.body.energeticSpan.tdi).toBe("start");
    const T = 298.15, RTk = (R * T) / 4184;
    const tof = ((KB * T) / H) * (1 - Math.exp(gEnd / RTk)) * Math.exp(-gTs / RTk);
    expect(res.body.energeticSpan.tof / tof).toBeCloseTo(1, 5);

    const svg = await fetch(`${BASE_URL}/projects/${ctx.id}/pathways/${created.pathway.id}/diagram.svg?unit=kJ/mol`, { headers: { Authorization: `Bearer ${viewer}` } });
    expect(svg.status).toBe(200);
    expect(svg.headers.get("content-type")).toContain("image/svg+xml");
    const text = await svg.text();
    expect(text.startsWith("<svg")).toBe(true);
    expect(text).toContain("kJ/mol");
    expect(text).toContain("TS1");
  });

  test("optimistic locking: an edit based on a stale version is refused with the current values", async () => {
    const r = await must(ctx, "/reactions", { equation: "MeOH -> CO + 2 H2" });
    const id = r.reaction.id;
    const ok = await api(`/api/v1/projects/${ctx.id}/reactions/${id}`, { token: ctx.token, method: "PATCH", body: { notes: "first edit", version: 1 } });
    expect(ok.status).toBe(200);
    expect(ok.body.reaction.version).toBe(2);
    const stale = await api(`/api/v1/projects/${ctx.id}/reactions/${id}`, { token: ctx.token, method: "PATCH", body: { notes: "second edit", version: 1 } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.current.notes).toBe("first edit");
    const staleDelete = await api(`/api/v1/projects/${ctx.id}/reactions/${id}`, { token: ctx.token, method: "DELETE", body: { version: 1 } });
    expect(staleDelete.status).toBe(409);
    const del = await api(`/api/v1/projects/${ctx.id}/reactions/${id}`, { token: ctx.token, method: "DELETE", body: { version: 2 } });
    expect(del.status).toBe(204);

    const history = await get(ctx, `/history?objectType=reaction&objectId=${id}`);
    expect(history.status).toBe(200);
    const actions = (history.body.entries ?? history.body.history ?? []).map((e: { action: string }) => e.action).sort();
    expect(actions).toEqual(["create", "delete", "update"]);
  });

  test("optimistic locking of a pathway: stale edits are refused with the current value, and of two edits of one version sent at once only one is stored", async () => {
    const states = [{ label: "start", terms: [{ species: "CO", coefficient: 1 }, { species: "H2", coefficient: 2 }] }, { label: "end", terms: [{ species: "MeOH", coefficient: 1 }] }];
    const created = await must(ctx, "/pathways", { name: unique("locked"), states });
    const id = created.pathway.id;
    const url = `/api/v1/projects/${ctx.id}/pathways/${id}`;
    const first = await api(url, { token: ctx.token, method: "PATCH", body: { name: unique("renamed"), version: 1 } });
    expect(first.status).toBe(200);
    const stale = await api(url, { token: ctx.token, method: "PATCH", body: { cycle: true, version: 1 } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.current).toMatchObject({ id, version: 2, name: first.body.pathway.name });

    const both = await Promise.all(
      ["a", "b"].map((x) => api(url, { token: ctx.token, method: "PATCH", body: { name: unique(`race-${x}`), states: [...states].reverse(), version: 2 } })),
    );
    expect(both.map((r) => r.status).sort()).toEqual([200, 409]);
    const winner = both.find((r) => r.status === 200)!;
    const now = await get(ctx, `/pathways/${id}`);
    expect(now.body.pathway.name).toBe(winner.body.pathway.name);

    const history = await get(ctx, `/history?objectType=pathway&objectId=${id}`);
    expect(history.body.history.map((h: { action: string }) => h.action)).toEqual(["update", "update", "create"]);
    expect(history.body.history[1].oldValues).toMatchObject({ name: created.pathway.name });
  });

  test("permissions: the viewer and the auditor read everything and change nothing; a non-member sees nothing", async () => {
    const reads = ["/reactions", `/reactions/${reactionId}`, `/reactions/${reactionId}/breakdown`, "/pathways", "/audit"];
    for (const path of reads) {
      expect((await get(ctx, path, viewer)).status, `viewer GET ${path}`).toBe(200);
      expect((await get(ctx, path, auditor)).status, `auditor GET ${path}`).toBe(200);
    }
    for (const token of [viewer, auditor]) {
      expect((await api(`/api/v1/projects/${ctx.id}/reactions`, { token, body: { equation: "MeOH -> CO + 2 H2" } })).status).toBe(403);
      expect((await api(`/api/v1/projects/${ctx.id}/reactions/${reactionId}`, { token, method: "PATCH", body: { notes: "x" } })).status).toBe(403);
      expect((await api(`/api/v1/projects/${ctx.id}/reactions/${reactionId}`, { token, method: "DELETE" })).status).toBe(403);
      expect((await api(`/api/v1/projects/${ctx.id}/pathways`, { token, body: { name: "x", states: [] } })).status).toBe(403);
    }
    const pathways = (await get(ctx, "/pathways")).body.pathways;
    const pid = pathways[0].id;
    expect((await get(ctx, `/pathways/${pid}`, viewer)).status).toBe(200);
    expect((await api(`/api/v1/projects/${ctx.id}/pathways/${pid}`, { token: viewer, method: "PATCH", body: { name: "x" } })).status).toBe(403);
    expect((await api(`/api/v1/projects/${ctx.id}/pathways/${pid}`, { token: viewer, method: "DELETE" })).status).toBe(403);

    // A project the supervisor is not a member of: 404 everywhere (its existence is not revealed).
    const other = await newProject(DEMO.chemist);
    for (const path of ["/reactions", "/pathways", "/audit", `/reactions/${reactionId}/breakdown`]) {
      expect((await api(`/api/v1/projects/${other.id}${path}`, { token: outsider })).status, `non-member GET ${path}`).toBe(404);
    }
    expect((await api(`/api/v1/projects/${other.id}/reactions`, { token: outsider, body: { equation: "A -> B" } })).status).toBe(404);
    const svg = await fetch(`${BASE_URL}/projects/${other.id}/pathways/${pid}/diagram.svg`, { headers: { Authorization: `Bearer ${outsider}` } });
    expect(svg.status).toBe(404);
    // Without any credentials: 401.
    expect((await api(`/api/v1/projects/${ctx.id}/reactions`)).status).toBe(401);
  });

  test("the audit lists the planted problems with links to their objects", async () => {
    const res = await get(ctx, "/audit", auditor);
    expect(res.status).toBe(200);
    const codes = res.body.findings.map((f: { code: string }) => f.code);
    expect(codes).toEqual(expect.arrayContaining(["ts_imaginary_modes", "unbalanced", "level_mismatch", "missing_calculation"]));
    const ts = res.body.findings.find((f: { code: string }) => f.code === "ts_imaginary_modes");
    expect(ts.severity).toBe("error");
    expect(ts.object.label).toBe("TS2");
    expect(ts.link).toBe(`/projects/${ctx.id}/species/${ts.object.id}`);
    expect(res.body.counts.error).toBeGreaterThan(0);
  });

  test("the calculations grid marks the cells that feed a current error, and only those", async () => {
    const grid = (await get(ctx, "/calculations/grid", viewer)).body as {
      rows: { label: string; cells: Record<string, { energy: string | null; flags: { code: string; severity: string; message: string }[] }> }[];
    };
    const cell = (label: string, levelId: number) => grid.rows.find((r) => r.label === label)!.cells[String(levelId)]!;
    const codes = (label: string, levelId: number) => cell(label, levelId).flags.map((f) => f.code);
    // TS2 has two imaginary modes at level 1.
    expect(codes("TS2", l1.id)).toContain("ts_imaginary_modes");
    expect(cell("TS2", l1.id).flags.find((f) => f.code === "ts_imaginary_modes")!.severity).toBe("error");
    // CO2 has no single point at level 1, which CO2 + 3 H2 -> MeOH + H2O needs: the empty cell is marked.
    expect(cell("CO2", l1.id).energy).toBeNull();
    expect(codes("CO2", l1.id)).toContain("missing_calculation");
    expect(cell("CO2", l1.id).flags.find((f) => f.code === "missing_calculation")!.message).toContain("CO2 + 3 H2");
    // CH2O has its energy only at level 2: the cell at level 1 is the one to fill.
    expect(codes("CH2O", l1.id)).toContain("level_mismatch");
    // Cells behind clean rows carry nothing.
    expect(cell("H2", l1.id).flags).toEqual([]);
    expect(cell("TS1", l1.id).flags).toEqual([]);
  });

  test("a unit that is not offered is refused with a clear message", async () => {
    const res = await get(ctx, "/reactions?unit=furlongs");
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].field).toBe("unit");
  });
});
