import { useQuery, useQueryClient } from "@tanstack/react-query";
import type { CellValueChangedEvent } from "ag-grid-community";
import { useEffect, useMemo, useState } from "react";
import { data, useFetcher } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-species";
import { apiFetch, describeApiError, ApiError } from "~/components/api-client";
import { Field, FormError, Notice, SelectField } from "~/components/forms";
import { LazyGrid } from "~/components/grids/LazyGrid";
import { EDITABLE_SPECIES_FIELDS, speciesColumns, type EditableSpeciesField, type SpeciesRow } from "~/components/grids/species-columns";
import { useProject } from "~/components/use-project";
import { createSpecies, listSpecies } from "~/services/species.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { formFailure } from "~/utils/form-errors.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return { species: await listSpecies(project.id) };
}

/** The add-a-species form (cell edits and deletes go through the JSON API). */
export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const form = Object.fromEntries(await request.formData());
  try {
    const s = await createSpecies(project, principalOf(user), form as never);
    return { errors: {} as Record<string, string>, created: s.label };
  } catch (error) {
    const { status, errors } = formFailure(error);
    return data({ errors, created: null }, { status });
  }
}

const kindOptions = [
  { value: "minimum", label: "minimum" },
  { value: "transition-state", label: "transition state" },
];

export default function SpeciesPage({ loaderData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const projectId = project.id;
  const queryClient = useQueryClient();
  const queryKey = ["species", projectId];
  const { data: rows } = useQuery({
    queryKey,
    queryFn: async () => (await apiFetch<{ species: SpeciesRow[] }>(`/api/v1/projects/${projectId}/species`)).species,
    initialData: loaderData.species as SpeciesRow[],
  });
  const [message, setMessage] = useState<{ kind: "ok" | "bad"; text: string } | null>(null);
  const fetcher = useFetcher<typeof action>();
  const errors: Record<string, string> = fetcher.data?.errors ?? {};

  useEffect(() => {
    if (fetcher.state === "idle" && fetcher.data?.created) {
      setMessage({ kind: "ok", text: `Added ${fetcher.data.created}` });
      void queryClient.invalidateQueries({ queryKey });
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [fetcher.state, fetcher.data]);

  const reload = () => queryClient.invalidateQueries({ queryKey });

  const columns = useMemo(
    () =>
      speciesColumns({
        canEdit: can.edit,
        projectId,
        onDelete: async (row) => {
          if (!window.confirm(`Delete species ${row.label} with its conformers and calculations?`)) return;
          try {
            await apiFetch(`/api/v1/projects/${projectId}/species/${row.id}`, { method: "DELETE", body: { version: row.version } });
            setMessage({ kind: "ok", text: `Deleted ${row.label}` });
          } catch (error) {
            setMessage({ kind: "bad", text: describeApiError(error) });
          }
          await reload();
        },
      }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [can.edit, projectId],
  );

  async function onCellValueChanged(e: CellValueChangedEvent<SpeciesRow>) {
    const field = e.colDef.field as EditableSpeciesField | undefined;
    if (!field || !EDITABLE_SPECIES_FIELDS.includes(field) || e.newValue === e.oldValue) return;
    const value = typeof e.newValue === "string" ? e.newValue.trim() : e.newValue;
    try {
      const { species } = await apiFetch<{ species: SpeciesRow }>(`/api/v1/projects/${projectId}/species/${e.data.id}`, {
        method: "PATCH",
        body: { [field]: value === "" && (field === "smiles" || field === "formula") ? null : value, version: e.data.version },
      });
      e.node.setData(species);
      queryClient.setQueryData<SpeciesRow[]>(queryKey, (old) => old?.map((r) => (r.id === species.id ? species : r)));
      setMessage({ kind: "ok", text: `Saved ${species.label}: ${field}` });
    } catch (error) {
      const stale = error instanceof ApiError && error.status === 409 && error.body.code === "stale_version";
      setMessage({ kind: "bad", text: `${describeApiError(error)}${stale ? " — the grid has been reloaded with the current values." : ""}` });
      await reload();
    }
  }

  return (
    <div className="space-y-4">
      <section className="card">
        <div className="mb-3 flex items-baseline gap-3">
          <h2 className="font-bold">Species</h2>
          <span className="text-sm text-muted">{rows.length} in this project</span>
          {can.edit ? <span className="ml-auto text-xs text-muted">Double-click a cell to edit; Enter saves.</span> : null}
        </div>
        <div className="mb-2 min-h-6" aria-live="polite" data-testid="species-message">
          {message ? message.kind === "ok" ? <Notice>{message.text}</Notice> : <FormError error={message.text} /> : null}
        </div>
        <LazyGrid<SpeciesRow>
          testId="species-grid"
          height={Math.min(640, 80 + rows.length * 30)}
          rowData={rows}
          columnDefs={columns}
          getRowId={(p) => String(p.data.id)}
          onCellValueChanged={onCellValueChanged}
          stopEditingWhenCellsLoseFocus
          defaultColDef={{ sortable: true, filter: true, resizable: true }}
          tooltipShowDelay={300}
        />
      </section>
      {can.edit ? (
        <fetcher.Form method="post" className="card grid gap-3 md:grid-cols-4" noValidate data-testid="add-species">
          <h2 className="font-bold md:col-span-4">Add a species</h2>
          <FormError error={errors.form} />
          <Field label="Label" name="label" required error={errors.label} hint="Used in equations, e.g. TS1 or 2a" />
          <Field label="Formula" name="formula" error={errors.formula} hint="e.g. C9H10O, or leave empty and give a SMILES" />
          <Field label="SMILES" name="smiles" error={errors.smiles} hint="The formula is derived from it" />
          <SelectField label="Kind" name="kind" options={kindOptions} defaultValue="minimum" error={errors.kind} />
          <Field label="Charge" name="charge" inputMode="numeric" defaultValue="0" error={errors.charge} />
          <Field label="Multiplicity" name="multiplicity" inputMode="numeric" defaultValue="1" error={errors.multiplicity} />
          <Field label="Symmetry number" name="symmetryNumber" inputMode="numeric" defaultValue="1" error={errors.symmetryNumber} />
          <Field label="Concentration (mol/L)" name="concentrationMolL" inputMode="decimal" error={errors.concentrationMolL} hint="Only for a species not at 1 M, e.g. water as solvent" />
          <div className="md:col-span-4">
            <label htmlFor="field-geometry" className="label">
              Geometry (XYZ, Å; optional)
            </label>
            <textarea id="field-geometry" name="geometry" rows={4} className="input font-mono text-xs" aria-invalid={errors.geometry ? true : undefined} />
            {errors.geometry ? <p className="field-error" role="alert">{errors.geometry}</p> : null}
          </div>
          <div className="md:col-span-4">
            <button type="submit" className="btn-primary" disabled={fetcher.state !== "idle"}>
              Add species
            </button>
          </div>
        </fetcher.Form>
      ) : null}
    </div>
  );
}
