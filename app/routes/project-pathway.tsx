import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Link, useNavigate } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-pathway";
import { apiFetch, describeApiError } from "~/components/api-client";
import { formatEnergyValue, formatScientific, SAFETY_NOTE } from "~/components/grids/reaction-columns";
import { profileStatesOf, renderProfileSvg } from "~/components/profile-svg";
import { useProject } from "~/components/use-project";
import { pathwayPage } from "~/services/pathways.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, pathwayId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(40).optional(), protocol: z.string().max(200).optional() });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId, pathwayId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return pathwayPage(project.id, pathwayId, parseSearchParams(request.url, querySchema));
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.answer.pathway.name ?? "Pathway"} · Thermotally` }];

type Answer = Awaited<ReturnType<typeof loader>>["answer"];
const UNITS = ["kcal/mol", "kJ/mol", "eV"] as const;

/** Draws the SVG on a canvas (twice the size, for print) and downloads it as PNG. */
async function downloadPng(svg: string, filename: string) {
  const img = new Image();
  const url = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml" }));
  try {
    await new Promise<void>((resolve, reject) => {
      img.onload = () => resolve();
      img.onerror = () => reject(new Error("The drawing could not be rasterised"));
      img.src = url;
    });
    const scale = 2;
    const canvas = document.createElement("canvas");
    canvas.width = img.width * scale;
    canvas.height = img.height * scale;
    const ctx = canvas.getContext("2d")!;
    ctx.scale(scale, scale);
    ctx.drawImage(img, 0, 0);
    const png = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, "image/png"));
    if (!png) throw new Error("The browser could not make a PNG");
    const a = document.createElement("a");
    a.href = URL.createObjectURL(png);
    a.download = filename;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 1000);
  } finally {
    URL.revokeObjectURL(url);
  }
}

export default function PathwayPage({ loaderData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const navigate = useNavigate();
  const pathwayId = loaderData.answer.pathway.id;
  const [unit, setUnit] = useState<string>(loaderData.answer.unit);
  const [protocol, setProtocol] = useState<string>("");
  const [compare, setCompare] = useState<string>("");
  const [message, setMessage] = useState<string | null>(null);
  const fetchAnswer = (p: string) => apiFetch<Answer>(`/api/v1/projects/${project.id}/pathways/${pathwayId}?${new URLSearchParams({ unit, ...(p ? { protocol: p } : {}) })}`);
  const main = useQuery({
    queryKey: ["pathway", project.id, pathwayId, unit, protocol],
    queryFn: () => fetchAnswer(protocol),
    initialData: unit === loaderData.answer.unit && protocol === "" ? loaderData.answer : undefined,
    placeholderData: keepPreviousData,
  });
  const other = useQuery({
    queryKey: ["pathway", project.id, pathwayId, unit, compare],
    queryFn: () => fetchAnswer(compare),
    enabled: compare !== "",
    placeholderData: keepPreviousData,
  });
  const answer = main.data ?? loaderData.answer;
  const shown = profileStatesOf(answer.states);
  const svg = useMemo(
    () =>
      renderProfileSvg(shown.states, {
        unit: answer.unit,
        quantity: shown.quantity,
        title: answer.pathway.name,
        name: answer.protocol?.name,
        compare: compare && other.data ? { name: other.data.protocol?.name ?? "comparison", states: profileStatesOf(other.data.states, shown.quantity === "ΔG" ? "G" : "E").states } : null,
      }),
    [answer, shown.quantity, shown.states, compare, other.data],
  );
  const query = new URLSearchParams({ unit: answer.unit, ...(protocol ? { protocol } : {}), ...(compare ? { compare } : {}) });
  const svgHref = `/projects/${project.id}/pathways/${pathwayId}/diagram.svg?${query}`;
  const fileBase = answer.pathway.name.replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "") || "pathway";
  const remove = async () => {
    if (!window.confirm(`Delete pathway ${answer.pathway.name}?`)) return;
    try {
      await apiFetch(`/api/v1/projects/${project.id}/pathways/${pathwayId}`, { method: "DELETE", body: { version: answer.pathway.version } });
      navigate(`/projects/${project.id}/pathways`);
    } catch (e) {
      setMessage(describeApiError(e));
    }
  };

  return (
    <div className="grid gap-4">
      <section className="card">
        <div className="flex flex-wrap items-end gap-4">
          <div className="mr-auto">
            <p className="text-xs text-muted">
              <Link className="link" to={`/projects/${project.id}/pathways`}>Pathways</Link> /
            </p>
            <h2 className="font-bold" data-testid="pathway-name">{answer.pathway.name}</h2>
            <p className="text-sm text-muted">
              {answer.pathway.cycle ? "Catalytic cycle" : "Energy profile"} under {answer.protocol ? `${answer.protocol.name} (${answer.protocol.notation}, ${answer.protocol.temperatureK} K, ${answer.protocol.standardState})` : "no protocol"}; values relative to {answer.states[answer.pathway.referenceState]?.label ?? "the first state"}.
            </p>
          </div>
          <label className="text-sm">
            <span className="label">Unit</span>
            <select className="input w-32" value={unit} onChange={(e) => setUnit(e.target.value)} aria-label="Energy unit" data-testid="unit-select">
              {UNITS.map((u) => <option key={u} value={u}>{u}</option>)}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">Protocol</span>
            <select className="input w-48" value={protocol} onChange={(e) => setProtocol(e.target.value)} aria-label="Protocol">
              <option value="">pathway&apos;s own / default</option>
              {loaderData.protocols.map((p) => <option key={p.id} value={String(p.id)}>{p.name}</option>)}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">Compare with</span>
            <select className="input w-48" value={compare} onChange={(e) => setCompare(e.target.value)} aria-label="Compare with protocol" data-testid="compare-select">
              <option value="">—</option>
              {loaderData.protocols.map((p) => <option key={p.id} value={String(p.id)}>{p.name}</option>)}
            </select>
          </label>
        </div>
      </section>

      <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_380px]">
        <section className="card overflow-x-auto">
          <div className="w-full" data-testid="profile" dangerouslySetInnerHTML={{ __html: svg }} />
          <div className="mt-2 flex flex-wrap gap-2">
            <a className="btn" href={svgHref} download={`${fileBase}.svg`} data-testid="download-svg">Download SVG</a>
            <button className="btn" type="button" onClick={() => downloadPng(svg, `${fileBase}.png`).catch((e) => setMessage(describeApiError(e)))} data-testid="download-png">
              Download PNG
            </button>
            {can.edit ? <button className="btn btn-danger ml-auto" type="button" onClick={remove}>Delete pathway</button> : null}
          </div>
          {message ? <p className="field-error mt-2">{message}</p> : null}
          {main.error ? <p className="field-error mt-2">{describeApiError(main.error)}</p> : null}
        </section>

        <aside className="grid content-start gap-4">
          <section className="card text-sm">
            <table className="table" data-testid="state-table">
              <thead>
                <tr>
                  <th>State</th>
                  <th className="text-right">ΔE</th>
                  <th className="text-right">ΔH ⚠</th>
                  <th className="text-right">ΔG</th>
                  <th className="text-right">barrier</th>
                </tr>
              </thead>
              <tbody>
                {answer.states.map((s) => (
                  <tr key={s.label}>
                    <td>{s.label}{s.kind === "transition-state" ? <span className="text-copper"> ‡</span> : null}</td>
                    <td className="num text-right">{formatEnergyValue(s.relativeE, answer.unit)}</td>
                    <td className="num text-right">{formatEnergyValue(s.relativeH, answer.unit)}</td>
                    <td className="num text-right">{formatEnergyValue(s.relativeG, answer.unit)}</td>
                    <td className="num text-right" title={s.barrier ? `against ${s.barrier.from} (${s.barrier.basis})` : undefined}>{s.barrier ? formatEnergyValue(s.barrier.value, answer.unit) : ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-1 text-xs text-muted">In {answer.unit}. Barriers against the lowest preceding state.</p>
          </section>
          {answer.pathway.cycle ? (
            <section className="card text-sm" data-testid="span">
              <h3 className="mb-1 font-bold">Energetic span</h3>
              {answer.energeticSpan ? (
                <>
                  <dl className="grid grid-cols-2 gap-1">
                    <dt className="text-muted">δE</dt><dd className="num">{formatEnergyValue(answer.energeticSpan.deltaE, answer.unit)} {answer.unit}</dd>
                    <dt className="text-muted">TOF-determining TS</dt><dd>{answer.energeticSpan.tdts}</dd>
                    <dt className="text-muted">TOF-determining intermediate</dt><dd>{answer.energeticSpan.tdi}</dd>
                    <dt className="text-muted">TOF ⚠</dt><dd className="num">{formatScientific(answer.energeticSpan.tof)} s⁻¹</dd>
                    <dt className="text-muted">ΔG of one turnover</dt><dd className="num">{formatEnergyValue(answer.energeticSpan.reactionEnergy, answer.unit)} {answer.unit}</dd>
                  </dl>
                  <p className="mt-2 text-xs text-muted">{answer.energeticSpan.basis}</p>
                  {answer.degreeOfTofControl ? (
                    <table className="table mt-2">
                      <thead><tr><th>State</th><th className="text-right">degree of TOF control</th></tr></thead>
                      <tbody>
                        {Object.entries(answer.degreeOfTofControl).map(([k, v]) => (
                          <tr key={k}><td>{k}</td><td className="num text-right">{v.toFixed(3)}</td></tr>
                        ))}
                      </tbody>
                    </table>
                  ) : null}
                </>
              ) : (
                <p className="text-muted">Not computed: every state needs a free energy (see the problems).</p>
              )}
            </section>
          ) : null}
          <p className="text-xs text-muted">⚠ {SAFETY_NOTE}</p>
          {answer.problems.length ? (
            <section className="card text-sm">
              <h3 className="mb-1 font-bold">Problems</h3>
              <ul className="list-disc pl-5">
                {answer.problems.map((p, i) => <li key={i} className={p.severity === "warning" ? "text-warn" : "text-bad"}>{p.message}</li>)}
              </ul>
            </section>
          ) : null}
        </aside>
      </div>
    </div>
  );
}
