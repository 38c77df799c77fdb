import type { ColDef, ICellRendererParams, ValueParserParams } from "ag-grid-community";
import { createElement } from "react";
import { formatCharge, formatImaginary, formatKind, formatMultiplicity, parseIntCell, parseKind } from "./format";

/** A species row as GET /api/v1/projects/:id/species returns it (the fields the grid uses). */
export type SpeciesRow = {
  id: number;
  label: string;
  formula: string | null;
  smiles: string | null;
  charge: number;
  multiplicity: number;
  kind: "minimum" | "transition-state";
  symmetryNumber: number;
  hasGeometry: boolean;
  conformerCount: number;
  imaginaryModes: number | null;
  version: number;
};

/** The fields a cell edit may change, and how the edited value travels to the API. */
export const EDITABLE_SPECIES_FIELDS = ["label", "formula", "smiles", "charge", "multiplicity", "kind", "symmetryNumber"] as const;
export type EditableSpeciesField = (typeof EDITABLE_SPECIES_FIELDS)[number];

const intParser = (p: ValueParserParams<SpeciesRow>) => parseIntCell(p.newValue) ?? p.oldValue;

/** Imaginary modes that disagree with the kind: a transition state needs exactly one, a minimum none. */
export function imaginaryModeProblem(row: Pick<SpeciesRow, "kind" | "imaginaryModes">): string | null {
  if (row.imaginaryModes === null) return null;
  if (row.kind === "transition-state" && row.imaginaryModes !== 1) return `a transition state needs exactly one imaginary mode (has ${row.imaginaryModes})`;
  if (row.kind === "minimum" && row.imaginaryModes > 0) return `a minimum should have no imaginary mode (has ${row.imaginaryModes})`;
  return null;
}

export function speciesColumns(opts: { canEdit: boolean; projectId: number; onDelete?: (row: SpeciesRow) => void }): ColDef<SpeciesRow>[] {
  const editable = opts.canEdit;
  const cols: ColDef<SpeciesRow>[] = [
    {
      field: "label",
      headerName: "Label",
      editable,
      pinned: "left",
      width: 140,
      cellRenderer: editable ? undefined : (p: ICellRendererParams<SpeciesRow>) => speciesLink(opts.projectId, p.data?.id, p.data?.label ?? ""),
    },
    {
      field: "formula",
      headerName: "Formula",
      width: 140,
      // With a SMILES the formula is derived from it: edit the SMILES instead.
      editable: (p) => editable && !p.data?.smiles,
      tooltipValueGetter: (p) => (p.data?.smiles ? "Derived from the SMILES" : undefined),
      cellClass: (p) => (p.data?.smiles ? "text-muted" : ""),
    },
    { field: "smiles", headerName: "SMILES", editable, width: 170, valueFormatter: (p) => p.value ?? "" },
    { field: "charge", headerName: "Charge", editable, width: 85, type: "rightAligned", valueFormatter: (p) => formatCharge(p.value), valueParser: intParser },
    { field: "multiplicity", headerName: "Multiplicity", editable, width: 110, valueFormatter: (p) => formatMultiplicity(p.value), valueParser: intParser },
    {
      field: "kind",
      headerName: "Kind",
      editable,
      width: 125,
      cellEditor: "agSelectCellEditor",
      cellEditorParams: { values: ["minimum", "transition-state"] },
      valueFormatter: (p) => formatKind(p.value),
      valueParser: (p) => parseKind(p.newValue) ?? p.oldValue,
    },
    { field: "symmetryNumber", headerName: "Symmetry no.", editable, width: 110, type: "rightAligned", valueParser: intParser },
    { field: "conformerCount", headerName: "Conformers", width: 105, type: "rightAligned" },
    { field: "hasGeometry", headerName: "Geometry", width: 95, valueFormatter: (p) => (p.value ? "yes" : "—") },
    {
      field: "imaginaryModes",
      headerName: "Imaginary modes",
      width: 130,
      type: "rightAligned",
      valueFormatter: (p) => formatImaginary(p.value),
      // An explicit cellClass replaces the column type's, so the right alignment is named here too.
      cellClass: (p) => `num ag-right-aligned-cell ${p.data && imaginaryModeProblem(p.data) ? "text-bad font-medium" : ""}`,
      tooltipValueGetter: (p) => (p.data ? (imaginaryModeProblem(p.data) ?? undefined) : undefined),
    },
    {
      colId: "open",
      headerName: "",
      width: 70,
      // Pinned so that the way to a species' page (and its delete) stays in view on a narrow screen.
      pinned: "right",
      sortable: false,
      filter: false,
      cellRenderer: (p: ICellRendererParams<SpeciesRow>) => speciesLink(opts.projectId, p.data?.id, "details"),
    },
  ];
  if (editable && opts.onDelete) {
    const onDelete = opts.onDelete;
    cols.push({
      colId: "delete",
      headerName: "",
      width: 70,
      pinned: "right",
      sortable: false,
      filter: false,
      cellRenderer: (p: ICellRendererParams<SpeciesRow>) =>
        createElement("button", { type: "button", className: "text-xs text-bad hover:underline", onClick: () => p.data && onDelete(p.data) }, "Delete"),
    });
  }
  return cols;
}

/** A link to the species page (AG Grid's React cell renderers are components, so this returns an element). */
export function speciesLink(projectId: number, speciesId: number | undefined, text: string, suffix?: string) {
  if (!speciesId) return null;
  return createElement("span", null, createElement("a", { className: "link", href: `/projects/${projectId}/species/${speciesId}` }, text), suffix ? createElement("span", { className: "ml-1 text-xs text-muted" }, suffix) : null);
}
