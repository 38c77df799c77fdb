/**
 * Levels of theory: parsing, canonical keys, display, and classification of basis sets and methods.
 *
 * Notation rules follow common practice of the field: `method[-dispersion]/basis [model(solvent)]`,
 * and `energy level // geometry level` for a single point on a geometry from another level.
 */
import { ThermoInputError } from "./errors";

export interface Solvation {
  model: string;
  solvent: string;
}
export interface LevelInput {
  method: string;
  basis: string;
  dispersion?: string | null;
  solvation?: Solvation | null;
}
/** A parsed level: display-ready parts plus canonical (alias-free) parts. */
export interface Level {
  method: string;
  basis: string;
  dispersion: string | null;
  solvation: Solvation | null;
  canonical: { method: string; basis: string; dispersion: string | null; solvation: Solvation | null };
}
export interface CompositeLevel {
  energy: Level;
  /** Level of the geometry (and usually of the frequencies); null when the notation has no `//`. */
  geometry: Level | null;
}

// ---------- normalisation helpers ----------
/** Lower case, ω→w, no spaces / hyphens / underscores. */
function squash(s: string): string {
  return s
    .normalize("NFKC")
    .replace(/[ωΩ]/g, "w")
    .toLowerCase()
    .replace(/[\s_\-‐‑–—]+/g, "");
}

// ---------- dispersion ----------
const DISPERSION_ALIASES: Record<string, string> = {
  d2: "D2",
  d3: "D3(0)", "d3(0)": "D3(0)", d3zero: "D3(0)", "d3(zero)": "D3(0)", d30: "D3(0)",
  d3bj: "D3(BJ)", "d3(bj)": "D3(BJ)",
  d3m: "D3M(0)", "d3m(0)": "D3M(0)", d3mzero: "D3M(0)", "d3m(zero)": "D3M(0)",
  d3mbj: "D3M(BJ)", "d3m(bj)": "D3M(BJ)",
  d4: "D4",
  nl: "NL", vv10: "VV10",
};
/** Canonical dispersion label: `D3BJ`→`D3(BJ)`, `D3`=`D3(0)`=`D3ZERO`; unknown labels kept (upper case). */
export function canonicalDispersion(text: string | null | undefined): string | null {
  if (text === null || text === undefined) return null;
  if (typeof text !== "string") throw new ThermoInputError("dispersion", "dispersion must be text.");
  const k = squash(text);
  if (k === "" || k === "none" || k === "no") return null;
  return DISPERSION_ALIASES[k] ?? text.trim().toUpperCase().replace(/\s+/g, "");
}

/** Methods whose name ends in a dispersion-like suffix that is part of the functional itself. */
const INTRINSIC_DISPERSION = new Set(["wb97xd", "wb97xd3", "wb97xv", "wb97mv", "b97mv", "b97d", "b97d3", "b973c", "r2scan3c", "pbeh3c", "hf3c", "wb97x3c"]);
const DISPERSION_SUFFIX = /[-\s_]?(D3M?\s*\(\s*(?:BJ|0|ZERO)\s*\)|D3M?(?:BJ|ZERO)|D3M?|D[24]|NL|VV10)$/i;

// ---------- methods ----------
type Rung = "LDA" | "GGA" | "meta-GGA" | "hybrid" | "range-separated hybrid" | "double hybrid";
export interface MethodClass {
  kind: "dft" | "wavefunction" | "semiempirical" | "unknown";
  rung?: Rung;
  /** Display name of the recognised method (null if unknown). */
  name: string | null;
}
const FUNCTIONALS: Array<[Rung, string[]]> = [
  ["LDA", ["SVWN", "SVWN5", "LSDA", "LDA", "SPW92"]],
  ["GGA", ["PBE", "BP86", "BLYP", "revPBE", "RPBE", "PBEsol", "PW91", "BPW91", "OLYP", "HCTH", "HCTH407", "B97-D", "B97-D3", "B97-3c", "N12", "SOGGA11", "mPWPW91"]],
  ["meta-GGA", ["TPSS", "revTPSS", "SCAN", "rSCAN", "r2SCAN", "r2SCAN-3c", "M06-L", "M11-L", "MN12-L", "MN15-L", "B97M-V", "B97M", "VSXC", "tHCTH", "MN15L"]],
  ["hybrid", ["B3LYP", "B3PW91", "B3P86", "PBE0", "revPBE0", "TPSSh", "TPSS0", "M05", "M05-2X", "M06", "M06-2X", "M06-HF", "M08-HX", "MN15", "BHandHLYP", "BHHLYP", "B1LYP", "X3LYP", "O3LYP", "PW6B95", "BMK", "SCAN0", "r2SCAN0", "r2SCANh", "PBEh-3c", "B98", "B97", "B97-1", "B97-2", "mPW1PW91", "MPW1K", "B1B95", "HF-3c"]],
  ["range-separated hybrid", ["CAM-B3LYP", "ωB97", "ωB97X", "ωB97X-D", "ωB97X-D3", "ωB97X-V", "ωB97M-V", "ωB97M", "ωB97X-3c", "LC-ωPBE", "LC-ωhPBE", "LC-BLYP", "M11", "MN12-SX", "N12-SX", "HSE06", "HSE", "ωPBE", "ωPBEh"]],
  ["double hybrid", ["B2PLYP", "B2GP-PLYP", "mPW2PLYP", "DSD-PBEP86", "revDSD-PBEP86", "DSD-BLYP", "DSD-PBEB95", "PWPB95", "ωB97X-2", "PBE0-DH", "PBE-QIDH", "ωB2PLYP", "ωB2GP-PLYP"]],
];
const METHOD_ALIASES: Record<string, string> = { pbe1pbe: "pbe0", pbeh1pbe: "pbe0", bhhlyp: "bhandhlyp", lcwpbe: "lcwpbe", hse1pbe: "hse06", hseh1pbe: "hse06", mn15l: "mn15l" };

const WAVEFUNCTION = [
  "HF", "MP2", "MP3", "MP4", "MP4(SDQ)", "CIS", "CISD", "QCISD", "QCISD(T)", "CCSD", "CCSD(T)", "CCSDT", "CCSDT(Q)", "CCSD[T]", "CC2", "CC3", "BD", "BD(T)",
  "CASSCF", "CASPT2", "NEVPT2", "MRCI", "MRCISD", "MRCI+Q", "EOM-CCSD", "ADC(2)", "FCI", "RPA", "G3", "G4", "G4(MP2)", "CBS-QB3", "CBS-APNO", "W1", "W2",
];
const SEMIEMPIRICAL = ["AM1", "PM3", "PM6", "PM6-D3H4", "PM7", "MNDO", "RM1", "GFN1-xTB", "GFN2-xTB", "GFN0-xTB", "DFTB", "DFTB2", "DFTB3", "ZINDO"];

interface MethodInfo { kind: MethodClass["kind"]; rung?: Rung; name: string }
const METHOD_TABLE = new Map<string, MethodInfo>();
for (const [rung, names] of FUNCTIONALS) for (const n of names) METHOD_TABLE.set(squash(n), { kind: "dft", rung, name: n });
for (const n of WAVEFUNCTION) METHOD_TABLE.set(squash(n), { kind: "wavefunction", name: n });
for (const n of SEMIEMPIRICAL) METHOD_TABLE.set(squash(n), { kind: "semiempirical", name: n });

/** Prefixes that change how a wavefunction method is computed (approximations), not what it is. */
const WF_PREFIXES = ["dlpno", "lpno", "pno", "lno", "ri", "df", "scs", "sos", "loc", "l"];
/** Suffixes of explicitly correlated variants. */
const WF_SUFFIXES = ["f12a", "f12b", "f12", "r12"];

function canonicalMethodKey(method: string): string {
  let k = squash(method);
  k = METHOD_ALIASES[k] ?? k;
  // Reference prefixes U/R/RO (UB3LYP, ROHF, UCCSD(T)) are dropped only when what remains is a known method.
  for (const p of ["ro", "u", "r"]) {
    if (k.startsWith(p) && !METHOD_TABLE.has(k) && lookupMethod(k.slice(p.length))) return k.slice(p.length);
  }
  return k;
}

function lookupMethod(key: string): MethodInfo | null {
  const direct = METHOD_TABLE.get(METHOD_ALIASES[key] ?? key);
  if (direct) return direct;
  let core = key;
  let prefix = "";
  for (let changed = true; changed; ) {
    changed = false;
    for (const p of WF_PREFIXES) {
      if (core.startsWith(p) && core.length > p.length && METHOD_TABLE.get(stripSuffix(core.slice(p.length)))?.kind === "wavefunction") {
        prefix += p; core = core.slice(p.length); changed = true; break;
      }
    }
  }
  const info = METHOD_TABLE.get(stripSuffix(core));
  if (info && info.kind === "wavefunction" && (prefix || core !== stripSuffix(core))) return { kind: "wavefunction", name: info.name };
  return null;
}
function stripSuffix(k: string): string {
  for (const s of WF_SUFFIXES) if (k.endsWith(s) && k.length > s.length) return k.slice(0, -s.length);
  return k;
}

/** Kind of method and rung of the functional ladder (Perdew's "Jacob's ladder"), from a table. */
export function classifyMethod(method: string): MethodClass {
  if (typeof method !== "string" || method.trim() === "") throw new ThermoInputError("method", "method must be non-empty text.");
  const { method: bare } = splitDispersion(method);
  const info = lookupMethod(canonicalMethodKey(bare));
  if (!info) return { kind: "unknown", name: null };
  return info.rung ? { kind: info.kind, rung: info.rung, name: info.name } : { kind: info.kind, name: info.name };
}

/**
 * Methods whose basis is part of the method's definition, so that no separate basis set is named:
 * Grimme's "3c" composites, each defined with one fixed basis (e.g. r2SCAN-3c with def2-mTZVPP, Grimme
 * et al., J. Chem. Phys. 154, 064103 (2021); B97-3c with mTZVP, Brandenburg et al., J. Chem. Phys.
 * 148, 064104 (2018)), and semiempirical methods, parametrised with their own minimal valence basis.
 */
const COMPOSITES_WITH_OWN_BASIS = new Set(["b973c", "r2scan3c", "pbeh3c", "hf3c", "wb97x3c"]);
/** The basis text stored for a level whose method carries its own basis (see methodCarriesBasis). */
export const BUILT_IN_BASIS = "built-in";

/** True for a method that defines its own basis (a "3c" composite or a semiempirical method). */
export function methodCarriesBasis(method: string): boolean {
  if (typeof method !== "string" || method.trim() === "") return false;
  if (COMPOSITES_WITH_OWN_BASIS.has(canonicalMethodKey(method))) return true;
  return classifyMethod(method).kind === "semiempirical";
}

/** `B3LYP-D3(BJ)` → { method: "B3LYP", dispersion: "D3(BJ)" }; `ωB97X-D`, `B97-D` keep their own D. */
export function splitDispersion(method: string): { method: string; dispersion: string | null } {
  const m = method.trim();
  if (INTRINSIC_DISPERSION.has(squash(m))) return { method: m, dispersion: null };
  const match = DISPERSION_SUFFIX.exec(m);
  if (match && match.index > 0) {
    const rest = m.slice(0, match.index).replace(/[-\s_]+$/, "");
    if (rest && !INTRINSIC_DISPERSION.has(squash(rest + match[1]))) {
      return { method: rest, dispersion: canonicalDispersion(match[1]) };
    }
  }
  return { method: m, dispersion: null };
}

// ---------- basis ----------
/** Canonical basis key: Pople stars → parentheses, case/space/hyphen ignored. */
export function canonicalBasisKey(basis: string): string {
  let k = squash(basis).replace(/[’′]/g, "'");
  // Pople: 6-31G** = 6-31G(d,p); 6-31G* = 6-31G(d); 6-31+G* = 6-31+G(d).
  const pople = /^(\d+)(\+{0,2})g(\*{1,2})$/.exec(k);
  if (pople) k = `${pople[1]}${pople[2]}g${pople[3] === "**" ? "(d,p)" : "(d)"}`;
  return k;
}

export interface BasisClass {
  family: "pople" | "dunning" | "karlsruhe" | "other";
  /** Zeta level of the valence: 1 minimal, 2 double, 3 triple ...; null when not recognised. */
  zeta: 1 | 2 | 3 | 4 | 5 | 6 | null;
  /** Polarisation functions on heavy atoms. */
  polarisation: boolean;
  /** Polarisation functions on hydrogen too. */
  polarisationHydrogen: boolean;
  /** Highest angular momentum of the polarisation functions on carbon (null: none or unknown). */
  highestPolarisationCarbon: "d" | "f" | "g" | "h" | "i" | null;
  /** Diffuse functions: none, on heavy atoms only (or partial augmentation), or on all atoms. */
  diffuse: "none" | "heavy" | "all";
}

const L_LETTERS = ["s", "p", "d", "f", "g", "h", "i"] as const;
function highestL(shells: string): BasisClass["highestPolarisationCarbon"] {
  let best = -1;
  for (const ch of shells) {
    const idx = L_LETTERS.indexOf(ch as (typeof L_LETTERS)[number]);
    if (idx > best) best = idx;
  }
  return best >= 2 ? (L_LETTERS[best] as BasisClass["highestPolarisationCarbon"]) : null;
}

/** Classifies a basis-set name by the trade's notation (common practice). */
export function classifyBasis(basis: string): BasisClass {
  if (typeof basis !== "string" || basis.trim() === "") throw new ThermoInputError("basis", "basis must be non-empty text.");
  const k = canonicalBasisKey(basis);
  let m: RegExpExecArray | null;
  // Pople split-valence: 3-21G, 6-31G, 6-311G with + / ++ and (heavy[,H]) polarisation.
  if ((m = /^(\d)(21|31|311|3111)(\+{0,2})g(?:\(([^,)]*)(?:,([^)]*))?\))?$/.exec(k))) {
    const [, , split, plus, heavy, hyd] = m;
    const zeta = (split!.length === 2 ? 2 : split!.length === 3 ? 3 : 4) as BasisClass["zeta"];
    const heavyPol = !!heavy && /[dfghi]/.test(heavy);
    return {
      family: "pople", zeta, polarisation: heavyPol, polarisationHydrogen: !!hyd && /[pdfghi]/.test(hyd),
      highestPolarisationCarbon: heavyPol ? highestL(heavy!) : null,
      diffuse: plus === "++" ? "all" : plus === "+" ? "heavy" : "none",
    };
  }
  if (/^sto\d+g$/.test(k)) {
    return { family: "pople", zeta: 1, polarisation: false, polarisationHydrogen: false, highestPolarisationCarbon: null, diffuse: "none" };
  }
  // Dunning correlation-consistent: (aug|jun|may|...)-cc-p(w)(C)VXZ; X = D,T,Q,5,6. Highest l on C = X+1 (d for DZ).
  if ((m = /^(aug|daug|taug|jun|may|apr|mar|feb)?ccp(?:w?c)?v\(?([dtq56])(?:\+d)?\)?z/.exec(k))) {
    const zeta = ({ d: 2, t: 3, q: 4, "5": 5, "6": 6 } as const)[m[2] as "d" | "t" | "q" | "5" | "6"];
    const pref = m[1] ?? "";
    return {
      family: "dunning", zeta, polarisation: true, polarisationHydrogen: true,
      highestPolarisationCarbon: L_LETTERS[zeta] as BasisClass["highestPolarisationCarbon"],
      diffuse: pref === "" ? "none" : pref.endsWith("aug") ? "all" : "heavy",
    };
  }
  // Karlsruhe def2: SV(P), SVP, TZVP, TZVPP, QZVP, QZVPP, with ma- (minimally augmented, heavy atoms) or ...D (all atoms).
  if ((m = /^(ma)?def2(sv\(p\)|svp|tzvpp|tzvp|qzvpp|qzvp|sv)(d?)$/.exec(k))) {
    const [, ma, core, d] = m;
    const zeta = core!.startsWith("sv") ? 2 : core!.startsWith("tz") ? 3 : 4;
    const pol = core !== "sv";
    return {
      family: "karlsruhe", zeta: zeta as BasisClass["zeta"], polarisation: pol,
      polarisationHydrogen: pol && core !== "sv(p)",
      highestPolarisationCarbon: !pol ? null : zeta === 2 ? "d" : zeta === 3 ? "f" : "g",
      diffuse: d ? "all" : ma ? "heavy" : "none",
    };
  }
  // Jensen polarisation-consistent pcseg-n / pc-n: n+1 zeta for n ≥ 1.
  if ((m = /^(aug)?pc(?:seg|s|j)?(\d)$/.exec(k))) {
    const n = Number(m[2]);
    const zeta = n === 0 ? 2 : (Math.min(n + 1, 5) as BasisClass["zeta"]);
    return {
      family: "other", zeta: zeta as BasisClass["zeta"], polarisation: n >= 1, polarisationHydrogen: n >= 1,
      highestPolarisationCarbon: n >= 1 ? (L_LETTERS[Math.min(n + 1, 6)] as BasisClass["highestPolarisationCarbon"]) : null,
      diffuse: m[1] ? "all" : "none",
    };
  }
  const zeta = /(5z|5zeta)/.test(k) ? 5 : /(qz|quadruple)/.test(k) ? 4 : /(tz|triple)/.test(k) ? 3 : /(dz|double|svp)/.test(k) ? 2 : null;
  return { family: "other", zeta, polarisation: false, polarisationHydrogen: false, highestPolarisationCarbon: null, diffuse: /(aug|diffuse|\+)/.test(k) ? "all" : "none" };
}

// ---------- solvation ----------
const SOLVATION_MODELS: Record<string, string> = {
  smd: "SMD", pcm: "PCM", cpcm: "CPCM", iefpcm: "IEFPCM", cosmo: "COSMO", cosmors: "COSMO-RS", ddcosmo: "ddCOSMO",
  alpb: "ALPB", gbsa: "GBSA", sm8: "SM8", sm12: "SM12", cpcmx: "CPCM-X", gbsa2: "GBSA",
};
const SOLVENT_ALIASES: Record<string, string> = {
  h2o: "water", water: "water", dcm: "dichloromethane", ch2cl2: "dichloromethane", thf: "tetrahydrofuran",
  mecn: "acetonitrile", ch3cn: "acetonitrile", dmso: "dimethylsulfoxide", dimethylsulphoxide: "dimethylsulfoxide",
  meoh: "methanol", ch3oh: "methanol", etoh: "ethanol", dmf: "n,ndimethylformamide", chcl3: "chloroform",
};
function canonicalSolvation(s: Solvation | null | undefined): Solvation | null {
  if (s === null || s === undefined) return null;
  if (typeof s !== "object" || typeof s.model !== "string" || typeof s.solvent !== "string" || !s.model.trim() || !s.solvent.trim()) {
    throw new ThermoInputError("solvation", "solvation needs a model and a solvent, e.g. {model: \"SMD\", solvent: \"water\"}.");
  }
  const mk = squash(s.model);
  const sk = squash(s.solvent);
  return { model: SOLVATION_MODELS[mk] ?? s.model.trim().toUpperCase(), solvent: SOLVENT_ALIASES[sk] ?? sk };
}

// ---------- levels ----------
/** Validates and canonicalises a level given as parts; dispersion may sit on the method (`B3LYP-D3(BJ)`). */
export function parseLevel(input: LevelInput): Level {
  if (typeof input !== "object" || input === null) throw new ThermoInputError("level", "level must be an object {method, basis}.");
  if (typeof input.method !== "string" || input.method.trim() === "") throw new ThermoInputError("method", "method must be non-empty text, e.g. \"B3LYP\".");
  const noBasis = input.basis === undefined || input.basis === null || (typeof input.basis === "string" && input.basis.trim() === "");
  // A composite "3c" or semiempirical method brings its own basis: stored as the built-in marker.
  if (noBasis && methodCarriesBasis(input.method)) return parseLevel({ ...input, basis: BUILT_IN_BASIS });
  if (typeof input.basis !== "string" || input.basis.trim() === "") {
    throw new ThermoInputError("basis", `${input.method.trim()} needs a basis set, e.g. "def2-TZVP" (only "3c" composites and semiempirical methods carry their own).`);
  }
  const split = splitDispersion(input.method);
  const explicit = canonicalDispersion(input.dispersion);
  if (split.dispersion && explicit && split.dispersion !== explicit) {
    throw new ThermoInputError("dispersion", `The method names dispersion ${split.dispersion} but dispersion says ${explicit}.`);
  }
  const dispersion = split.dispersion ?? explicit;
  const solvation = canonicalSolvation(input.solvation);
  const methodInfo = lookupMethod(canonicalMethodKey(split.method));
  return {
    method: methodInfo?.name && squash(split.method) === squash(methodInfo.name) ? methodInfo.name : split.method.trim().replace(/\s+/g, ""),
    basis: input.basis.trim().replace(/\s+/g, ""),
    dispersion,
    solvation: solvation && input.solvation ? { model: solvation.model, solvent: input.solvation.solvent.trim() } : null,
    canonical: { method: canonicalMethodKey(split.method), basis: canonicalBasisKey(input.basis), dispersion, solvation },
  };
}

/** Parses `B3LYP-D3(BJ)/def2-TZVP SMD(water)` (also `... (SMD, water)` and `... SMD/water`). */
export function parseLevelString(text: string): Level {
  if (typeof text !== "string" || text.trim() === "") throw new ThermoInputError("level", "level must be non-empty text like \"B3LYP-D3(BJ)/def2-TZVP\".");
  if (text.includes("//")) throw new ThermoInputError("level", "A single level cannot contain \"//\"; use parseCompositeLevel for `energy // geometry`.");
  let rest = text.trim();
  let solvation: Solvation | undefined;
  let m = /\s*\(\s*([A-Za-z][\w-]*)\s*[,;]\s*([^)]+?)\s*\)\s*$/.exec(rest) // (SMD, water)
    ?? /\s+([A-Za-z][\w-]*)\s*\(\s*([^)]+?)\s*\)\s*$/.exec(rest) // SMD(water)
    ?? /\s+([A-Za-z][\w-]*)\s*[/=:]\s*([\w,-]+)\s*$/.exec(rest); // SMD/water, SMD=water
  if (m && SOLVATION_MODELS[squash(m[1]!)]) {
    solvation = { model: m[1]!, solvent: m[2]! };
    rest = rest.slice(0, m.index).trim();
  } else {
    m = null;
  }
  const slash = rest.indexOf("/");
  if (slash < 0 && methodCarriesBasis(rest)) return parseLevel({ method: rest, basis: BUILT_IN_BASIS, solvation });
  if (slash <= 0 || slash === rest.length - 1) {
    throw new ThermoInputError("level", `Cannot read ${JSON.stringify(text)} as method/basis, e.g. "B3LYP-D3(BJ)/def2-TZVP SMD(water)".`);
  }
  const method = rest.slice(0, slash).trim();
  const basis = rest.slice(slash + 1).trim();
  if (/\s/.test(basis)) throw new ThermoInputError("level", `Unrecognised text after the basis in ${JSON.stringify(text)}; solvation is written e.g. SMD(water).`);
  return parseLevel({ method, basis, solvation });
}

/** `DLPNO-CCSD(T)/def2-TZVP // B3LYP-D3(BJ)/def2-SVP`: energy level // geometry level. */
export function parseCompositeLevel(text: string): CompositeLevel {
  if (typeof text !== "string") throw new ThermoInputError("level", "level must be text.");
  const parts = text.split("//");
  if (parts.length > 2) throw new ThermoInputError("level", "Write at most one `//` (energy level // geometry level).");
  const energy = parseLevelString(parts[0]!);
  const geometry = parts.length === 2 ? parseLevelString(parts[1]!) : null;
  return { energy, geometry };
}

/** Canonical key: aliases compare equal, real differences stay (e.g. `b3lyp-d3(bj)/def2tzvp smd(water)`). */
export function canonicalLevelKey(level: Level | LevelInput | string): string {
  const l = typeof level === "string" ? parseLevelString(level) : "canonical" in level ? level : parseLevel(level);
  const c = l.canonical;
  const disp = c.dispersion ? `-${c.dispersion.toLowerCase()}` : "";
  const solv = c.solvation ? ` ${c.solvation.model.toLowerCase()}(${c.solvation.solvent})` : "";
  return `${c.method}${disp}/${c.basis}${solv}`;
}

export function canonicalCompositeKey(level: CompositeLevel | string): string {
  const l = typeof level === "string" ? parseCompositeLevel(level) : level;
  return l.geometry ? `${canonicalLevelKey(l.energy)}//${canonicalLevelKey(l.geometry)}` : canonicalLevelKey(l.energy);
}

/** Human form, e.g. "B3LYP-D3(BJ)/def2-TZVP (SMD, water)"; parseLevelString reads it back. */
export function formatLevel(level: Level | LevelInput | string): string {
  const l = typeof level === "string" ? parseLevelString(level) : "canonical" in level ? level : parseLevel(level);
  const disp = l.dispersion ? `-${l.dispersion}` : "";
  const solv = l.solvation ? ` (${l.solvation.model === l.canonical.solvation?.model ? l.solvation.model : l.canonical.solvation?.model}, ${l.solvation.solvent})` : "";
  return `${l.method}${disp}/${l.basis}${solv}`;
}

export function formatCompositeLevel(level: CompositeLevel): string {
  return level.geometry ? `${formatLevel(level.energy)} // ${formatLevel(level.geometry)}` : formatLevel(level.energy);
}
