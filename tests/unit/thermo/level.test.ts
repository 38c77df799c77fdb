import { describe, expect, it } from "vitest";
import {
  canonicalLevelKey, canonicalCompositeKey, classifyBasis, classifyMethod, formatLevel, methodCarriesBasis, parseCompositeLevel, parseLevel,
  parseLevelString, ThermoInputError,
} from "../../../app/domain/thermo/index";

const key = (s: string) => canonicalLevelKey(parseLevelString(s));

describe("level aliases compare equal (common practice of the notation)", () => {
  it.each([
    ["B3LYP/6-31G**", "B3LYP/6-31G(d,p)"],
    ["B3LYP/6-31G*", "B3LYP/6-31G(d)"],
    ["B3LYP/6-31+G*", "B3LYP/6-31+G(d)"],
    ["B3LYP/6-311++G**", "B3LYP/6-311++G(d,p)"],
    ["wB97X-D/def2-TZVP", "ωB97X-D/def2-TZVP"],
    ["wb97xd/def2tzvp", "ωB97X-D/def2-TZVP"],
    ["b3lyp-d3bj/Def2-TZVP", "B3LYP-D3(BJ)/def2-TZVP"],
    ["B3LYP-D3/def2-SVP", "B3LYP-D3(0)/def2-SVP"],
    ["B3LYP-D3ZERO/def2-SVP", "B3LYP-D3(0)/def2-SVP"],
    ["M06-2X/cc-pVTZ SMD(water)", "m062x/cc-pvtz (SMD, H2O)"],
    ["PBE0 / def2-TZVP", "PBE1PBE/def2-TZVP"],
  ])("%s = %s", (a, b) => {
    expect(key(a)).toBe(key(b));
  });
  it("dispersion attached to the method equals the separate field", () => {
    expect(canonicalLevelKey(parseLevel({ method: "B3LYP-D3(BJ)", basis: "def2-TZVP" }))).toBe(
      canonicalLevelKey(parseLevel({ method: "B3LYP", basis: "def2-TZVP", dispersion: "D3BJ" })),
    );
  });
});

describe("real differences stay different", () => {
  it.each([
    ["B3LYP-D3(0)/def2-TZVP", "B3LYP-D3(BJ)/def2-TZVP"],
    ["B3LYP/def2-TZVP", "B3LYP/def2-TZVPP"],
    ["B3LYP/6-31G*", "B3LYP/6-31G**"],
    ["B3LYP/6-31+G*", "B3LYP/6-31++G*"],
    ["B3LYP/def2-TZVP", "B3LYP-D3(BJ)/def2-TZVP"],
    ["B3LYP/def2-TZVP SMD(water)", "B3LYP/def2-TZVP CPCM(water)"],
    ["B3LYP/def2-TZVP SMD(water)", "B3LYP/def2-TZVP SMD(toluene)"],
    ["B3LYP/def2-TZVP SMD(water)", "B3LYP/def2-TZVP"],
    ["wB97X-D/def2-TZVP", "wB97X/def2-TZVP"],
  ])("%s ≠ %s", (a, b) => {
    expect(key(a)).not.toBe(key(b));
  });
});

describe("parsing and display", () => {
  it("reads method, dispersion, basis and solvation", () => {
    const l = parseLevelString("B3LYP-D3(BJ)/def2-TZVP SMD(water)");
    expect(l.method).toBe("B3LYP");
    expect(l.dispersion).toBe("D3(BJ)");
    expect(l.basis).toBe("def2-TZVP");
    expect(l.solvation).toEqual({ model: "SMD", solvent: "water" });
    expect(formatLevel(l)).toBe("B3LYP-D3(BJ)/def2-TZVP (SMD, water)");
    expect(key(formatLevel(l))).toBe(canonicalLevelKey(l)); // display form reads back
  });
  it("keeps ωB97X-D and B97-D as functionals with their own D", () => {
    expect(parseLevelString("wB97X-D/6-31G*").dispersion).toBeNull();
    expect(parseLevelString("B97-D/6-31G*").dispersion).toBeNull();
  });
  it("reads the energy // geometry notation", () => {
    const c = parseCompositeLevel("DLPNO-CCSD(T)/def2-TZVP // B3LYP-D3(BJ)/def2-SVP");
    expect(c.energy.method).toBe("DLPNO-CCSD(T)");
    expect(c.geometry?.dispersion).toBe("D3(BJ)");
    expect(canonicalCompositeKey(c)).toBe(canonicalCompositeKey("dlpno-ccsd(t)/def2tzvp//b3lyp-d3bj/def2-svp"));
  });
  it.each(["B3LYP", "/def2-SVP", "B3LYP/", "B3LYP/def2-SVP extra words"])("rejects %j with a ThermoInputError", (s) => {
    expect(() => parseLevelString(s)).toThrow(ThermoInputError);
  });
  it("rejects a method/dispersion contradiction, naming the field", () => {
    try {
      parseLevel({ method: "B3LYP-D3(BJ)", basis: "def2-SVP", dispersion: "D4" });
      expect.unreachable();
    } catch (e) {
      expect((e as ThermoInputError).field).toBe("dispersion");
    }
  });
});

describe("basis classification (common practice of the notation)", () => {
  it.each([
    // name, family, zeta, heavy polarisation, H polarisation, diffuse
    ["6-31G", "pople", 2, false, false, "none"],
    ["6-31G*", "pople", 2, true, false, "none"], // star: d on heavy atoms
    ["6-31G**", "pople", 2, true, true, "none"], // second star: p on H
    ["6-31+G*", "pople", 2, true, false, "heavy"], // plus: diffuse on heavy atoms
    ["6-31++G**", "pople", 2, true, true, "all"], // second plus: diffuse on H too
    ["6-311G(d,p)", "pople", 3, true, true, "none"],
    ["6-311++G(2df,2pd)", "pople", 3, true, true, "all"],
    ["cc-pVDZ", "dunning", 2, true, true, "none"],
    ["cc-pVTZ", "dunning", 3, true, true, "none"],
    ["aug-cc-pVTZ", "dunning", 3, true, true, "all"], // aug- plays the part of ++
    ["jun-cc-pVTZ", "dunning", 3, true, true, "heavy"],
    ["cc-pVQZ", "dunning", 4, true, true, "none"],
    ["cc-pV5Z", "dunning", 5, true, true, "none"],
    ["def2-SVP", "karlsruhe", 2, true, true, "none"],
    ["def2-TZVP", "karlsruhe", 3, true, true, "none"],
    ["def2-TZVPP", "karlsruhe", 3, true, true, "none"],
    ["def2-QZVPP", "karlsruhe", 4, true, true, "none"],
    ["ma-def2-TZVP", "karlsruhe", 3, true, true, "heavy"],
    ["def2-TZVPD", "karlsruhe", 3, true, true, "all"],
  ] as const)("%s", (name, family, zeta, pol, polH, diffuse) => {
    const c = classifyBasis(name);
    expect(c).toMatchObject({ family, zeta, polarisation: pol, polarisationHydrogen: polH, diffuse });
  });
  it.each([
    ["cc-pVDZ", "d"], ["cc-pVTZ", "f"], ["cc-pVQZ", "g"], ["cc-pV5Z", "h"], // highest polarisation l on carbon
    ["6-31G(d)", "d"], ["6-311G(2df,2p)", "f"], ["def2-TZVP", "f"],
  ])("%s: highest polarisation function on carbon is %s", (name, l) => {
    expect(classifyBasis(name).highestPolarisationCarbon).toBe(l);
  });
});

describe("method classification (functional ladder, common practice)", () => {
  it.each([
    ["SVWN", "dft", "LDA"], ["PBE", "dft", "GGA"], ["BP86", "dft", "GGA"], ["BLYP", "dft", "GGA"], ["revPBE", "dft", "GGA"],
    ["B97-D", "dft", "GGA"], ["TPSS", "dft", "meta-GGA"], ["M06-L", "dft", "meta-GGA"], ["r2SCAN", "dft", "meta-GGA"],
    ["B3LYP", "dft", "hybrid"], ["PBE0", "dft", "hybrid"], ["TPSSh", "dft", "hybrid"], ["M06", "dft", "hybrid"], ["M06-2X", "dft", "hybrid"],
    ["CAM-B3LYP", "dft", "range-separated hybrid"], ["ωB97X-D", "dft", "range-separated hybrid"], ["wB97M-V", "dft", "range-separated hybrid"],
    ["B2PLYP", "dft", "double hybrid"], ["DSD-PBEP86", "dft", "double hybrid"],
    ["UB3LYP", "dft", "hybrid"], ["B3LYP-D3(BJ)", "dft", "hybrid"],
  ])("%s is %s / %s", (m, kind, rung) => {
    expect(classifyMethod(m)).toMatchObject({ kind, rung });
  });
  it.each(["HF", "MP2", "RI-MP2", "CCSD", "CCSD(T)", "DLPNO-CCSD(T)", "CASSCF", "CASPT2", "ROHF", "CCSD(T)-F12"])("%s is a wavefunction method", (m) => {
    expect(classifyMethod(m).kind).toBe("wavefunction");
  });
  it("semiempirical and unknown", () => {
    expect(classifyMethod("PM7").kind).toBe("semiempirical");
    expect(classifyMethod("GFN2-xTB").kind).toBe("semiempirical");
    expect(classifyMethod("MyFunctional").kind).toBe("unknown");
  });
});

describe("methods that carry their own basis", () => {
  // The "3c" composites are each defined with one basis: HF-3c with MINIX (Sure & Grimme, J. Comput.
  // Chem. 34, 1672 (2013)), PBEh-3c with def2-mSVP (Grimme et al., J. Chem. Phys. 143, 054107 (2015)),
  // B97-3c with mTZVP (Brandenburg et al., J. Chem. Phys. 148, 064104 (2018)), r2SCAN-3c with
  // def2-mTZVPP (Grimme et al., J. Chem. Phys. 154, 064103 (2021)), ωB97X-3c with vDZP (Müller et al.,
  // J. Chem. Phys. 158, 014103 (2023)); semiempirical methods have a built-in minimal valence basis
  // (common practice).
  it.each(["HF-3c", "PBEh-3c", "B97-3c", "r2SCAN-3c", "R2SCAN-3C", "ωB97X-3c", "wB97X-3c", "GFN2-xTB", "GFN1-xTB", "PM7", "PM6-D3H4", "AM1"])("%s carries its own basis", (m) => {
    expect(methodCarriesBasis(m)).toBe(true);
  });
  it.each(["B3LYP", "B3LYP-D3(BJ)", "r2SCAN", "B97-D3", "ωB97X-D", "HF", "CCSD(T)", "DLPNO-CCSD(T)", "MyFunctional", ""])("%s needs a basis set", (m) => {
    expect(methodCarriesBasis(m)).toBe(false);
  });
  it("typed without a basis, such a method lands on the same level as the built-in marker", () => {
    const built = canonicalLevelKey(parseLevel({ method: "r2SCAN-3c", basis: "built-in" }));
    expect(canonicalLevelKey(parseLevel({ method: "r2SCAN-3c", basis: "" }))).toBe(built);
    expect(canonicalLevelKey(parseLevelString("r2SCAN-3c"))).toBe(built);
    expect(canonicalLevelKey(parseLevelString("GFN2-xTB ALPB(water)"))).not.toBe(canonicalLevelKey(parseLevelString("GFN2-xTB")));
  });
  it("a plain method without a basis is refused, naming the basis", () => {
    expect(() => parseLevel({ method: "B3LYP", basis: "" })).toThrow(/B3LYP needs a basis set/);
    expect(() => parseLevelString("B3LYP")).toThrow(/method\/basis/);
  });
  it("a level with the built-in basis reads back from its display form", () => {
    const l = parseLevel({ method: "r2SCAN-3c", basis: "built-in" });
    expect(formatLevel(l)).toBe("r2SCAN-3c/built-in");
    expect(canonicalLevelKey(parseLevelString(formatLevel(l)))).toBe(canonicalLevelKey(l));
  });
});
