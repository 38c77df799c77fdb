import { useState } from "react";
import { Link, useRevalidator } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-import";
import { useProject } from "~/components/use-project";
import { listCalculations } from "~/services/calculations.server";
import { listFiles } from "~/services/files.server";
import type { ImportReport } from "~/services/imports.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";
import { formatBytes, uploadLimitBytes } from "~/utils/upload.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const [calculations, files] = await Promise.all([listCalculations(project.id), listFiles(project.id)]);
  return {
    calculations: calculations.map((c) => ({ id: c.id, label: `#${c.id} ${c.species.label ?? "?"}${c.conformer ? ` (${c.conformer.label})` : ""} · ${c.level.name ?? c.level.key ?? ""}` })),
    files,
    limit: formatBytes(uploadLimitBytes()),
  };
}

export const meta: Route.MetaFunction = () => [{ title: "Import · Thermotally" }];

type Problem = { row: number; column: string; message: string };
type Step = { kind: "idle" } | { kind: "busy"; what: string } | { kind: "preview"; report: ImportReport } | { kind: "refused"; problems: Problem[]; message: string; report?: ImportReport } | { kind: "done"; report: ImportReport } | { kind: "error"; message: string };

const ACTION_STYLE: Record<string, string> = { create: "text-ok", update: "text-steel", unchanged: "text-muted", conflict: "text-bad font-bold" };

async function send(url: string, file: File): Promise<{ ok: boolean; status: number; body: any }> {
  const form = new FormData();
  form.append("file", file);
  const res = await fetch(url, { method: "POST", body: form, credentials: "same-origin" });
  let body: unknown = null;
  try {
    body = await res.json();
  } catch {
    /* not JSON */
  }
  return { ok: res.ok, status: res.status, body };
}

/** Objects the commit would write: new or updated species, levels, conformers and calculations. */
function changeCount(report: ImportReport): number {
  const s = report.summary;
  return s.species.created + s.species.updated + s.levels.created + s.conformers.created + s.conformers.updated + s.calculations.created + s.calculations.updated;
}

function Summary({ report }: { report: ImportReport }) {
  const s = report.summary;
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4" data-testid="import-summary">
      <div><dt className="text-muted">Species</dt><dd><span data-testid="summary-species-created">{s.species.created}</span> new · {s.species.updated} updated · {s.species.unchanged} unchanged</dd></div>
      <div><dt className="text-muted">Levels</dt><dd>{s.levels.created} new · {s.levels.reused} reused</dd></div>
      <div><dt className="text-muted">Conformers</dt><dd>{s.conformers.created} new · {s.conformers.updated} updated · {s.conformers.unchanged} unchanged</dd></div>
      <div><dt className="text-muted">Calculations</dt><dd><span data-testid="summary-calculations-created">{s.calculations.created}</span> new · {s.calculations.updated} updated · {s.calculations.unchanged} unchanged</dd></div>
    </dl>
  );
}

function Items({ report }: { report: ImportReport }) {
  return (
    <div className="max-h-[28rem] overflow-auto">
      <table className="table" data-testid="import-preview">
        <thead>
          <tr><th>Row</th><th>Change</th><th>Species</th><th>Conformer</th><th>Level</th><th className="num">Electronic energy (hartree)</th><th>Note</th></tr>
        </thead>
        <tbody>
          {report.items.map((it) => (
            <tr key={`${it.row}-${it.species}-${it.conformer ?? ""}`}>
              <td className="num">{it.row}</td>
              <td className={ACTION_STYLE[it.action]}>{it.action}</td>
              <td>{it.species}</td>
              <td>{it.conformer ?? ""}</td>
              <td>{it.level ?? "—"}</td>
              <td className="num">{it.electronicEnergy ?? ""}</td>
              <td className="text-muted">{it.note}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {report.itemsTruncated ? <p className="mt-1 text-xs text-muted">Only the first {report.items.length} rows are listed; the summary counts all of them.</p> : null}
    </div>
  );
}

function Problems({ problems }: { problems: Problem[] }) {
  return (
    <table className="table" data-testid="import-problems">
      <thead><tr><th>Row</th><th>Column</th><th>Problem</th></tr></thead>
      <tbody>
        {problems.map((p, i) => (
          <tr key={i}><td className="num">{p.row}</td><td>{p.column}</td><td className="text-bad">{p.message}</td></tr>
        ))}
      </tbody>
    </table>
  );
}

export default function ImportPage({ loaderData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const base = `/api/v1/projects/${project.id}`;
  const [file, setFile] = useState<File | null>(null);
  const [step, setStep] = useState<Step>({ kind: "idle" });
  const [attach, setAttach] = useState<{ calc: string; file: File | null; message: string }>({ calc: "", file: null, message: "" });
  const revalidator = useRevalidator();

  const run = async (dryRun: boolean) => {
    if (!file) return;
    setStep({ kind: "busy", what: dryRun ? "Checking the file…" : "Storing…" });
    const res = await send(`${base}/imports${dryRun ? "?dryRun=1" : ""}`, file);
    if (res.ok) return setStep(dryRun ? { kind: "preview", report: res.body.import } : { kind: "done", report: res.body.import });
    const err = res.body?.error;
    if (err?.code === "import_refused") {
      const report = err.report as ImportReport | undefined;
      return setStep({ kind: "refused", message: err.message, problems: report?.problems ?? [], report });
    }
    setStep({ kind: "error", message: err?.message ?? `The server answered ${res.status}` });
  };

  const upload = async () => {
    if (!attach.file || !attach.calc) return;
    setAttach((a) => ({ ...a, message: "Uploading…" }));
    const res = await send(`${base}/calculations/${attach.calc}/files`, attach.file);
    setAttach((a) => ({ ...a, file: null, message: res.ok ? `Attached ${res.body.file.name} (${res.body.file.sizeBytes} bytes, SHA-256 ${res.body.file.sha256.slice(0, 12)}…)` : (res.body?.error?.message ?? `Refused (${res.status})`) }));
    if (res.ok) revalidator.revalidate();
  };

  if (!can.edit) return <p className="card text-muted">Your role may read this project but not import into it.</p>;

  return (
    <div className="space-y-5">
      <section className="card space-y-3">
        <div className="flex flex-wrap items-baseline gap-3">
          <h2 className="mr-auto font-bold">Import calculations</h2>
          <a className="btn" href={`${base}/imports/template.csv`} download data-testid="template-csv">Download the template (CSV)</a>
          <a className="btn" href={`${base}/imports/template.xlsx`} download data-testid="template-xlsx">Download the template (XLSX)</a>
        </div>
        <p className="text-sm text-muted">
          The template has one row per calculation, with the unit of each quantity in its heading (energies in hartree unless the heading says kcal/mol or
          kJ/mol). QCSchema results (.json, one result, a list or JSON lines) and XYZ geometries (.xyz; several frames become conformers) are read too. A file
          with any bad row is refused as a whole, with every problem by row and column; the preview shows what would change before anything is stored.
        </p>
        <div className="flex flex-wrap items-end gap-3">
          <label className="text-sm">
            <span className="label">File (CSV, XLSX, QCSchema JSON, XYZ; at most {loaderData.limit})</span>
            <input
              className="input"
              type="file"
              name="file"
              accept=".csv,.xlsx,.json,.jsonl,.xyz,.txt"
              data-testid="import-file"
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setStep({ kind: "idle" });
              }}
            />
          </label>
          <button type="button" className="btn" disabled={!file || step.kind === "busy"} onClick={() => void run(true)} data-testid="import-preview-button">
            Preview
          </button>
        </div>
        {step.kind === "busy" ? <p className="text-sm text-muted">{step.what}</p> : null}
        {step.kind === "error" ? <p className="field-error" role="alert">{step.message}</p> : null}
        {step.kind === "refused" ? (
          <div className="space-y-2" role="alert">
            <p className="font-medium text-bad" data-testid="import-refused">{step.message}. Fix these and upload the file again:</p>
            <Problems problems={step.problems} />
            {step.report && step.report.items.length ? (
              <>
                <p className="text-sm">What the rows without problems would change, and the conflicts with stored values:</p>
                <Summary report={step.report} />
                <Items report={step.report} />
              </>
            ) : null}
          </div>
        ) : null}
        {step.kind === "preview" ? (
          <div className="space-y-3">
            <p className="text-sm">Preview of <b>{step.report.file.name}</b> ({step.report.file.format}, {step.report.file.rows} rows). Nothing is stored yet.</p>
            <Summary report={step.report} />
            {step.report.species.some((x) => x.action === "create") ? (
              <p className="text-sm" data-testid="import-new-species">
                New species (labels not yet in the project):{" "}
                {step.report.species.filter((x) => x.action === "create").map((x) => `${x.label}${x.formula ? ` (${x.formula})` : ""}`).join(", ")}
              </p>
            ) : null}
            {step.report.levels.some((l) => l.aliasOf) ? (
              <p className="text-sm text-muted">
                {step.report.levels.filter((l) => l.aliasOf).map((l) => `${l.name} is the same level as ${l.aliasOf}`).join("; ")}.
              </p>
            ) : null}
            <Items report={step.report} />
            <button type="button" className="btn btn-primary" disabled={!changeCount(step.report)} onClick={() => void run(false)} data-testid="import-commit-button">
              {changeCount(step.report) ? `Store these ${changeCount(step.report)} changes` : "Nothing to store: every row matches the ledger"}
            </button>
          </div>
        ) : null}
        {step.kind === "done" ? (
          <div className="space-y-2" data-testid="import-done">
            <p className="text-ok">Stored {step.report.file.name}.</p>
            <Summary report={step.report} />
            <p className="text-sm"><Link className="link" to={`/projects/${project.id}/calculations`}>See the calculations</Link></p>
          </div>
        ) : null}
      </section>

      <section className="card space-y-3">
        <h2 className="font-bold">Provenance files</h2>
        <p className="text-sm text-muted">
          Attach any file to a calculation untouched (an output, an input, a log): it is kept with its size and SHA-256 and can be downloaded again; it is
          never read into the ledger.
        </p>
        <div className="flex flex-wrap items-end gap-3">
          <label className="text-sm">
            <span className="label">Calculation</span>
            <select className="input" value={attach.calc} onChange={(e) => setAttach((a) => ({ ...a, calc: e.target.value }))} data-testid="attach-calculation">
              <option value="">choose…</option>
              {loaderData.calculations.map((c) => (
                <option key={c.id} value={c.id}>{c.label}</option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">File (at most {loaderData.limit})</span>
            <input className="input" type="file" onChange={(e) => setAttach((a) => ({ ...a, file: e.target.files?.[0] ?? null }))} data-testid="attach-file" />
          </label>
          <button type="button" className="btn" disabled={!attach.file || !attach.calc} onClick={() => void upload()}>Attach</button>
        </div>
        {attach.message ? <p className="text-sm">{attach.message}</p> : null}
        {loaderData.files.length ? (
          <table className="table">
            <thead><tr><th>File</th><th>Calculation</th><th className="num">Size (bytes)</th><th>SHA-256</th><th>Uploaded (UTC)</th></tr></thead>
            <tbody>
              {loaderData.files.map((f) => (
                <tr key={f.id}>
                  <td><a className="link" href={f.downloadUrl}>{f.name}</a></td>
                  <td>{f.calculationId ? `#${f.calculationId}` : ""}</td>
                  <td className="num">{f.sizeBytes}</td>
                  <td className="font-mono text-xs">{f.sha256}</td>
                  <td className="num text-muted">{f.createdAt.replace("T", " ").slice(0, 19)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : (
          <p className="text-sm text-muted">No provenance files yet.</p>
        )}
      </section>
    </div>
  );
}
