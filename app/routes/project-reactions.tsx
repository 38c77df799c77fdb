import { keepPreviousData, useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-reactions";
import { apiFetch, describeApiError } from "~/components/api-client";
import { ReactionComments } from "~/components/comments";
import { LazyGrid } from "~/components/grids/LazyGrid";
import { formatEnergyValue, formatScientific, reactionColumns, SAFETY_NOTE, type LedgerRow } from "~/components/grids/reaction-columns";
import { StatusBadge } from "~/components/reaction-status";
import { useProject } from "~/components/use-project";
import { reactionLedgerPage } from "~/services/reactions.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(40).optional(), protocol: z.string().max(200).optional() });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const query = parseSearchParams(request.url, querySchema);
  return reactionLedgerPage(project.id, query);
}

export const meta: Route.MetaFunction = () => [{ title: "Reactions · Thermotally" }];

type Ledger = Awaited<ReturnType<typeof loader>>["ledger"];
const UNITS = ["kcal/mol", "kJ/mol", "eV"] as const;

export default function ReactionsPage({ loaderData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const projectId = project.id;
  const queryClient = useQueryClient();
  const [search] = useSearchParams();
  const [unit, setUnit] = useState<string>(loaderData.ledger.unit);
  const [protocol, setProtocol] = useState<string>(search.get("protocol") ?? "");
  const [selected, setSelected] = useState<number | null>(search.get("reaction") ? Number(search.get("reaction")) : null);
  const initialKey = `${loaderData.ledger.unit}|${search.get("protocol") ?? ""}`;
  const queryKey = ["reactions", projectId, unit, protocol];
  const { data: ledger, isFetching, error } = useQuery({
    queryKey,
    queryFn: () => apiFetch<Ledger>(`/api/v1/projects/${projectId}/reactions?${new URLSearchParams({ unit, ...(protocol ? { protocol } : {}) })}`),
    initialData: `${unit}|${protocol}` === initialKey ? loaderData.ledger : undefined,
    placeholderData: keepPreviousData,
  });
  const current = ledger ?? loaderData.ledger;
  const columns = useMemo(() => reactionColumns({ unit: current.unit, temperatureK: current.protocol?.temperatureK ?? null }), [current.unit, current.protocol?.temperatureK]);
  const counts = useMemo(() => {
    const c: Record<string, number> = {};
    for (const r of current.reactions) c[r.status] = (c[r.status] ?? 0) + 1;
    return c;
  }, [current.reactions]);
  const refresh = () => queryClient.invalidateQueries({ queryKey: ["reactions", projectId] });

  return (
    <div className="grid gap-4">
      <section className="card">
        <div className="flex flex-wrap items-end gap-4">
          <div className="mr-auto">
            <h2 className="font-bold">Reaction ledger</h2>
            <p className="text-sm text-muted" data-testid="ledger-protocol">
              {current.protocol ? (
                <>
                  Protocol <strong>{current.protocol.name}</strong>: {current.protocol.notation}, {current.protocol.temperatureK} K, {current.protocol.standardState}, thermal corrections{" "}
                  {current.protocol.thermalSource === "computed" ? "computed from frequencies" : "as stored"}, low-frequency {current.protocol.lowFrequency.treatment}
                  {protocol ? "" : " (rows with a protocol of their own use it)"}
                </>
              ) : (
                "No protocol yet: add one on the Protocols page to compute values."
              )}
            </p>
          </div>
          <label className="text-sm">
            <span className="label">Unit</span>
            <select className="input w-32" value={unit} onChange={(e) => setUnit(e.target.value)} aria-label="Energy unit" data-testid="unit-select">
              {UNITS.map((u) => (
                <option key={u} value={u}>
                  {u}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">Protocol</span>
            <select className="input w-auto min-w-56" value={protocol} onChange={(e) => setProtocol(e.target.value)} aria-label="Protocol" data-testid="protocol-select">
              <option value="">each row&apos;s own (else default)</option>
              {current.protocols.map((p) => (
                <option key={p.id} value={String(p.id)}>
                  {p.name}
                  {p.isDefault ? " (default)" : ""}
                </option>
              ))}
            </select>
          </label>
          <span className="text-xs text-muted" aria-live="polite" data-testid="ledger-busy">
            {isFetching ? "recomputing…" : `${current.reactions.length} reactions`}
          </span>
        </div>
        <div className="mt-2 flex flex-wrap gap-3 text-xs">
          {(["ok", "incomplete", "inconsistent", "unbalanced", "invalid"] as const).map((s) =>
            counts[s] ? (
              <span key={s} className="inline-flex items-center gap-1">
                <StatusBadge status={s} /> <span className="num text-muted">{counts[s]}</span>
              </span>
            ) : null,
          )}
        </div>
        <p className="mt-2 rounded border border-warn/40 bg-paper px-2 py-1 text-xs text-muted" data-testid="safety-note">
          ⚠ ΔH and k: {SAFETY_NOTE} k comes from the computed ΔG‡ by the Eyring equation (κ = 1) and is only as good as that barrier.
        </p>
        {error ? <p className="field-error mt-2">{describeApiError(error)}</p> : null}
      </section>

      <div className={`grid gap-4 ${selected ? "xl:grid-cols-[minmax(0,1fr)_420px]" : ""}`}>
        <LazyGrid<LedgerRow>
          height={560}
          testId="reactions-grid"
          rowData={current.reactions as LedgerRow[]}
          columnDefs={columns}
          getRowId={(p) => String(p.data.id)}
          defaultColDef={{ sortable: true, resizable: true, floatingFilter: true }}
          tooltipShowDelay={300}
          rowSelection={{ mode: "singleRow", checkboxes: false, enableClickSelection: true }}
          onRowClicked={(e) => e.data && setSelected(e.data.id)}
        />
        {selected ? <Breakdown projectId={projectId} reactionId={selected} unit={unit} protocol={protocol} onClose={() => setSelected(null)} canEdit={can.edit} onChanged={refresh} /> : null}
      </div>

      {can.edit ? <AddReaction projectId={projectId} choices={loaderData.choices} onAdded={refresh} /> : null}
    </div>
  );
}

type BreakdownAnswer = {
  unit: string;
  protocol: Ledger["protocol"];
  reaction: LedgerRow & { hartree: Record<string, string> };
  energyLevel: { label: string } | null;
  thermalLevel: { label: string } | null;
  terms: Array<{
    side: "reactant" | "product" | "transition-state";
    coefficient: number;
    species: { id: number; label: string; kind: string } | null;
    treatment: string | null;
    absoluteHartree: Record<"E" | "EZPE" | "H" | "G", string | null>;
    contributionInUnit: Record<"E" | "EZPE" | "H" | "G", number | null>;
    members: Array<{ conformer: string | null; population: number | null; energyCalculationId: number | null; thermalCalculationId: number | null; thermalSource: string | null; electronicEnergyHartree: string | null; inUnit: Record<string, number | null>; imaginaryFrequencies: number[] | null }>;
    missing: Record<string, string[]> | null;
  }>;
};

const VALUE_LABELS: Array<[keyof LedgerRow["values"], string]> = [
  ["deltaE", "ΔE"], ["deltaEZPE", "Δ(E+ZPE)"], ["deltaH", "ΔH"], ["deltaG", "ΔG"], ["barrierE", "ΔE‡"], ["barrierG", "ΔG‡"], ["rateConstant", "k"], ["equilibriumConstant", "K"],
];

const CONTRIBUTIONS: Array<["E" | "EZPE" | "H" | "G", string]> = [["E", "ΔE"], ["EZPE", "Δ(E+ZPE)"], ["H", "ΔH"], ["G", "ΔG"]];

function Breakdown({ projectId, reactionId, unit, protocol, onClose, canEdit, onChanged }: { projectId: number; reactionId: number; unit: string; protocol: string; onClose: () => void; canEdit: boolean; onChanged: () => void }) {
  const { data, error, isLoading } = useQuery({
    queryKey: ["reaction-breakdown", projectId, reactionId, unit, protocol],
    queryFn: () => apiFetch<BreakdownAnswer>(`/api/v1/projects/${projectId}/reactions/${reactionId}/breakdown?${new URLSearchParams({ unit, ...(protocol ? { protocol } : {}) })}`),
  });
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const remove = async () => {
    if (!data || !window.confirm(`Delete reaction ${data.reaction.equation}?`)) return;
    setBusy(true);
    try {
      await apiFetch(`/api/v1/projects/${projectId}/reactions/${reactionId}`, { method: "DELETE", body: { version: data.reaction.version } });
      onChanged();
      onClose();
    } catch (e) {
      setMessage(describeApiError(e));
    } finally {
      setBusy(false);
    }
  };
  return (
    <aside className="card max-h-[720px] overflow-auto text-sm" data-testid="breakdown">
      <div className="mb-2 flex items-start gap-2">
        <h3 className="mr-auto font-bold">{data?.reaction.equation ?? "Reaction"}</h3>
        <button className="btn" type="button" onClick={onClose} aria-label="Close the breakdown">
          ×
        </button>
      </div>
      {isLoading ? <p className="text-muted">Loading…</p> : null}
      {error ? <p className="field-error">{describeApiError(error)}</p> : null}
      {data ? (
        <>
          <p className="mb-2">
            <StatusBadge status={data.reaction.status} />{" "}
            <span className="text-muted">
              E at {data.energyLevel?.label ?? "—"}; thermal at {data.thermalLevel?.label ?? "—"}
            </span>
          </p>
          {data.reaction.problems.length ? (
            <ul className="mb-3 list-disc pl-5" data-testid="breakdown-problems">
              {data.reaction.problems.map((p, i) => (
                <li key={i} className={p.severity === "warning" ? "text-warn" : "text-bad"}>
                  {p.message}
                </li>
              ))}
            </ul>
          ) : null}
          <table className="table mb-3">
            <tbody>
              {VALUE_LABELS.map(([k, label]) => (
                <tr key={k}>
                  {/* normal-case: the table's headings are upper-cased, and k is not K. */}
                  <th className="w-24 text-left normal-case">{label}</th>
                  <td className="num">
                    {data.reaction.values[k] === null ? (
                      <span className="text-muted" title={data.reaction.reasons[k]}>
                        — <span className="text-xs">{data.reaction.reasons[k]}</span>
                      </span>
                    ) : k === "rateConstant" ? (
                      `${formatScientific(data.reaction.values[k])} ${data.reaction.rateConstantUnit.replace(/\^-1/g, "⁻¹").replace(/\^-2/g, "⁻²")}`
                    ) : k === "equilibriumConstant" ? (
                      formatScientific(data.reaction.values[k])
                    ) : (
                      `${formatEnergyValue(data.reaction.values[k], data.unit)} ${data.unit}`
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <h4 className="mb-1 font-medium">Terms</h4>
          {data.terms.map((t, i) => (
            <div key={i} className="mb-2 rounded border border-rule p-2">
              <div className="flex gap-2">
                <strong>
                  {t.side === "transition-state" ? "TS" : t.side === "reactant" ? "−" : "+"} {t.coefficient !== 1 ? `${t.coefficient} ×` : ""} {t.species?.label ?? "?"}
                </strong>
                <span className="ml-auto text-xs text-muted">{t.treatment === "boltzmann" ? "Boltzmann ensemble" : t.treatment === "lowest" ? "lowest conformer" : ""}</span>
              </div>
              <div className="num text-xs text-muted">
                E = {t.absoluteHartree.E ?? "—"} Eh; G = {t.absoluteHartree.G ?? "—"} Eh
              </div>
              {t.side !== "transition-state" ? (
                <div className="num text-xs" data-testid="term-contribution">
                  contribution ({data.unit}):{" "}
                  {CONTRIBUTIONS.map(([k, label]) => `${label} ${t.contributionInUnit[k] === null ? "—" : formatEnergyValue(t.contributionInUnit[k], data.unit)}`).join(" · ")}
                </div>
              ) : null}
              {t.members.map((m, j) => (
                <div key={j} className="text-xs text-muted">
                  {m.conformer ? `conformer ${m.conformer}${m.population !== null ? ` (${(m.population * 100).toFixed(1)} %)` : ""}: ` : ""}
                  energy from calculation {m.energyCalculationId ? `#${m.energyCalculationId}` : "—"}, thermal {m.thermalCalculationId ? `#${m.thermalCalculationId} (${m.thermalSource})` : "—"}
                  {m.inUnit.gibbsCorrection !== null ? `; G corr ${formatEnergyValue(m.inUnit.gibbsCorrection, data.unit)}` : ""}
                  {m.inUnit.standardStateCorrection ? `; standard state ${formatEnergyValue(m.inUnit.standardStateCorrection, data.unit)}` : ""}
                  {m.imaginaryFrequencies?.length ? `; imaginary ${m.imaginaryFrequencies.join(", ")} cm⁻¹` : ""}
                </div>
              ))}
            </div>
          ))}
          {canEdit ? (
            <button className="btn btn-danger mt-2" type="button" onClick={remove} disabled={busy}>
              Delete this reaction
            </button>
          ) : null}
          {message ? <p className="field-error">{message}</p> : null}
        </>
      ) : null}
      <ReactionComments reactionId={reactionId} />
    </aside>
  );
}

/** The term being typed: the text after the last " + " or arrow, for completion of species labels. */
function lastToken(text: string): string {
  const m = /(?:^|\s)(\S*)$/.exec(text);
  return m ? m[1]! : "";
}

function AddReaction({ projectId, choices, onAdded }: { projectId: number; choices: { species: Array<{ id: number; label: string; kind: string }>; protocols: Array<{ id: number; name: string }> }; onAdded: () => void }) {
  const [equation, setEquation] = useState("");
  const [ts, setTs] = useState("");
  const [protocol, setProtocol] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const token = lastToken(equation);
  const suggestions = useMemo(() => {
    if (!token || token === "+" || token === "->" || token === "→" || /^\d+(\.\d+)?$/.test(token)) return [];
    const list = (choices?.species ?? []).filter((s) => s.label.toLowerCase().startsWith(token.toLowerCase()) && s.label !== token);
    return list.slice(0, 8);
  }, [token, choices]);
  const complete = (label: string) => setEquation(equation.slice(0, equation.length - token.length) + label + " ");
  const submit = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setMessage(null);
    try {
      const res = await apiFetch<{ reaction: { equation: string } }>(`/api/v1/projects/${projectId}/reactions`, {
        body: { equation, transitionState: ts || null, protocol: protocol || null },
      });
      setMessage({ ok: true, text: `Added ${res.reaction.equation}` });
      setEquation("");
      setTs("");
      onAdded();
    } catch (err) {
      setMessage({ ok: false, text: describeApiError(err) });
    } finally {
      setBusy(false);
    }
  };
  return (
    <section className="card">
      <h3 className="mb-2 font-bold">Add a reaction</h3>
      <form className="grid gap-3 md:grid-cols-[minmax(0,2fr)_1fr_1fr_auto] md:items-end" onSubmit={submit} data-testid="add-reaction">
        <div className="relative">
          <label className="label" htmlFor="reaction-equation">
            Equation
          </label>
          <input
            id="reaction-equation"
            className="input"
            value={equation}
            onChange={(e) => setEquation(e.target.value)}
            placeholder="A + 2 B -> C"
            autoComplete="off"
            required
          />
          {suggestions.length ? (
            <ul className="absolute z-10 mt-1 w-full rounded border border-rule bg-panel shadow" role="listbox" aria-label="Species labels">
              {suggestions.map((s) => (
                <li key={s.id}>
                  <button type="button" className="w-full px-2 py-1 text-left text-sm hover:bg-paper" onClick={() => complete(s.label)}>
                    {s.label} <span className="text-xs text-muted">{s.kind === "transition-state" ? "TS" : ""}</span>
                  </button>
                </li>
              ))}
            </ul>
          ) : null}
          <p className="mt-1 text-xs text-muted">Terms separated by “ + ”, a coefficient before a label with a space (2 B), arrow -&gt; or →.</p>
        </div>
        <div>
          <label className="label" htmlFor="reaction-ts">
            Transition state
          </label>
          <select id="reaction-ts" className="input" value={ts} onChange={(e) => setTs(e.target.value)}>
            <option value="">none</option>
            {(choices?.species ?? [])
              .filter((s) => s.kind === "transition-state")
              .map((s) => (
                <option key={s.id} value={s.label}>
                  {s.label}
                </option>
              ))}
          </select>
        </div>
        <div>
          <label className="label" htmlFor="reaction-protocol">
            Protocol
          </label>
          <select id="reaction-protocol" className="input" value={protocol} onChange={(e) => setProtocol(e.target.value)}>
            <option value="">project default</option>
            {(choices?.protocols ?? []).map((p) => (
              <option key={p.id} value={p.name}>
                {p.name}
              </option>
            ))}
          </select>
        </div>
        <button className="btn btn-primary" type="submit" disabled={busy}>
          Add
        </button>
      </form>
      {message ? <p className={message.ok ? "mt-2 text-sm text-ok" : "field-error mt-2"} role="status">{message.text}</p> : null}
    </section>
  );
}
