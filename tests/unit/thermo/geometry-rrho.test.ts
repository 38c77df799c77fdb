import { describe, expect, it } from "vitest";
import {
  parseXyz, principalMoments, isLinear, symmetricEigenvalues3, computeThermochemistry, ThermoInputError,
  HARTREE_TO_KCAL_PER_MOL, HARTREE_TO_J_PER_MOL,
} from "../../../app/domain/thermo/index";
import type { ThermoInput } from "../../../app/domain/thermo/index";

// Independent constants for the hand derivations (CODATA 2018 exact values, typed here on purpose).
const h = 6.62607015e-34, k = 1.380649e-23, c = 299792458, NA = 6.02214076e23;
const R = NA * k;
const d2r = Math.PI / 180;

// ---- molecules: experimental geometries and fundamentals (cm⁻¹), from memory (NIST CCCBDB / Herzberg) ----
function water() {
  const r = 0.9572, a = (104.52 * d2r) / 2;
  return { symbols: ["O", "H", "H"], coordinates: [[0, 0, 0], [r * Math.sin(a), r * Math.cos(a), 0], [-r * Math.sin(a), r * Math.cos(a), 0]] };
}
function ammonia() {
  const r = 1.012, hnh = 106.7 * d2r;
  const th = Math.asin((Math.sin(hnh / 2) * 2) / Math.sqrt(3));
  const hs = [0, 1, 2].map((i) => [r * Math.sin(th) * Math.cos((2 * Math.PI * i) / 3), r * Math.sin(th) * Math.sin((2 * Math.PI * i) / 3), -r * Math.cos(th)]);
  return { symbols: ["N", "H", "H", "H"], coordinates: [[0, 0, 0], ...hs] };
}
function methane() {
  const q = 1.087 / Math.sqrt(3);
  return { symbols: ["C", "H", "H", "H", "H"], coordinates: [[0, 0, 0], [q, q, q], [q, -q, -q], [-q, q, -q], [-q, -q, q]] };
}
const diatomic = (a: string, b: string, r: number) => ({ symbols: [a, b], coordinates: [[0, 0, 0], [0, 0, r]] });

type Case = [string, ThermoInput["geometry"], number[], number, number, number];
const GASES: Case[] = [
  // name, geometry, fundamentals, σ, multiplicity, S°(298.15 K, 1 bar) J/(mol K) — CODATA Key Values / NIST-JANAF, from memory
  ["Ar", { symbols: ["Ar"], coordinates: [[0, 0, 0]] }, [], 1, 1, 154.846],
  ["N2", diatomic("N", "N", 1.098), [2330], 2, 1, 191.609],
  ["O2 (triplet)", diatomic("O", "O", 1.2075), [1556], 2, 3, 205.152],
  ["CO", diatomic("C", "O", 1.128), [2143], 1, 1, 197.66],
  ["H2O", water(), [1595, 3657, 3756], 2, 1, 188.835],
  ["CO2", { symbols: ["O", "C", "O"], coordinates: [[0, 0, -1.16], [0, 0, 0], [0, 0, 1.16]] }, [667.4, 667.4, 1333, 2349], 2, 1, 213.785],
  ["CH4", methane(), [2917, 1534, 1534, 3019, 3019, 3019, 1306, 1306, 1306], 12, 1, 186.25],
  ["NH3", ammonia(), [3337, 950, 3444, 3444, 1627, 1627], 3, 1, 192.77],
];

describe("standard entropies of gases at 298.15 K, 1 bar", () => {
  // The RRHO model with fundamentals falls a little short of the tables (anharmonicity, centrifugal distortion):
  // we accept −0.5 … +0.2 J/(mol K). That still catches a wrong σ (R ln 2 = 5.76), a missing R ln 3 for O2 (9.13),
  // or a wrong rotor formula; the 1 atm/1 bar difference (0.11) is checked exactly below.
  it.each(GASES)("%s", (_n, geometry, f, sigma, mult, table) => {
    const r = computeThermochemistry({ frequenciesCm1: f, geometry, symmetryNumber: sigma, multiplicity: mult, temperatureK: 298.15, pressurePa: 1e5 });
    expect(r.entropy - table).toBeGreaterThan(-0.5);
    expect(r.entropy - table).toBeLessThan(0.2);
  });
  it("Ar is pure Sackur–Tetrode: 154.846 J/(mol K) (CODATA Key Values, from memory) to 0.01", () => {
    const r = computeThermochemistry({ frequenciesCm1: [], symbols: ["Ar"], pressurePa: 1e5 });
    expect(r.entropy).toBeCloseTo(154.846, 1);
    expect(r.thermalEnergy).toBeCloseTo((2.5 * k * 298.15) / 4.3597447222071e-18, 12); // 5/2 kT for an atom
  });
  it("S(1 atm) − S(1 bar) = −R ln(101325/1e5) exactly (ideal gas)", () => {
    const base = { frequenciesCm1: [1595, 3657, 3756], geometry: water(), symmetryNumber: 2 };
    const atm = computeThermochemistry({ ...base, pressurePa: 101325 });
    const bar = computeThermochemistry({ ...base, pressurePa: 1e5 });
    expect(atm.entropy - bar.entropy).toBeCloseTo(-R * Math.log(101325 / 1e5), 10);
  });
  it("the electronic term is R ln(multiplicity)", () => {
    const base = { frequenciesCm1: [1556], geometry: diatomic("O", "O", 1.2075), symmetryNumber: 2 };
    const t = computeThermochemistry({ ...base, multiplicity: 3 });
    const s = computeThermochemistry({ ...base, multiplicity: 1 });
    expect(t.entropy - s.entropy).toBeCloseTo(R * Math.log(3), 10);
    expect(t.contributions.electronic.entropy).toBeCloseTo(R * Math.log(3), 10);
  });
});

describe("RRHO properties", () => {
  const base = { frequenciesCm1: [2917, 1534, 1534, 3019, 3019, 3019, 1306, 1306, 1306], geometry: methane() };
  it("raising σ by a factor lowers S by R ln(factor), G_corr rises by T R ln(factor)", () => {
    const s1 = computeThermochemistry({ ...base, symmetryNumber: 1 });
    const s12 = computeThermochemistry({ ...base, symmetryNumber: 12 });
    expect(s1.entropy - s12.entropy).toBeCloseTo(R * Math.log(12), 10);
    expect((s12.gibbsCorrection - s1.gibbsCorrection) * HARTREE_TO_J_PER_MOL).toBeCloseTo(298.15 * R * Math.log(12), 6);
  });
  it("G_corr = H_corr − T S and H_corr = ZPE + thermal energy", () => {
    for (const T of [100, 298.15, 1000]) {
      const r = computeThermochemistry({ ...base, symmetryNumber: 12, temperatureK: T });
      expect(r.gibbsCorrection).toBeCloseTo(r.enthalpyCorrection - (T * r.entropy) / HARTREE_TO_J_PER_MOL, 14);
      expect(r.enthalpyCorrection).toBeCloseTo(r.zpe + r.thermalEnergy, 15);
      const sum = r.contributions.translational.energy + r.contributions.rotational.energy + r.contributions.vibrational.energy;
      expect(r.thermalEnergy).toBeCloseTo(sum + (k * T) / 4.3597447222071e-18, 15);
    }
  });
  it("ZPE = ½ Σ h c ν̃: water 12.88 kcal/mol from 1595, 3657, 3756 cm⁻¹ (hand arithmetic: ½ × 9008 cm⁻¹)", () => {
    const r = computeThermochemistry({ frequenciesCm1: [1595, 3657, 3756], geometry: water(), symmetryNumber: 2 });
    const handKcal = (0.5 * 9008 * h * c * 100 * NA) / 4184;
    expect(r.zpe * HARTREE_TO_KCAL_PER_MOL).toBeCloseTo(handKcal, 9);
    expect(handKcal).toBeCloseTo(12.877, 2);
  });
  it("results do not depend on the orientation or origin of the geometry", () => {
    const g = ammonia();
    const f = [3337, 950, 3444, 3444, 1627, 1627];
    const ref = computeThermochemistry({ frequenciesCm1: f, geometry: g, symmetryNumber: 3 });
    const [a, b, cc] = [0.7, -1.3, 2.1];
    const rot = (p: number[]) => {
      // R = Rz(a) Ry(b) Rx(c), then translate
      let [x, y, z] = p as [number, number, number];
      [y, z] = [y * Math.cos(cc) - z * Math.sin(cc), y * Math.sin(cc) + z * Math.cos(cc)];
      [x, z] = [x * Math.cos(b) + z * Math.sin(b), -x * Math.sin(b) + z * Math.cos(b)];
      [x, y] = [x * Math.cos(a) - y * Math.sin(a), x * Math.sin(a) + y * Math.cos(a)];
      return [x + 12.3, y - 4.5, z + 7.8];
    };
    const moved = computeThermochemistry({ frequenciesCm1: f, geometry: { symbols: g.symbols, coordinates: g.coordinates.map(rot) }, symmetryNumber: 3 });
    expect(moved.entropy).toBeCloseTo(ref.entropy, 9);
    expect(moved.gibbsCorrection).toBeCloseTo(ref.gibbsCorrection, 12);
    for (let i = 0; i < 3; i++) expect(moved.principalMoments[i]).toBeCloseTo(ref.principalMoments[i]!, 9);
  });
  it("imaginary modes are left out and reported", () => {
    const r = computeThermochemistry({ frequenciesCm1: [-500, 1595, 3657], geometry: water(), symmetryNumber: 2 });
    const ok = computeThermochemistry({ frequenciesCm1: [1595, 3657], geometry: water(), symmetryNumber: 2 });
    expect(r.imaginaryFrequencies).toEqual([-500]);
    expect(r.entropy).toBe(ok.entropy);
    expect(r.zpe).toBe(ok.zpe);
  });
  it("one scale factor applies to every mode", () => {
    const a = computeThermochemistry({ frequenciesCm1: [1595, 3657, 3756], geometry: water(), frequencyScale: 0.97 });
    const b = computeThermochemistry({ frequenciesCm1: [1595 * 0.97, 3657 * 0.97, 3756 * 0.97], geometry: water() });
    expect(a.zpe).toBeCloseTo(b.zpe, 15);
    expect(a.entropy).toBeCloseTo(b.entropy, 12);
  });
});

describe("low-frequency treatments, derived by hand from the papers' formulas", () => {
  // One soft mode of 50 cm⁻¹ plus two stiff ones in a bent triatomic, T = 298.15 K.
  const T = 298.15;
  const modes = [50, 1595, 3657];
  const geo = water();
  const SV = (nu: number) => { // harmonic oscillator entropy (McQuarrie), J/(mol K)
    const x = (h * c * 100 * nu) / (k * T);
    return R * (x / (Math.exp(x) - 1) - Math.log(1 - Math.exp(-x)));
  };
  const EV = (nu: number) => { // thermal vibrational energy without ZPE, J/mol
    const x = (h * c * 100 * nu) / (k * T);
    return (R * T * x) / (Math.exp(x) - 1);
  };
  const grimme = (nu: number) => { // Grimme, Chem. Eur. J. 2012, 18, 9955, eqs. 4–7: ω0 = 100, α = 4, Bav = 1e-44 kg m²
    const mu = h / (8 * Math.PI ** 2 * (nu * 100 * c));
    const Bav = 1e-44;
    const muP = (mu * Bav) / (mu + Bav);
    const SR = R * (0.5 + Math.log(Math.sqrt((8 * Math.PI ** 3 * muP * k * T) / (h * h))));
    const w = 1 / (1 + (100 / nu) ** 4);
    return w * SV(nu) + (1 - w) * SR;
  };
  it("hand numbers for the 50 cm⁻¹ mode (computed separately from the formulas): S_V 20.156, quasi-RRHO 15.138 J/(mol K)", () => {
    expect(SV(50)).toBeCloseTo(20.1559, 3);
    expect(grimme(50)).toBeCloseTo(15.1381, 3);
  });
  it("grimme: vibrational entropy = Σ quasi-RRHO mode entropies; enthalpy unchanged", () => {
    const none = computeThermochemistry({ frequenciesCm1: modes, geometry: geo, symmetryNumber: 2 });
    const g = computeThermochemistry({ frequenciesCm1: modes, geometry: geo, symmetryNumber: 2, lowFrequency: { treatment: "grimme", cutoffCm1: 100 } });
    expect(g.contributions.vibrational.entropy).toBeCloseTo(modes.reduce((s, n) => s + grimme(n), 0), 9);
    expect(none.contributions.vibrational.entropy).toBeCloseTo(modes.reduce((s, n) => s + SV(n), 0), 9);
    expect(g.enthalpyCorrection).toBe(none.enthalpyCorrection);
    expect(g.perMode!.entropy.grimme[0]).toBeCloseTo(grimme(50), 9);
    expect(g.perMode!.entropy.none[0]).toBeCloseTo(SV(50), 9);
    expect(g.lowFrequency.affectedFrequenciesCm1).toEqual([50]);
  });
  it("truhlar: the 50 cm⁻¹ mode counts as 100 cm⁻¹ for S and thermal energy; ZPE keeps 50", () => {
    const t = computeThermochemistry({ frequenciesCm1: modes, geometry: geo, symmetryNumber: 2, lowFrequency: { treatment: "truhlar", cutoffCm1: 100 } });
    expect(t.contributions.vibrational.entropy).toBeCloseTo(SV(100) + SV(1595) + SV(3657), 9);
    expect(SV(100)).toBeCloseTo(14.4529, 3); // hand number
    expect(t.contributions.vibrational.energy * HARTREE_TO_J_PER_MOL).toBeCloseTo(EV(100) + EV(1595) + EV(3657), 6);
    expect(t.zpe * HARTREE_TO_J_PER_MOL).toBeCloseTo(0.5 * (50 + 1595 + 3657) * h * c * 100 * NA, 6);
    expect(t.perMode!.entropy.truhlar[0]).toBeCloseTo(SV(100), 9);
  });
});

describe("geometry", () => {
  it("parses multi-frame XYZ and bare lines", () => {
    const frames = parseXyz("2\nfirst\nH 0 0 0\nH 0 0 0.74\n2\nsecond\nH 0 0 0\nH 0 0 0.75\n");
    expect(frames).toHaveLength(2);
    expect(frames[1]!.comment).toBe("second");
    expect(frames[1]!.coordinates[1]).toEqual([0, 0, 0.75]);
    const bare = parseXyz("C 0 0 0\ncl 1.77 0 0\n8 0 1 0");
    expect(bare[0]!.symbols).toEqual(["C", "Cl", "O"]);
  });
  it.each(["3\nwater\nO 0 0 0\nH 0 0 1\n", "Xx 0 0 0", "H 0 0", "H 0 0 a"])("rejects %j", (t) => {
    expect(() => parseXyz(t)).toThrow(ThermoInputError);
  });
  it("Jacobi eigenvalues of a known symmetric matrix", () => {
    // [[2,1,0],[1,2,0],[0,0,3]] has eigenvalues 1, 3, 3 (hand)
    const ev = symmetricEigenvalues3(2, 1, 0, 2, 0, 3);
    expect(ev[0]).toBeCloseTo(1, 12);
    expect(ev[1]).toBeCloseTo(3, 12);
    expect(ev[2]).toBeCloseTo(3, 12);
  });
  it("H2 moment: μ r² = (1.00782503223/2) × 0.7414² u Å² (hand)", () => {
    const m = principalMoments(["H", "H"], [[0, 0, 0], [0, 0, 0.7414]]);
    expect(m[0]).toBeCloseTo(0, 12);
    expect(m[2]).toBeCloseTo((1.00782503223 / 2) * 0.7414 ** 2, 10);
    expect(isLinear(m)).toBe(true);
  });
  it("linearity: CO2 bent by 0.01° is linear, by 5° not (tolerance 1e-3 u Å²)", () => {
    const bent = (deg: number) => {
      const a = ((180 - deg) * d2r) / 2;
      return [[0, 0, 0], [1.16 * Math.sin(a), 1.16 * Math.cos(a), 0], [-1.16 * Math.sin(a), 1.16 * Math.cos(a), 0]];
    };
    expect(isLinear(principalMoments(["C", "O", "O"], bent(0.01)))).toBe(true);
    expect(isLinear(principalMoments(["C", "O", "O"], bent(5)))).toBe(false);
  });
  it("average masses differ from isotopic ones (Cl: 35.45 vs 34.96885)", () => {
    const iso = principalMoments(["H", "Cl"], [[0, 0, 0], [0, 0, 1.2746]], "isotopic");
    const avg = principalMoments(["H", "Cl"], [[0, 0, 0], [0, 0, 1.2746]], "average");
    const mu = (a: number, b: number) => (a * b) / (a + b);
    expect(iso[2]).toBeCloseTo(mu(1.00782503223, 34.968852682) * 1.2746 ** 2, 9);
    expect(avg[2]).toBeCloseTo(mu(1.008, 35.45) * 1.2746 ** 2, 9);
  });
});

describe("bad input is rejected with the field named", () => {
  const ok = { frequenciesCm1: [1595, 3657, 3756], geometry: water(), symmetryNumber: 2 };
  it.each([
    [{ temperatureK: 0 }, "temperatureK"],
    [{ temperatureK: -5 }, "temperatureK"],
    [{ temperatureK: Number.NaN }, "temperatureK"],
    [{ symmetryNumber: 0.5 }, "symmetryNumber"],
    [{ symmetryNumber: 0 }, "symmetryNumber"],
    [{ multiplicity: 2 }, "multiplicity"], // water has 10 electrons
    [{ pressurePa: 0 }, "pressurePa"],
    [{ frequencyScale: -1 }, "frequencyScale"],
    [{ frequenciesCm1: [1595, Number.NaN, 3756] }, "frequenciesCm1[1]"],
    [{ frequenciesCm1: [0, 3657, 3756] }, "frequenciesCm1[0]"],
    [{ frequenciesCm1: [1, 2, 3, 4] }, "frequenciesCm1"],
    [{ geometry: { symbols: ["O", "H", "H"], coordinates: undefined as never } }, "geometry"],
    [{ lowFrequency: { treatment: "magic" as never } }, "lowFrequency.treatment"],
    [{ lowFrequency: { treatment: "grimme" as const, cutoffCm1: 0 } }, "lowFrequency.cutoffCm1"],
    [{ masses: "heavy" as never }, "masses"],
    [{ charge: 1 }, "multiplicity"], // H2O+ is a doublet, not a singlet
    // finite inputs whose results overflow: an error, never ±Infinity or NaN
    [{ frequenciesCm1: [1e308, 3657, 3756] }, "frequenciesCm1[0]"],
    [{ frequencyScale: 1e306 }, "frequenciesCm1[0]"],
    [{ temperatureK: 1e-300 }, "temperatureK"],
    [{ temperatureK: 1e300 }, "temperatureK"],
    [{ geometry: { symbols: ["O", "H", "H"], coordinates: [[0, 0, 0], [0, 1e200, 0], [0, -0.76, 0.59]] } }, "geometry"],
  ])("%j → %s", (patch, field) => {
    try {
      computeThermochemistry({ ...ok, ...(patch as Partial<ThermoInput>) });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(ThermoInputError);
      expect((e as ThermoInputError).field).toBe(field);
    }
  });
  it("polyatomic without geometry", () => {
    expect(() => computeThermochemistry({ frequenciesCm1: [1000] } as ThermoInput)).toThrow(ThermoInputError);
  });
});
