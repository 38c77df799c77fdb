import { describe, expect, it } from "vitest";
import { api, BASE_URL, DEMO, tokenFor } from "./helpers";

/** The stateless calculator through HTTP: POST /api/v1/thermo and the /tools/thermo page. */

// Water: fundamentals 1594.6, 3657.1, 3755.8 cm⁻¹; r(OH) 0.9578 Å, ∠HOH 104.48° (from memory, NIST CCCBDB).
const half = (104.48 / 2) * (Math.PI / 180);
const WATER = {
  frequencies: [1594.6, 3657.1, 3755.8],
  geometry: {
    symbols: ["O", "H", "H"],
    coordinates: [
      [0, 0, 0],
      [0, 0.9578 * Math.sin(half), 0.9578 * Math.cos(half)],
      [0, -0.9578 * Math.sin(half), 0.9578 * Math.cos(half)],
    ],
  },
  symmetryNumber: 2,
  multiplicity: 1,
  temperature: 298.15,
  standardState: "1 bar",
};

describe("POST /api/v1/thermo", () => {
  it("gives water's standard entropy and ZPE", async () => {
    const token = await tokenFor(DEMO.chemist);
    const res = await api("/api/v1/thermo", { token, body: WATER });
    expect(res.status).toBe(200);
    // S°(H2O, g, 298.15 K, 1 bar) = 188.835 J/(mol K) (CODATA Key Values for Thermodynamics, from memory);
    // the rigid-rotor harmonic model falls slightly short, and σ = 1 instead of 2 would add R ln 2 = 5.76.
    expect(res.body.entropy).toBeGreaterThan(188.835 - 0.5);
    expect(res.body.entropy).toBeLessThan(188.835 + 0.2);
    // ZPE = ½ h c Σν̃ = ½ × 9007.5 cm⁻¹ = 4503.75 cm⁻¹; 1 Eh = 219474.6313632 cm⁻¹ (CODATA 2018).
    expect(res.body.zpe).toBeCloseTo(4503.75 / 219474.6313632, 8);
    expect(res.body.units).toEqual({ energy: "hartree", entropy: "J/(mol K)" });
    expect(res.body.pressure).toBe(100000);
    expect(res.body.linear).toBe(false);
    // G_corr = H_corr − T S (definition), with S in J/(mol K) → hartree per particle via 2625499.6394799 J/mol (CODATA 2018).
    expect(res.body.gibbsCorrection).toBeCloseTo(res.body.enthalpyCorrection - (298.15 * res.body.entropy) / 2625499.6394799, 10);
    expect(Object.keys(res.body.contributions).sort()).toEqual(["electronic", "rotational", "translational", "vibrational"]);
  });

  it("adds RT ln(c°RT/P°) for the 1 mol/L standard state", async () => {
    const token = await tokenFor(DEMO.chemist);
    const gas = await api("/api/v1/thermo", { token, body: { ...WATER, standardState: "1 atm" } });
    const sol = await api("/api/v1/thermo", { token, body: { ...WATER, standardState: "1 M" } });
    // 1 atm → 1 mol/L at 298.15 K: 1.89 kcal/mol (common practice); 1 Eh = 627.5094740631 kcal/mol (CODATA 2018).
    const deltaKcal = (sol.body.gibbsCorrection - gas.body.gibbsCorrection) * 627.5094740631;
    expect(deltaKcal).toBeCloseTo(1.89, 2);
  });

  it("leaves imaginary modes out and reports them, and states the treatment applied", async () => {
    const token = await tokenFor(DEMO.chemist);
    const res = await api("/api/v1/thermo", {
      token,
      body: { ...WATER, frequencies: [-350.2, 1594.6, 3657.1], lowFrequency: { treatment: "grimme", cutoff: 100 } },
    });
    expect(res.status).toBe(200);
    expect(res.body.imaginaryFrequencies).toEqual([-350.2]);
    expect(res.body.lowFrequency.treatment).toBe("grimme");
    expect(res.body.lowFrequency.cutoff).toBe(100);
  });

  it.each([
    ["a temperature of 0 K", { temperature: 0 }, "temperature"],
    ["a symmetry number below 1", { symmetryNumber: 0 }, "symmetryNumber"],
    ["a treatment that does not exist", { lowFrequency: { treatment: "magic", cutoff: 100 } }, "lowFrequency.treatment"],
    ["both pressure and standard state", { pressure: 101325 }, "pressure"],
    ["a multiplicity the electron count forbids", { multiplicity: 2 }, "multiplicity"],
    ["no geometry for a polyatomic molecule", { geometry: undefined }, "geometry"],
    ["more modes than 3N − 6", { frequencies: [1000, 1100, 1200, 1300] }, "frequencies"],
    ["an element that does not exist", { geometry: { symbols: ["O", "H", "Xq"], coordinates: WATER.geometry.coordinates } }, "geometry.symbols[2]"],
  ])("refuses %s with 422 naming the field", async (_, change, field) => {
    const token = await tokenFor(DEMO.chemist);
    const res = await api("/api/v1/thermo", { token, body: { ...WATER, ...change } });
    expect(res.status).toBe(422);
    expect(res.body.error.details.map((d: { field: string }) => d.field)).toContain(field);
  });

  it("needs a signed-in user", async () => {
    const res = await api("/api/v1/thermo", { body: WATER });
    expect(res.status).toBe(401);
  });
});

describe("the calculator page", () => {
  it("computes from pasted text and shows the results", async () => {
    const token = await tokenFor(DEMO.chemist);
    const xyz = ["3", "water", ...WATER.geometry.coordinates.map((c, i) => `${WATER.geometry.symbols[i]} ${c.join(" ")}`)].join("\n");
    const form = new URLSearchParams({
      frequencies: "1594.6, 3657.1\n3755.8",
      xyz,
      temperature: "25",
      temperatureUnit: "C",
      standardState: "1 bar",
      symmetryNumber: "2",
      multiplicity: "1",
      charge: "0",
      treatment: "none",
      cutoff: "100",
      frequencyScale: "1",
      masses: "isotopic",
    });
    const res = await fetch(`${BASE_URL}/tools/thermo`, {
      method: "POST",
      body: form,
      headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
    });
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain("Corrections at");
    expect(html).toContain("298.15"); // 25 °C = 298.15 K (definition of the Celsius scale)
  });

  it("shows an error the engine finds beside the input it is about", async () => {
    const token = await tokenFor(DEMO.chemist);
    const xyz = ["3", "water", ...WATER.geometry.coordinates.map((c, i) => `${WATER.geometry.symbols[i]} ${c.join(" ")}`)].join("\n");
    const fields = {
      frequencies: "1594.6 3657.1 3755.8 4000", xyz, temperature: "298.15", temperatureUnit: "K", standardState: "1 atm",
      symmetryNumber: "2", multiplicity: "1", charge: "0", treatment: "none", cutoff: "100", frequencyScale: "1", masses: "isotopic",
    };
    const post = (patch: Record<string, string>) =>
      fetch(`${BASE_URL}/tools/thermo`, {
        method: "POST",
        body: new URLSearchParams({ ...fields, ...patch }),
        headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
      });
    // The error paragraph follows the field's own textarea/input (the page renders the two together).
    const besideField = (html: string, id: string, text: string) =>
      new RegExp(`id="${id}"[^>]*>(?:[^<]*</textarea>)?<p class="field-error"[^>]*>[^<]*${text}`).test(html);
    const tooMany = await post({});
    expect(tooMany.status).toBe(422);
    expect(besideField(await tooMany.text(), "frequencies", "at most 3N")).toBe(true);
    const badXyz = await post({ frequencies: "1594.6 3657.1 3755.8", xyz: "3\nwater\nO 0 0 0\nH 0 0 1\n" });
    expect(badXyz.status).toBe(422);
    expect(besideField(await badXyz.text(), "xyz", "")).toBe(true);
    const badCharge = await post({ frequencies: "1594.6 3657.1 3755.8", charge: "1" });
    expect(badCharge.status).toBe(422);
    expect(besideField(await badCharge.text(), "multiplicity", "")).toBe(true);
  });

  it("says which frequency is not a number", async () => {
    const token = await tokenFor(DEMO.chemist);
    const form = new URLSearchParams({
      frequencies: "1594.6 abc", xyz: "", temperature: "298.15", temperatureUnit: "K", standardState: "1 atm",
      symmetryNumber: "1", multiplicity: "1", charge: "0", treatment: "none", cutoff: "100", frequencyScale: "1", masses: "isotopic",
    });
    const res = await fetch(`${BASE_URL}/tools/thermo`, {
      method: "POST",
      body: form,
      headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/x-www-form-urlencoded" },
    });
    expect(res.status).toBe(422);
    expect(await res.text()).toContain("Frequency 2");
  });
});
