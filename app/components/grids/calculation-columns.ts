import type { CellClassParams, ColDef, ICellRendererParams, ITooltipParams } from "ag-grid-community";
import { speciesLink } from "./species-columns";
import { formatHartree } from "./format";

export type GridCellData = {
  calculationId: number | null;
  energy: string | null;
  version: number | null;
  count: number;
  hasFrequencies: boolean;
  flags: { code: string; severity: "error" | "warning"; message: string }[];
};
export type GridRow = { speciesId: number; label: string; kind: string; formula: string | null; cells: Record<string, GridCellData> };
export type GridLevel = { id: number; key: string; name: string };

/** The column id of a level's column ("level-12"), and back. */
export const levelColId = (levelId: number) => `level-${levelId}`;
export const levelIdOfCol = (colId: string) => (colId.startsWith("level-") ? Number(colId.slice(6)) : null);

export function cellFlagClass(cell: GridCellData | undefined): string {
  if (!cell?.flags.length) return "";
  return cell.flags.some((f) => f.severity === "error") ? "bg-red-50 text-bad font-medium" : "bg-amber-50 text-warn";
}

/** Species as rows, one column per level; the cell's value is the full stored text, shown rounded. */
export function calculationColumns(levels: GridLevel[], opts: { canEdit: boolean; projectId: number; decimals?: number }): ColDef<GridRow>[] {
  const decimals = opts.decimals ?? 6;
  return [
    {
      colId: "species",
      field: "label",
      headerName: "Species",
      pinned: "left",
      width: 160,
      cellRenderer: (p: ICellRendererParams<GridRow>) => speciesLink(opts.projectId, p.data?.speciesId, p.data?.label ?? "", p.data?.kind === "transition-state" ? "TS" : undefined),
    },
    ...levels.map<ColDef<GridRow>>((l) => ({
      colId: levelColId(l.id),
      headerName: l.name,
      headerTooltip: `${l.name} — electronic energy in hartree (shown to ${decimals} decimals; every stored digit is kept)`,
      width: 220,
      type: "rightAligned",
      editable: opts.canEdit,
      valueGetter: (p) => p.data?.cells[String(l.id)]?.energy ?? "",
      valueSetter: (p) => {
        const cell = p.data.cells[String(l.id)];
        if (!cell) return false;
        cell.energy = p.newValue === "" || p.newValue === null || p.newValue === undefined ? null : String(p.newValue).trim();
        return true;
      },
      // An empty cell that an error needs says so (the tooltip tells which reaction and why).
      valueFormatter: (p) => (p.value ? formatHartree(p.value, decimals) : p.data?.cells[String(l.id)]?.flags.some((f) => f.severity === "error") ? "missing" : ""),
      // An explicit cellClass replaces the column type's, so the right alignment is named here too.
      cellClass: (p: CellClassParams<GridRow>) => `num ag-right-aligned-cell ${cellFlagClass(p.data?.cells[String(l.id)])}`,
      tooltipValueGetter: (p: ITooltipParams<GridRow>) => {
        const cell = p.data?.cells[String(l.id)];
        if (!cell) return undefined;
        const lines = [...cell.flags.map((f) => f.message)];
        if (cell.energy) lines.unshift(`${cell.energy} hartree`);
        if (cell.count > 1) lines.push(`${cell.count} calculations stored for this cell`);
        return lines.join("\n") || undefined;
      },
    })),
  ];
}
