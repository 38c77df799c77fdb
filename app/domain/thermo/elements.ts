/**
 * Elements 1–92: symbol, atomic number, mass of the most abundant isotope (u) and standard atomic weight.
 *
 * Isotope masses: AME2016/AME2020 atomic mass evaluation (as tabulated by NIST "Atomic Weights and Isotopic
 * Compositions"). Standard atomic weights: IUPAC CIAAW abridged/conventional values (2013–2019). For elements
 * without a stable isotope (Tc, Pm, Po–U where noted) the longest-lived / conventional isotope is used for
 * both columns. D and T are accepted as hydrogen isotopes.
 */
export interface Element {
  symbol: string;
  z: number;
  /** Mass of the most abundant isotope, u. */
  isotopicMass: number;
  /** Standard atomic weight (abundance-weighted mean), u. */
  atomicWeight: number;
}

// [symbol, most-abundant-isotope mass, standard atomic weight]; atomic number = index + 1.
const DATA: Array<[string, number, number]> = [
  ["H", 1.00782503223, 1.008], ["He", 4.00260325413, 4.002602], ["Li", 7.0160034366, 6.94], ["Be", 9.012183065, 9.0121831],
  ["B", 11.00930536, 10.81], ["C", 12, 12.011], ["N", 14.00307400443, 14.007], ["O", 15.99491461957, 15.999],
  ["F", 18.99840316273, 18.998403163], ["Ne", 19.9924401762, 20.1797], ["Na", 22.989769282, 22.98976928], ["Mg", 23.985041697, 24.305],
  ["Al", 26.98153853, 26.9815385], ["Si", 27.97692653465, 28.085], ["P", 30.97376199842, 30.973761998], ["S", 31.9720711744, 32.06],
  ["Cl", 34.968852682, 35.45], ["Ar", 39.9623831237, 39.948], ["K", 38.9637064864, 39.0983], ["Ca", 39.962590863, 40.078],
  ["Sc", 44.95590828, 44.955908], ["Ti", 47.94794198, 47.867], ["V", 50.94395704, 50.9415], ["Cr", 51.94050623, 51.9961],
  ["Mn", 54.93804391, 54.938044], ["Fe", 55.93493633, 55.845], ["Co", 58.93319429, 58.933194], ["Ni", 57.93534241, 58.6934],
  ["Cu", 62.92959772, 63.546], ["Zn", 63.92914201, 65.38], ["Ga", 68.9255735, 69.723], ["Ge", 73.921177761, 72.63],
  ["As", 74.92159457, 74.921595], ["Se", 79.9165218, 78.971], ["Br", 78.9183376, 79.904], ["Kr", 83.9114977282, 83.798],
  ["Rb", 84.9117897379, 85.4678], ["Sr", 87.9056125, 87.62], ["Y", 88.9058403, 88.90584], ["Zr", 89.9046977, 91.224],
  ["Nb", 92.906373, 92.90637], ["Mo", 97.90540482, 95.95], ["Tc", 97.9072124, 98], ["Ru", 101.9043441, 101.07],
  ["Rh", 102.905498, 102.9055], ["Pd", 105.9034804, 106.42], ["Ag", 106.9050916, 107.8682], ["Cd", 113.90336509, 112.414],
  ["In", 114.903878776, 114.818], ["Sn", 119.90220163, 118.71], ["Sb", 120.903812, 121.76], ["Te", 129.906222748, 127.6],
  ["I", 126.9044719, 126.90447], ["Xe", 131.9041550856, 131.293], ["Cs", 132.905451961, 132.90545196], ["Ba", 137.905247, 137.327],
  ["La", 138.9063563, 138.90547], ["Ce", 139.9054431, 140.116], ["Pr", 140.9076576, 140.90766], ["Nd", 141.907729, 144.242],
  ["Pm", 144.9127559, 145], ["Sm", 151.9197397, 150.36], ["Eu", 152.921238, 151.964], ["Gd", 157.9241123, 157.25],
  ["Tb", 158.9253547, 158.92535], ["Dy", 163.9291819, 162.5], ["Ho", 164.9303288, 164.93033], ["Er", 165.9302995, 167.259],
  ["Tm", 168.9342179, 168.93422], ["Yb", 173.9388664, 173.045], ["Lu", 174.9407752, 174.9668], ["Hf", 179.946557, 178.49],
  ["Ta", 180.9479958, 180.94788], ["W", 183.95093092, 183.84], ["Re", 186.9557501, 186.207], ["Os", 191.961477, 190.23],
  ["Ir", 192.9629216, 192.217], ["Pt", 194.9647917, 195.084], ["Au", 196.96656879, 196.966569], ["Hg", 201.9706434, 200.592],
  ["Tl", 204.9744278, 204.38], ["Pb", 207.9766525, 207.2], ["Bi", 208.9803991, 208.9804], ["Po", 208.9824308, 209],
  ["At", 209.9871479, 210], ["Rn", 222.0175782, 222], ["Fr", 223.019736, 223], ["Ra", 226.0254103, 226],
  ["Ac", 227.0277523, 227], ["Th", 232.0380558, 232.0377], ["Pa", 231.0358842, 231.03588], ["U", 238.0507884, 238.02891],
];

export const ELEMENTS: ReadonlyMap<string, Element> = (() => {
  const m = new Map<string, Element>();
  DATA.forEach(([symbol, isotopicMass, atomicWeight], i) => m.set(symbol, { symbol, z: i + 1, isotopicMass, atomicWeight }));
  // Hydrogen isotopes as their own symbols (mass of the isotope in both columns).
  m.set("D", { symbol: "D", z: 1, isotopicMass: 2.01410177812, atomicWeight: 2.01410177812 });
  m.set("T", { symbol: "T", z: 1, isotopicMass: 3.0160492779, atomicWeight: 3.0160492779 });
  return m;
})();

const BY_Z: readonly Element[] = DATA.map(([symbol]) => ELEMENTS.get(symbol)!);

/** Element by symbol (exact case) or null. */
export function element(symbol: string): Element | null {
  return ELEMENTS.get(symbol) ?? null;
}
export function elementByNumber(z: number): Element | null {
  return Number.isInteger(z) && z >= 1 && z <= BY_Z.length ? BY_Z[z - 1]! : null;
}

/** Normalises a symbol as typed in coordinate files: "CL" → "Cl", "c" → "C", "6" → "C", "C12" → "C". */
export function normaliseSymbol(raw: string): string | null {
  const t = raw.trim();
  if (/^\d+$/.test(t)) return elementByNumber(Number(t))?.symbol ?? null;
  const letters = /^([A-Za-z]{1,2})(?:\d*|[_-]\w*)$/.exec(t);
  if (!letters) return null;
  const s = letters[1]!;
  const sym = s[0]!.toUpperCase() + s.slice(1).toLowerCase();
  return ELEMENTS.has(sym) ? sym : null;
}
