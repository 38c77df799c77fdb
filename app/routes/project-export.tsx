import { useState } from "react";
import { z } from "zod";
import type { Route } from "./+types/project-export";
import { useProject } from "~/components/use-project";
import { listProtocols } from "~/services/protocols.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const UNITS = ["kcal/mol", "kJ/mol", "eV", "cm-1", "hartree"];

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "export");
  const protocols = await listProtocols(project.id);
  return { protocols: protocols.map((p: { id: number; name: string }) => ({ id: p.id, name: p.name })) };
}

export const meta: Route.MetaFunction = () => [{ title: "Export · Thermotally" }];

export default function ExportPage({ loaderData }: Route.ComponentProps) {
  const { project } = useProject();
  const [unit, setUnit] = useState("kcal/mol");
  const [protocol, setProtocol] = useState("");
  const query = new URLSearchParams({ unit, ...(protocol ? { protocol } : {}) }).toString();
  const base = `/api/v1/projects/${project.id}`;
  return (
    <section className="card space-y-4">
      <h2 className="font-bold">Export for Supporting Information</h2>
      <p className="text-sm text-muted">
        The workbook holds a cover sheet (project, who exported it and when, the live state, the constants edition and the conventions), the levels and
        protocols, every species and calculation with its stored values at full precision in hartree, each species' thermal corrections and free energies
        under each protocol, the reactions and pathways computed in the unit chosen here (named in every heading), the audit findings, and the Cartesian
        coordinates of every species with a geometry. Computed values are model estimates — not a substitute for calorimetric hazard testing or a
        process-safety review of a scale-up (thermal runaway); local regulations and qualified practice decide.
      </p>
      <div className="flex flex-wrap items-end gap-3">
        <label className="text-sm">
          <span className="label">Unit of computed energies</span>
          <select className="input" value={unit} onChange={(e) => setUnit(e.target.value)} data-testid="export-unit">
            {UNITS.map((u) => (
              <option key={u} value={u}>{u}</option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="label">Protocol of reactions and pathways</span>
          <select className="input" value={protocol} onChange={(e) => setProtocol(e.target.value)} data-testid="export-protocol">
            <option value="">each its own (else the project default)</option>
            {loaderData.protocols.map((p) => (
              <option key={p.id} value={String(p.id)}>{p.name}</option>
            ))}
          </select>
        </label>
        <a className="btn btn-primary" href={`${base}/export.xlsx?${query}`} download data-testid="export-xlsx">Download the workbook (XLSX)</a>
        <a className="btn" href={`${base}/export.csv?${query}`} download data-testid="export-csv">Download the ledger (CSV)</a>
      </div>
    </section>
  );
}
