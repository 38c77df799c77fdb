import type { ColDef, ValueFormatterParams } from "ag-grid-community";
import { formatEnergyValue } from "../number-format";
import { StatusCell } from "../reaction-status";

export { formatEnergyValue };

/** A row of GET /api/v1/projects/:id/reactions (values already in the answer's unit). */
export type ReactionStatus = "ok" | "incomplete" | "inconsistent" | "unbalanced" | "invalid";
export type LedgerValues = {
  deltaE: number | null; deltaEZPE: number | null; deltaH: number | null; deltaG: number | null;
  barrierE: number | null; barrierG: number | null; rateConstant: number | null; equilibriumConstant: number | null;
};
export type LedgerProblem = { code: string; message: string; severity?: "error" | "warning"; species?: string; level?: string };
export type LedgerRow = {
  id: number; equation: string; transitionState: string | null; protocolId: number | null; version: number;
  status: ReactionStatus; problems: LedgerProblem[]; values: LedgerValues; reasons: Partial<Record<keyof LedgerValues, string>>;
  rateConstantUnit: string; temperatureK: number | null;
};

/** Decimals shown per unit (PRODUCT.md §9: two in kcal/mol and kJ/mol); stored and exported values keep every digit. */
/** A rate or equilibrium constant in scientific notation, e.g. "3.21 × 10⁴"; "—" when not computed. */
export function formatScientific(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || Number.isNaN(value)) return "—";
  if (value === Infinity) return "> 10³⁰⁸";
  if (value === 0) return "< 10⁻³⁰⁸";
  const [mant, exp] = value.toExponential(digits - 1).split("e");
  const e = Number(exp);
  if (e === 0) return mant!.replace(/^-/, "−");
  const sup = String(e).replace(/[-0-9]/g, (c) => "⁻⁰¹²³⁴⁵⁶⁷⁸⁹"["-0123456789".indexOf(c)]!);
  return `${mant!.replace(/^-/, "−")} × 10${sup}`;
}

export const STATUS_TEXT: Record<ReactionStatus, string> = {
  ok: "ok",
  incomplete: "incomplete",
  inconsistent: "inconsistent",
  unbalanced: "unbalanced",
  invalid: "invalid",
};

/** Sorting and filtering of the status column: worst first. */
export const STATUS_RANK: Record<ReactionStatus, number> = { invalid: 0, unbalanced: 1, inconsistent: 2, incomplete: 3, ok: 4 };

export const SAFETY_NOTE =
  "Computed values are model estimates — not a substitute for calorimetric hazard testing or a process-safety review of a scale-up (thermal runaway); local regulations and qualified practice decide.";

const energyCol = (field: keyof LedgerValues, headerName: string, unit: string, tooltip?: string): ColDef<LedgerRow> => ({
  colId: field,
  headerName,
  headerTooltip: tooltip,
  valueGetter: (p) => p.data?.values[field] ?? null,
  valueFormatter: (p: ValueFormatterParams<LedgerRow, number | null>) => formatEnergyValue(p.value, unit),
  tooltipValueGetter: (p) => (p.data && p.data.values[field] === null ? (p.data.reasons[field] ?? null) : null),
  type: "rightAligned",
  filter: "agNumberColumnFilter",
  cellClass: "num ag-right-aligned-cell",
  width: 112,
});

export function reactionColumns(opts: { unit: string; temperatureK: number | null }): ColDef<LedgerRow>[] {
  const u = opts.unit === "cm-1" ? "cm⁻¹" : opts.unit;
  const t = opts.temperatureK ? `${opts.temperatureK} K` : "the protocol temperature";
  return [
    { field: "equation", headerName: "Equation", flex: 2, minWidth: 220, filter: "agTextColumnFilter", tooltipField: "equation" },
    { field: "transitionState", headerName: "TS", width: 100, filter: "agTextColumnFilter", valueFormatter: (p) => p.value ?? "—" },
    {
      field: "status",
      headerName: "Status",
      width: 140,
      cellRenderer: StatusCell,
      filter: "agTextColumnFilter",
      comparator: (a: ReactionStatus, b: ReactionStatus) => STATUS_RANK[a] - STATUS_RANK[b],
      tooltipValueGetter: (p) => p.data?.problems.map((x) => x.message).join("\n") || null,
    },
    energyCol("deltaE", `ΔE (${u})`, opts.unit),
    energyCol("deltaEZPE", `Δ(E+ZPE) (${u})`, opts.unit),
    energyCol("deltaH", `ΔH (${u}) ⚠`, opts.unit, `Reaction enthalpy. ${SAFETY_NOTE}`),
    energyCol("deltaG", `ΔG (${u})`, opts.unit),
    energyCol("barrierE", `ΔE‡ (${u})`, opts.unit),
    energyCol("barrierG", `ΔG‡ (${u})`, opts.unit),
    {
      colId: "rateConstant",
      headerName: `k at ${t} ⚠`,
      headerTooltip: `Eyring rate constant from ΔG‡ (κ = 1), s⁻¹ for a unimolecular step. It rests entirely on the computed barrier: 1.4 kcal/mol changes it tenfold at 298 K. ${SAFETY_NOTE}`,
      valueGetter: (p) => p.data?.values.rateConstant ?? null,
      valueFormatter: (p) => formatScientific(p.value),
      tooltipValueGetter: (p) => (p.data ? (p.data.values.rateConstant === null ? (p.data.reasons.rateConstant ?? null) : `unit: ${p.data.rateConstantUnit}`) : null),
      type: "rightAligned",
      filter: "agNumberColumnFilter",
      cellClass: "num ag-right-aligned-cell",
      width: 130,
    },
    {
      colId: "equilibriumConstant",
      headerName: `K at ${t}`,
      headerTooltip: "K = exp(−ΔG/RT) under the protocol's standard state",
      valueGetter: (p) => p.data?.values.equilibriumConstant ?? null,
      valueFormatter: (p) => formatScientific(p.value),
      tooltipValueGetter: (p) => (p.data && p.data.values.equilibriumConstant === null ? (p.data.reasons.equilibriumConstant ?? null) : null),
      type: "rightAligned",
      filter: "agNumberColumnFilter",
      cellClass: "num ag-right-aligned-cell",
      width: 120,
    },
  ];
}
