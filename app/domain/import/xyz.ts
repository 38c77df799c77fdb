/**
 * XYZ geometries (Å): one or several frames. The comment line of a frame may carry `key=value` words:
 * `species=<label>` (or `label=`), `conformer=<label>`, `charge=<n>`, `multiplicity=<n>`; a comment that
 * is one word without `=` is the species label; otherwise the label is the file name without extension.
 * Several frames of one species become its conformers (labelled by `conformer=` or c1, c2, ... in file
 * order); the first frame is also the species' geometry. XYZ rows carry no level and no energy.
 */
import { parseXyz, ThermoInputError, type Geometry } from "../thermo";
import { countsOfSymbols, xyzText } from "./geometry-text";
import { hillFormula } from "../thermo";
import type { ImportProblem, ImportRow, ParsedImport } from "./types";

function frameStartLines(text: string): number[] {
  const lines = text.replace(/\r\n?/g, "\n").split("\n");
  const starts: number[] = [];
  let i = 0;
  while (i < lines.length) {
    if (lines[i]!.trim() === "") {
      i++;
      continue;
    }
    const n = /^\s*(\d+)\s*$/.exec(lines[i]!);
    if (!n) {
      starts.push(i + 1);
      break;
    }
    starts.push(i + 1);
    i += 2 + Number(n[1]);
  }
  return starts;
}

function commentFields(comment: string): { species?: string; conformer?: string; charge?: string; multiplicity?: string; bare?: string } {
  const out: Record<string, string> = {};
  const words = comment.trim().split(/\s+/).filter(Boolean);
  for (const w of words) {
    const m = /^(species|label|conformer|charge|multiplicity|mult)=(.+)$/i.exec(w);
    if (m) {
      const key = m[1]!.toLowerCase();
      out[key === "label" ? "species" : key === "mult" ? "multiplicity" : key] = m[2]!;
    }
  }
  if (!Object.keys(out).length && words.length === 1) out.bare = words[0]!;
  return out;
}

export function parseXyzFile(text: string, fileName = "geometry.xyz"): ParsedImport {
  const problems: ImportProblem[] = [];
  const rows: ImportRow[] = [];
  const clean = text.replace(/^\uFEFF/, "").replace(/\u2212/g, "-");
  let frames: Geometry[];
  try {
    frames = parseXyz(clean);
  } catch (e) {
    if (!(e instanceof ThermoInputError)) throw e;
    const line = /Line (\d+)/.exec(e.message);
    return { format: "xyz", rows, problems: [{ row: line ? Number(line[1]) : 1, column: "atoms", message: e.message }], columns: {} };
  }
  const starts = frameStartLines(clean);
  const stem = fileName.replace(/^.*[\\/]/, "").replace(/\.[^.]*$/, "") || "geometry";
  const perSpecies = new Map<string, number>();
  const labels = frames.map((f) => {
    const c = commentFields(f.comment ?? "");
    return c.species ?? c.bare ?? stem;
  });
  for (const l of labels) perSpecies.set(l, (perSpecies.get(l) ?? 0) + 1);
  const seen = new Map<string, number>();
  frames.forEach((f, i) => {
    const row = starts[i] ?? 1;
    const c = commentFields(f.comment ?? "");
    const label = labels[i]!;
    const k = (seen.get(label) ?? 0) + 1;
    seen.set(label, k);
    const int = (key: "charge" | "multiplicity", text: string | undefined): number | null => {
      if (text === undefined) return null;
      if (!/^[+-]?\d+$/.test(text)) {
        problems.push({ row: row + 1, column: "comment", message: `${key}=${text} is not a whole number` });
        return null;
      }
      return Number(text);
    };
    const charge = int("charge", c.charge);
    const multiplicity = int("multiplicity", c.multiplicity);
    const geometryXyz = xyzText(f, label);
    const several = (perSpecies.get(label) ?? 0) > 1 || c.conformer !== undefined;
    rows.push({
      row,
      species: {
        label,
        formula: hillFormula(countsOfSymbols(f.symbols)),
        smiles: null,
        charge,
        multiplicity,
        kind: null,
        geometryXyz,
      },
      conformer: several ? { label: c.conformer ?? `c${k}`, geometryXyz } : null,
      level: null,
      calculation: null,
    });
  });
  return { format: "xyz", rows: problems.length ? [] : rows, problems, columns: { species: "comment", geometry: "atoms", conformer: "comment" } };
}
