import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Link, useNavigate } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-pathway";
import { apiFetch, describeApiError } from "~/components/api-client";
import { PathwayAside } from "~/components/pathway-panels";
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
            <select className="input w-auto min-w-48" value={protocol} onChange={(e) => setProtocol(e.target.value)} aria-label="Protocol">
              <option value="">pathway&apos;s own / default</option>
              {loaderData.protocols.map((p) => <option key={p.id} value={String(p.id)}>{p.name}</option>)}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">Compare with</span>
            <select className="input w-auto min-w-48" value={compare} onChange={(e) => setCompare(e.target.value)} aria-label="Compare with protocol" data-testid="compare-select">
              <option value="">—</option>
              {loaderData.protocols.map((p) => <option key={p.id} value={String(p.id)}>{p.name}</option>)}
            </select>
          </label>
        </div>
      </section>

      <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,1fr)_380px]">
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

        <PathwayAside answer={answer} />
      </div>
    </div>
  );
}
