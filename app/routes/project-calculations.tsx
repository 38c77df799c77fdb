import { useQuery, useQueryClient } from "@tanstack/react-query";
import type { CellValueChangedEvent, GridApi, GridReadyEvent } from "ag-grid-community";
import { useMemo, useRef, useState, type ClipboardEvent } from "react";
import { z } from "zod";
import type { Route } from "./+types/project-calculations";
import { apiFetch, ApiError, describeApiError } from "~/components/api-client";
import { FormError, Notice } from "~/components/forms";
import { calculationColumns, levelIdOfCol, type GridLevel, type GridRow } from "~/components/grids/calculation-columns";
import { parseTsvBlock, placeBlock } from "~/components/grids/format";
import { LazyGrid } from "~/components/grids/LazyGrid";
import { useProject } from "~/components/use-project";
import { calculationGrid } from "~/services/calculations.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return calculationGrid(project.id);
}

type GridData = { levels: GridLevel[]; rows: GridRow[] };
type Message = { kind: "ok" | "bad"; text: string; details?: string[] };

export default function CalculationsPage({ loaderData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const projectId = project.id;
  const queryClient = useQueryClient();
  const queryKey = ["calculation-grid", projectId];
  const { data } = useQuery({
    queryKey,
    queryFn: () => apiFetch<GridData>(`/api/v1/projects/${projectId}/calculations/grid`),
    initialData: loaderData as GridData,
  });
  const apiRef = useRef<GridApi<GridRow> | null>(null);
  const [message, setMessage] = useState<Message | null>(null);
  const [pasteOpen, setPasteOpen] = useState(false);
  const [pasteText, setPasteText] = useState("");
  const [busy, setBusy] = useState(false);

  const columns = useMemo(() => calculationColumns(data.levels, { canEdit: can.edit, projectId }), [data.levels, can.edit, projectId]);
  const reload = () => queryClient.invalidateQueries({ queryKey });

  async function send(cells: { species: number; level: number; electronicEnergy: string | null; version?: number; row?: number; column?: number }[], what: string) {
    setBusy(true);
    try {
      const { grid } = await apiFetch<{ grid: { created: number; updated: number; unchanged: number } }>(`/api/v1/projects/${projectId}/calculations/grid`, { body: { cells } });
      setMessage({ kind: "ok", text: `${what}: ${grid.created} added, ${grid.updated} changed, ${grid.unchanged} unchanged` });
      return true;
    } catch (error) {
      const details = error instanceof ApiError ? (error.body.details ?? []).map((d) => d.message) : [];
      const stale = error instanceof ApiError && error.status === 409;
      setMessage({ kind: "bad", text: `${error instanceof ApiError ? error.body.message : describeApiError(error)}${stale ? " — the grid has been reloaded." : ""}`, details });
      return false;
    } finally {
      await reload();
      setBusy(false);
    }
  }

  async function onCellValueChanged(e: CellValueChangedEvent<GridRow>) {
    const levelId = levelIdOfCol(e.column.getColId());
    if (levelId === null || e.newValue === e.oldValue) return;
    const cell = e.data.cells[String(levelId)];
    const value = e.newValue === null || e.newValue === undefined ? "" : String(e.newValue).trim();
    if (value === "") {
      setMessage({ kind: "bad", text: "An energy cannot be cleared from the grid; delete the calculation on the species page instead" });
      await reload();
      return;
    }
    await send([{ species: e.data.speciesId, level: levelId, electronicEnergy: value, version: cell?.version ?? undefined }], `${e.data.label}`);
  }

  /** A block from the focused cell rightwards and downwards, in the grid's displayed order. */
  async function pasteBlock(text: string) {
    const api = apiRef.current;
    if (!api) return false;
    const focused = api.getFocusedCell();
    const displayedLevels = api.getAllDisplayedColumns().map((c) => levelIdOfCol(c.getColId())).filter((id): id is number => id !== null);
    const speciesIds: number[] = [];
    api.forEachNodeAfterFilterAndSort((n) => n.data && speciesIds.push(n.data.speciesId));
    const focusedLevel = focused ? levelIdOfCol(focused.column.getColId()) : null;
    const anchor = { row: focused?.rowIndex ?? 0, column: focusedLevel !== null ? displayedLevels.indexOf(focusedLevel) : 0 };
    const block = parseTsvBlock(text);
    const { cells, outside } = placeBlock(block, anchor, speciesIds, displayedLevels);
    if (outside) {
      setMessage({ kind: "bad", text: `The block reaches past the grid (${outside} value(s) would fall outside); nothing was changed. Click the top-left cell of where it should go.` });
      return false;
    }
    if (!cells.some((c) => c.electronicEnergy !== null && c.electronicEnergy !== "")) {
      setMessage({ kind: "bad", text: "The pasted block has no values" });
      return false;
    }
    return send(cells, `Pasted ${block.length} × ${Math.max(...block.map((r) => r.length))} block`);
  }

  function onPaste(e: ClipboardEvent<HTMLDivElement>) {
    const api = apiRef.current;
    if (!can.edit || !api || api.getEditingCells().length) return;
    const text = e.clipboardData.getData("text/plain");
    if (!text) return;
    e.preventDefault();
    void pasteBlock(text);
  }

  return (
    <section className="card space-y-3">
      <div className="flex flex-wrap items-baseline gap-3">
        <h2 className="font-bold">Calculations</h2>
        <span className="text-sm text-muted">
          Electronic energies in hartree, species × level; shown to 6 decimals, every stored digit kept (edit a cell to see them all).
        </span>
        {can.edit ? (
          <button type="button" className="btn ml-auto" onClick={() => setPasteOpen((v) => !v)} data-testid="paste-block-open">
            Paste block…
          </button>
        ) : null}
      </div>
      {can.edit ? (
        <p className="text-xs text-muted">
          To paste from a spreadsheet, click the top-left cell where the block should go and press Ctrl+V (or use “Paste block…”). The whole block is checked first: if any cell is wrong, nothing is stored.
        </p>
      ) : null}
      {pasteOpen && can.edit ? (
        <div className="rounded-md border border-rule bg-paper p-3" data-testid="paste-dialog">
          <label htmlFor="paste-text" className="label">
            Tab-separated block (rows of species, columns of levels), placed at the focused cell
          </label>
          <textarea id="paste-text" className="input font-mono text-xs" rows={5} value={pasteText} onChange={(e) => setPasteText(e.target.value)} />
          <div className="mt-2 flex gap-2">
            <button
              type="button"
              className="btn-primary"
              disabled={busy || !pasteText.trim()}
              data-testid="paste-apply"
              onClick={async () => {
                if (await pasteBlock(pasteText)) {
                  setPasteText("");
                  setPasteOpen(false);
                }
              }}
            >
              Apply block
            </button>
            <button type="button" className="btn" onClick={() => setPasteOpen(false)}>
              Cancel
            </button>
          </div>
        </div>
      ) : null}
      <div aria-live="polite" data-testid="grid-message">
        {message?.kind === "ok" ? <Notice>{message.text}</Notice> : null}
        {message?.kind === "bad" ? (
          <div>
            <FormError error={message.text} />
            {message.details?.length ? (
              <ul className="mt-1 list-disc pl-5 text-xs text-bad">
                {message.details.map((d, i) => (
                  <li key={i}>{d}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
      </div>
      {data.levels.length === 0 ? (
        <p className="text-muted">Add a level of theory first; each level becomes a column.</p>
      ) : (
        <LazyGrid<GridRow>
          testId="calculations-grid"
          height={Math.min(680, 90 + data.rows.length * 30)}
          rowData={data.rows}
          columnDefs={columns}
          getRowId={(p) => String(p.data.speciesId)}
          onGridReady={(e: GridReadyEvent<GridRow>) => (apiRef.current = e.api)}
          onCellValueChanged={onCellValueChanged}
          onPaste={onPaste}
          stopEditingWhenCellsLoseFocus
          defaultColDef={{ sortable: true, resizable: true }}
          tooltipShowDelay={300}
        />
      )}
      <p className="text-xs text-muted">Red cells feed a current error — a missing energy a reaction needs, levels mixed, a transition state without exactly one imaginary mode, not converged, stored duplicates that disagree; hover for the reason (the audit lists them all).</p>
    </section>
  );
}
