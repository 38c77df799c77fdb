import { ConformerGenerator, Molecule, Resources } from "openchemlib";

/**
 * Invented but plausible 3D geometries (Å) for the demo species: organic molecules from openchemlib's
 * conformer generator (hydrogens included), the nickel complexes assembled around a Ni centre from
 * ligand fragments at typical bond lengths (Ni–P 2.15–2.22, Ni–H 1.45–1.55, Ni–C(N) 1.87–1.92,
 * Ni–C(alkyl) 2.00 Å; ideal trigonal, tetrahedral, square-planar and trigonal-bipyramidal directions —
 * common textbook values, from memory). Not optimised: they give masses and moments of inertia of the
 * right size for the thermochemistry, nothing more. Deterministic (fixed generator seed), so every seed
 * run writes the same text.
 */
type V = [number, number, number];
type Atom = { el: string; p: V };

const add = (a: V, b: V): V => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const sub = (a: V, b: V): V => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const scale = (a: V, s: number): V => [a[0] * s, a[1] * s, a[2] * s];
const dot = (a: V, b: V) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: V, b: V): V => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const norm = (a: V) => Math.sqrt(dot(a, a));
const unit = (a: V): V => scale(a, 1 / norm(a));
const dist = (a: V, b: V) => norm(sub(a, b));
const deg = Math.PI / 180;

/** Rotation of v about the unit axis k by angle (Rodrigues). */
function rotate(v: V, k: V, angle: number): V {
  const c = Math.cos(angle), s = Math.sin(angle);
  return add(add(scale(v, c), scale(cross(k, v), s)), scale(k, dot(k, v) * (1 - c)));
}

/** The rotation taking unit vector a onto unit vector b, as a function. */
function aligner(a: V, b: V): (v: V) => V {
  const axis = cross(a, b);
  const c = Math.max(-1, Math.min(1, dot(a, b)));
  if (norm(axis) < 1e-9) {
    if (c > 0) return (v) => v;
    const perp = unit(Math.abs(a[0]) < 0.9 ? cross(a, [1, 0, 0]) : cross(a, [0, 1, 0]));
    return (v) => rotate(v, perp, Math.PI);
  }
  const k = unit(axis);
  const angle = Math.acos(c);
  return (v) => rotate(v, k, angle);
}

// ---------------------------------------------------------------- organic molecules from openchemlib
type Mol = { atoms: Atom[]; bonds: number[][] };
let resourcesReady = false;
const generated = new Map<string, Mol>();

/** One 3D conformer of a SMILES (explicit H appended after the heavy atoms, in SMILES order); a fresh copy each call. */
function fromSmiles(smiles: string): Mol {
  const hit = generated.get(smiles) ?? generate(smiles);
  generated.set(smiles, hit);
  return { atoms: hit.atoms.map((a) => ({ el: a.el, p: [...a.p] as V })), bonds: hit.bonds };
}

function generate(smiles: string): Mol {
  if (!resourcesReady) {
    Resources.registerFromNodejs();
    resourcesReady = true;
  }
  const m = Molecule.fromSmiles(smiles);
  const c = new ConformerGenerator(20240517).getOneConformerAsMolecule(m);
  if (!c) throw new Error(`no conformer for ${smiles}`);
  const n = c.getAllAtoms();
  const atoms: Atom[] = [];
  const bonds: number[][] = [];
  for (let i = 0; i < n; i++) {
    atoms.push({ el: c.getAtomLabel(i), p: [c.getAtomX(i), c.getAtomY(i), c.getAtomZ(i)] });
    bonds.push(Array.from({ length: c.getAllConnAtoms(i) }, (_, j) => c.getConnAtom(i, j)));
  }
  return { atoms, bonds };
}

/** Atoms on b's side of the bond a–b. */
function sideOf(mol: Mol, a: number, b: number): number[] {
  const seen = new Set([a, b]);
  const stack = [b];
  const out = [b];
  while (stack.length) {
    for (const n of mol.bonds[stack.pop()!]!) if (!seen.has(n)) { seen.add(n); out.push(n); stack.push(n); }
  }
  return out;
}

/** A copy of mol with b's side of the bond a–b turned about it (a torsion change: another conformer). */
function twist(mol: Mol, a: number, b: number, angle: number): Mol {
  const k = unit(sub(mol.atoms[b]!.p, mol.atoms[a]!.p));
  const origin = mol.atoms[b]!.p;
  const moved = new Set(sideOf(mol, a, b));
  return { bonds: mol.bonds, atoms: mol.atoms.map((x, i) => (moved.has(i) ? { el: x.el, p: add(origin, rotate(sub(x.p, origin), k, angle)) } : { ...x })) };
}

// ---------------------------------------------------------------- fragments and their placement on Ni
/** A ligand: its atoms, the point that binds, the unit vector from that point towards the metal. */
type Fragment = { atoms: Atom[]; anchor: V; toMetal: V };

const lone = (el: string): Fragment => ({ atoms: [{ el, p: [0, 0, 0] }], anchor: [0, 0, 0], toMetal: [0, 0, -1] });

/**
 * P(OMe)3 bound through phosphorus; the lone pair points away from the three oxygens, and each methyl
 * is turned about its P–O bond as far from the metal as it goes (as in phosphite complexes).
 */
function phosphite(): Fragment {
  let mol = fromSmiles("COP(OC)OC");
  const p = mol.atoms.findIndex((a) => a.el === "P");
  const oxygens = mol.bonds[p]!.filter((i) => mol.atoms[i]!.el === "O");
  const toMetal = unit(scale(oxygens.map((i) => unit(sub(mol.atoms[i]!.p, mol.atoms[p]!.p))).reduce(add), -1));
  const metal = add(mol.atoms[p]!.p, scale(toMetal, 2.2));
  // Least crowded torsions: each methyl against the metal position and the other two methoxy groups.
  const crowd = (m: Mol, o: number) => {
    const mine = sideOf(m, p, o).filter((i) => i !== o);
    const others = oxygens.filter((x) => x !== o).flatMap((x) => sideOf(m, p, x));
    return mine.reduce((s, i) => s + 4 * dist(m.atoms[i]!.p, metal) ** -6 + others.reduce((t, j) => t + dist(m.atoms[i]!.p, m.atoms[j]!.p) ** -6, 0), 0);
  };
  for (let pass = 0; pass < 2; pass++) {
    for (const o of oxygens) {
      let best = mol;
      for (let k = 1; k < 36; k++) {
        const turned = twist(mol, p, o, k * 10 * deg);
        if (crowd(turned, o) < crowd(best, o)) best = turned;
      }
      mol = best;
    }
  }
  return { atoms: mol.atoms, anchor: mol.atoms[p]!.p, toMetal };
}

/** The phosphite and three variants with every methoxy turned a little, for crowded sites. */
function phosphites(): Fragment[] {
  const base = phosphite();
  const mol: Mol = { atoms: base.atoms, bonds: fromSmiles("COP(OC)OC").bonds };
  const p = mol.atoms.findIndex((a) => a.el === "P");
  const oxygens = mol.bonds[p]!.filter((i) => mol.atoms[i]!.el === "O");
  return [0, 35, -35, 70].map((angle) => {
    let m = mol;
    for (const o of oxygens) m = twist(m, p, o, angle * deg);
    return { atoms: m.atoms, anchor: base.anchor, toMetal: base.toMetal };
  });
}

/** Cyanide bound through carbon (C≡N 1.16 Å). */
const cyanide = (): Fragment => ({ atoms: [{ el: "C", p: [0, 0, 0] }, { el: "N", p: [0, 0, 1.16] }], anchor: [0, 0, 0], toMetal: [0, 0, -1] });

/** HCN bound end-on through N (N≡C 1.16, C–H 1.07 Å). */
const hcnEndOn = (): Fragment => ({ atoms: [{ el: "N", p: [0, 0, 0] }, { el: "C", p: [0, 0, 1.16] }, { el: "H", p: [0, 0, 2.23] }], anchor: [0, 0, 0], toMetal: [0, 0, -1] });

/** HCN bound side-on through the C≡N π bond (lengthened to 1.21 Å), H bent back by 35°. */
function hcnSideOn(): Fragment {
  const c: V = [-0.605, 0, 0];
  return {
    atoms: [{ el: "C", p: c }, { el: "N", p: [0.605, 0, 0] }, { el: "H", p: add(c, [-1.07 * Math.cos(35 * deg), 0, 1.07 * Math.sin(35 * deg)]) }],
    anchor: [0, 0, 0],
    toMetal: [0, 0, -1],
  };
}

/** A group bound through the atom that carries the Cl of the SMILES (the Cl marks the metal and is dropped). */
function viaPlaceholder(smiles: string, turn?: { a: number; b: number; angle: number }): Fragment {
  let mol = fromSmiles(smiles);
  if (turn) mol = twist(mol, turn.a, turn.b, turn.angle);
  const cl = mol.atoms.findIndex((a) => a.el === "Cl");
  const at = mol.bonds[cl]![0]!;
  return { atoms: mol.atoms.filter((_, i) => i !== cl), anchor: mol.atoms[at]!.p, toMetal: unit(sub(mol.atoms[cl]!.p, mol.atoms[at]!.p)) };
}

/** The benzylic 1-arylethyl group bound through Cα, in six rotamers about Cα–C(aryl) (atoms 1 and 3). */
const arylethyl = () => [0, 60, 120, 180, 240, 300].map((a) => viaPlaceholder("CC(Cl)c1ccc(OC)cc1", { a: 1, b: 3, angle: a * deg }));

/** 4-methoxystyrene bound η² through the vinyl C=C (atoms 0 and 1 of the SMILES). */
function styreneEta2(): Fragment {
  const mol = fromSmiles("C=Cc1ccc(OC)cc1");
  const [c1, c2, c3] = [mol.atoms[0]!.p, mol.atoms[1]!.p, mol.atoms[2]!.p];
  return { atoms: mol.atoms, anchor: scale(add(c1, c2), 0.5), toMetal: unit(cross(sub(c2, c1), sub(c3, c2))) };
}

/** The branched nitrile bound end-on through N (atom 3 of the SMILES). */
function nitrileEndOn(): Fragment {
  const mol = fromSmiles("CC(C#N)c1ccc(OC)cc1");
  return { atoms: mol.atoms, anchor: mol.atoms[3]!.p, toMetal: unit(sub(mol.atoms[3]!.p, mol.atoms[2]!.p)) };
}

/** A ligand site; with several fragments (rotamers of one ligand), the least crowded one is taken. */
type Site = { fragment: Fragment | Fragment[]; direction: V; distance: number; prefer?: (atoms: Atom[]) => number };

/** Places the fragment with its anchor at distance along direction from Ni (origin), turned about that axis by spin. */
function place(f: Fragment, direction: V, distance: number, spin: number): Atom[] {
  const u = unit(direction);
  const align = aligner(f.toMetal, scale(u, -1));
  const at = scale(u, distance);
  return f.atoms.map((a) => ({ el: a.el, p: add(at, rotate(align(sub(a.p, f.anchor)), u, spin)) }));
}

/** Steric crowding of a placed fragment against what is already there (sum of r⁻⁶). */
const crowding = (atoms: Atom[], others: Atom[]) => atoms.reduce((s, a) => s + others.reduce((t, b) => t + dist(a.p, b.p) ** -6, 0), 0);

/**
 * Ni at the origin and each ligand on its site, each turned about its bond to the least crowded of 24
 * positions given the others (a few rounds, so that late ligands can make room for early ones).
 */
function complex(sites: Site[]): Atom[] {
  const options = sites.map((s) => (Array.isArray(s.fragment) ? s.fragment : [s.fragment]));
  const placed = sites.map((s, i) => place(options[i]![0]!, s.direction, s.distance, 0));
  for (let round = 0; round < 4; round++) {
    for (const [i, s] of sites.entries()) {
      const others = placed.filter((_, j) => j !== i).flat();
      let bestScore = Infinity;
      for (const f of options[i]!) {
        for (let k = 0; k < 24; k++) {
          const trial = place(f, s.direction, s.distance, k * 15 * deg);
          const score = crowding(trial, others) + (s.prefer ? s.prefer(trial) : 0);
          if (score < bestScore - 1e-12) { bestScore = score; placed[i] = trial; }
        }
      }
    }
  }
  return [{ el: "Ni", p: [0, 0, 0] }, ...placed.flat()];
}

const polar = (theta: number, phi: number): V => [Math.sin(theta * deg) * Math.cos(phi * deg), Math.sin(theta * deg) * Math.sin(phi * deg), Math.cos(theta * deg)];
const TETRA_REST = [polar(109.47, 60), polar(109.47, 180), polar(109.47, 300)];
const planar = (phi: number): V => polar(90, phi);

function toXyz(atoms: Atom[], comment: string): string {
  return `${atoms.length}\n${comment}\n${atoms.map((a) => `${a.el} ${a.p.map((x) => x.toFixed(4)).join(" ")}`).join("\n")}\n`;
}

const L = (direction: V, distance = 2.17): Site => ({ fragment: phosphites(), direction, distance });

// ---------------------------------------------------------------- the demo's structures
/** The 4-methoxystyrene rotamers: the methyl of the methoxy on the far (anti) or near (syn) side of the vinyl CH₂. */
function styrene(which: "anti" | "syn"): Atom[] {
  const mol = fromSmiles("C=Cc1ccc(OC)cc1");
  // Atoms 2 and 5 are the ring carbons on the para axis, 0 the vinyl CH₂, 7 the methoxy carbon.
  const side = (m: Mol, i: number) => {
    const axis = sub(m.atoms[5]!.p, m.atoms[2]!.p);
    const ringNormal = cross(axis, sub(m.atoms[3]!.p, m.atoms[2]!.p));
    return Math.sign(dot(cross(axis, sub(m.atoms[i]!.p, m.atoms[2]!.p)), ringNormal));
  };
  const isAnti = (m: Mol) => side(m, 0) !== side(m, 7);
  const other = twist(mol, 5, 6, Math.PI);
  return ((which === "anti") === isAnti(mol) ? mol : other).atoms;
}

/** The nitrile's two rotamers about the aryl–CH bond (atoms 4 and 1 of the SMILES). */
const nitrile = (which: "a" | "b") => {
  const mol = fromSmiles("CC(C#N)c1ccc(OC)cc1");
  return (which === "a" ? mol : twist(mol, 4, 1, Math.PI)).atoms;
};

const cis = (a: V, b: V) => unit(add(unit(a), unit(b)));

export const DEMO_GEOMETRIES = {
  L: () => toXyz(fromSmiles("COP(OC)OC").atoms, "trimethyl phosphite (demo geometry)"),
  HCN: () => toXyz([{ el: "H", p: [0, 0, -1.068] }, { el: "C", p: [0, 0, 0] }, { el: "N", p: [0, 0, 1.153] }], "HCN (demo geometry)"),
  toluene: () => toXyz(fromSmiles("Cc1ccccc1").atoms, "toluene (demo geometry)"),
  styrene: (which: "anti" | "syn") => toXyz(styrene(which), `4-methoxystyrene, ${which} methoxy (demo geometry)`),
  nitrile: (which: "a" | "b") => toXyz(nitrile(which), `2-(4-methoxyphenyl)propanenitrile, rotamer ${which} (demo geometry)`),
  NiL3: () => toXyz(complex([L(planar(90)), L(planar(210)), L(planar(330))]), "Ni[P(OMe)3]3, trigonal planar (demo geometry)"),
  NiL4: () => toXyz(complex([L([0, 0, 1], 2.2), ...TETRA_REST.map((d) => L(d, 2.2))]), "Ni[P(OMe)3]4, tetrahedral (demo geometry)"),
  "NiL3-HCN": (which: "end-on" | "side-on") =>
    toXyz(
      complex([
        which === "end-on" ? { fragment: hcnEndOn(), direction: [0, 0, 1], distance: 1.9 } : { fragment: hcnSideOn(), direction: [0, 0, 1], distance: 1.88 },
        ...TETRA_REST.map((d) => L(d, 2.19)),
      ]),
      `Ni[P(OMe)3]3(HCN), HCN ${which} (demo geometry)`,
    ),
  "TS-OA": () => {
    // H–C bond breaking over nickel: Ni–H 1.55, Ni–C 1.90 Å at 50°, so H···C ≈ 1.50 Å.
    const h = scale(polar(25, 180), 1.55);
    const c = scale(polar(25, 0), 1.9);
    const n = add(c, scale(unit(add(unit(c), [0.25, 0, 0])), 1.17));
    const core: Atom[] = [{ el: "H", p: h }, { el: "C", p: c }, { el: "N", p: n }];
    const rest = complex(TETRA_REST.map((d) => L(d, 2.2))).slice(1);
    return toXyz([{ el: "Ni", p: [0, 0, 0] }, ...core, ...rest], "oxidative addition of H–CN, transition state (demo geometry)");
  },
  "HNiCN-L3": () =>
    toXyz(
      complex([{ fragment: lone("H"), direction: [0, 0, 1], distance: 1.49 }, { fragment: cyanide(), direction: [0, 0, -1], distance: 1.89 }, L(planar(0), 2.22), L(planar(120), 2.22), L(planar(240), 2.22)]),
      "H–Ni(CN)[P(OMe)3]3, trigonal bipyramid (demo geometry)",
    ),
  "HNiCN-L2": () =>
    toXyz(
      complex([{ fragment: lone("H"), direction: [1, 0, 0], distance: 1.46 }, { fragment: cyanide(), direction: [-1, 0, 0], distance: 1.87 }, L([0, 1, 0], 2.16), L([0, -1, 0], 2.16)]),
      "trans-H–Ni(CN)[P(OMe)3]2, square planar (demo geometry)",
    ),
  "HNiCN-L2-alkene": () =>
    toXyz(
      complex([
        { fragment: lone("H"), direction: [0, 0, 1], distance: 1.48 }, { fragment: cyanide(), direction: [0, 0, -1], distance: 1.89 },
        { fragment: styreneEta2(), direction: planar(240), distance: 1.92 }, L(planar(0), 2.2), L(planar(120), 2.2),
      ]),
      "H–Ni(CN)[P(OMe)3]2(η²-4-methoxystyrene) (demo geometry)",
    ),
  "TS-ins": () => {
    // The benzylic alkyl with its methyl turned towards the open apical site; one methyl H is moved
    // halfway back onto nickel (C···H 1.42 Å), the four-centre Ni–C–C–H of migratory insertion.
    const atoms = complex([
      { fragment: arylethyl(), direction: [1, 0, 0], distance: 2.06, prefer: (placed) => -placed[0]!.p[2] * 10 },
      { fragment: cyanide(), direction: [0, 1, 0], distance: 1.88 }, L([-1, 0, 0], 2.22), L([0, -1, 0], 2.2),
    ]);
    const methyl = atoms[1]!.p; // first atom of the alkyl fragment: the methyl carbon
    const hs = atoms.map((a, i) => ({ a, i })).filter((x) => x.a.el === "H" && dist(x.a.p, methyl) < 1.2);
    const h = hs.reduce((best, x) => (norm(x.a.p) < norm(best.a.p) ? x : best));
    atoms[h.i] = { el: "H", p: add(methyl, scale(unit(add(scale(unit(scale(methyl, -1)), 0.75), scale(unit(sub(h.a.p, methyl)), 0.25))), 1.42)) };
    return toXyz(atoms, "migratory insertion into Ni–H, transition state (demo geometry)");
  },
  "Ni-alkyl": () =>
    toXyz(
      complex([
        { fragment: arylethyl(), direction: [1, 0, 0], distance: 2.0 },
        { fragment: cyanide(), direction: [0, 1, 0], distance: 1.87 }, L([-1, 0, 0], 2.22), L([0, -1, 0], 2.2),
      ]),
      "Ni(CN)[CH(CH3)Ar][P(OMe)3]2, square planar (demo geometry)",
    ),
  "TS-RE": () =>
    toXyz(
      complex([
        // C–CN bond forming: Ni–C(alkyl) 2.05, Ni–C(N) 1.90 Å at 60°, so C···C ≈ 1.98 Å.
        {
          fragment: arylethyl(), direction: planar(0), distance: 2.05,
          // keep the Cα substituents off the incoming cyanide carbon
          prefer: (placed) => placed.reduce((sum, a, i) => sum + (i === 1 ? 0 : 10 * Math.max(0, 2.45 - dist(a.p, scale(planar(60), 1.9))) ** 2), 0),
        },
        { fragment: cyanide(), direction: planar(60), distance: 1.9 }, L(planar(160), 2.22), L(planar(250), 2.22),
      ]),
      "C–CN reductive elimination, transition state (demo geometry)",
    ),
  "NiL2-nitrile": () =>
    toXyz(
      complex([{ fragment: nitrileEndOn(), direction: planar(90), distance: 1.9 }, L(planar(210), 2.15), L(planar(330), 2.15)]),
      "Ni[P(OMe)3]2(N≡C–R), product complex (demo geometry)",
    ),
} as const;

/** Shortest distance (Å) between atoms not bonded by the usual covalent radii; a sanity check for the builders. */
export function closestContact(xyzText: string): number {
  const rows = xyzText.trim().split("\n").slice(2).map((l) => l.trim().split(/\s+/));
  const atoms = rows.map((r) => ({ el: r[0]!, p: [Number(r[1]), Number(r[2]), Number(r[3])] as V }));
  const radius: Record<string, number> = { H: 0.32, C: 0.76, N: 0.71, O: 0.66, P: 1.07, Ni: 1.24, Cl: 1.02 };
  let min = Infinity;
  for (let i = 0; i < atoms.length; i++) {
    for (let j = i + 1; j < atoms.length; j++) {
      const d = dist(atoms[i]!.p, atoms[j]!.p);
      if (d > 1.3 * ((radius[atoms[i]!.el] ?? 1) + (radius[atoms[j]!.el] ?? 1))) min = Math.min(min, d);
    }
  }
  return min;
}
