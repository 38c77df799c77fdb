import { data, Form, Link, useNavigation, useSearchParams } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-protocols";
import { ConfirmForm, Field, FormError, Notice, SelectField } from "~/components/forms";
import { useProject } from "~/components/use-project";
import { listLevels } from "~/services/levels.server";
import { createProtocol, deleteProtocol, listProtocols, protocolSettingsLine, setDefaultProtocol, updateProtocol, type ProtocolView } from "~/services/protocols.server";
import { CONFORMER_TREATMENTS, LOW_FREQUENCY_TREATMENTS, STANDARD_STATES, THERMAL_SOURCES } from "~/utils/ledger-vocab";
import { expectedVersionOf } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { formFailure } from "~/utils/form-errors.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const protocols = await listProtocols(project.id);
  return { protocols: protocols.map((p) => ({ ...p, settings: protocolSettingsLine(p) })), levels: await listLevels(project.id) };
}

type ActionResult = { errors: Record<string, string>; notice?: string };

/** Form fields → the protocol input the API takes (the service validates). */
function protocolFromForm(f: Record<string, string>) {
  return {
    name: f.name,
    energyLevel: f.energyLevel,
    thermalLevel: f.thermalLevel || null,
    thermalSource: f.thermalSource,
    temperature: f.temperature,
    standardState: f.standardState,
    lowFrequency: { treatment: f.lowFrequencyTreatment as never, cutoff: f.lowFrequencyCutoff },
    frequencyScale: f.frequencyScale,
    conformerTreatment: f.conformerTreatment,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const f = Object.fromEntries(await request.formData()) as Record<string, string>;
  const by = principalOf(user);
  try {
    if (f.intent === "default") {
      const p = await setDefaultProtocol(project, by, f.protocolId ?? "");
      return { errors: {}, notice: `${p.name} is now the default protocol` } satisfies ActionResult;
    }
    if (f.intent === "delete") {
      await deleteProtocol(project, by, f.protocolId ?? "", expectedVersionOf(f));
      return { errors: {}, notice: "Protocol deleted" } satisfies ActionResult;
    }
    if (f.intent === "update") {
      const p = await updateProtocol(project, by, f.protocolId ?? "", { ...protocolFromForm(f), version: f.version });
      return { errors: {}, notice: `Saved ${p.name}` } satisfies ActionResult;
    }
    const p = await createProtocol(project, by, protocolFromForm(f));
    return { errors: {}, notice: `Added ${p.name}${p.isDefault ? " (the project's default)" : ""}` } satisfies ActionResult;
  } catch (error) {
    const { status, errors } = formFailure(error);
    return data({ errors } satisfies ActionResult, { status });
  }
}

const opts = (values: readonly string[], labels: Record<string, string> = {}) => values.map((v) => ({ value: v, label: labels[v] ?? v }));

function ProtocolForm({ levels, editing, errors, busy }: { levels: { id: number; name: string }[]; editing: ProtocolView | null; errors: Record<string, string>; busy: boolean }) {
  const levelOptions = levels.map((l) => ({ value: String(l.id), label: l.name }));
  return (
    <Form method="post" className="card space-y-3" noValidate key={editing?.id ?? "new"} data-testid="protocol-form">
      <h2 className="font-bold">{editing ? `Edit ${editing.name}` : "Add a protocol"}</h2>
      <FormError error={errors.form} />
      <input type="hidden" name="intent" value={editing ? "update" : "create"} />
      {editing ? (
        <>
          <input type="hidden" name="protocolId" value={editing.id} />
          <input type="hidden" name="version" value={editing.version} />
        </>
      ) : null}
      <Field label="Name" name="name" defaultValue={editing?.name ?? ""} error={errors.name} />
      <SelectField label="Energy level (single points)" name="energyLevel" options={levelOptions} defaultValue={String(editing?.energyLevel.id ?? levels[levels.length - 1]?.id ?? "")} error={errors.energyLevel} />
      <SelectField
        label="Thermal level (geometry and frequencies)"
        name="thermalLevel"
        options={[{ value: "", label: "same as the energy level" }, ...levelOptions]}
        defaultValue={editing?.thermalLevelGiven ? String(editing.thermalLevel?.id ?? "") : ""}
        error={errors.thermalLevel}
      />
      <SelectField label="Thermal corrections" name="thermalSource" options={opts(THERMAL_SOURCES, { computed: "computed here from frequencies", stored: "stored corrections (same temperature)" })} defaultValue={editing?.thermalSource ?? "computed"} error={errors.thermalSource} />
      <div className="grid grid-cols-2 gap-2">
        <Field label="Temperature (K)" name="temperature" inputMode="decimal" defaultValue={String(editing?.temperature ?? 298.15)} error={errors.temperature} />
        <SelectField label="Standard state" name="standardState" options={opts(STANDARD_STATES, { "1 atm": "1 atm (gas)", "1 bar": "1 bar (gas)", "1 M": "1 mol/L (solution)" })} defaultValue={editing?.standardState ?? "1 atm"} error={errors.standardState} />
      </div>
      <div className="grid grid-cols-2 gap-2">
        <SelectField label="Low-frequency treatment" name="lowFrequencyTreatment" options={opts(LOW_FREQUENCY_TREATMENTS, { none: "none (RRHO)", grimme: "quasi-RRHO (Grimme)", truhlar: "raise to cutoff (Truhlar)" })} defaultValue={editing?.lowFrequency.treatment ?? "none"} error={errors["lowFrequency.treatment"]} />
        <Field label="Cutoff (cm⁻¹)" name="lowFrequencyCutoff" inputMode="decimal" defaultValue={String(editing?.lowFrequency.cutoff ?? 100)} error={errors["lowFrequency.cutoff"]} />
      </div>
      <div className="grid grid-cols-2 gap-2">
        <Field label="Frequency scale factor" name="frequencyScale" inputMode="decimal" defaultValue={String(editing?.frequencyScale ?? 1)} error={errors.frequencyScale} />
        <SelectField label="Conformers" name="conformerTreatment" options={opts(CONFORMER_TREATMENTS, { lowest: "lowest conformer", boltzmann: "Boltzmann ensemble" })} defaultValue={editing?.conformerTreatment ?? "lowest"} error={errors.conformerTreatment} />
      </div>
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={busy || levels.length === 0}>
          {editing ? "Save" : "Add protocol"}
        </button>
        {editing ? (
          <Link to="." className="btn">
            Cancel
          </Link>
        ) : null}
      </div>
      {levels.length === 0 ? <p className="text-xs text-muted">Add a level first.</p> : null}
    </Form>
  );
}

export default function ProtocolsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { can } = useProject();
  const [search] = useSearchParams();
  const errors: Record<string, string> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  const editId = Number(search.get("edit"));
  const editing = loaderData.protocols.find((p) => p.id === editId) ?? null;
  return (
    <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h2 className="mb-3 font-bold">Protocols</h2>
        {actionData && "notice" in actionData && actionData.notice ? <Notice>{actionData.notice}</Notice> : null}
        {loaderData.protocols.length === 0 ? (
          <p className="text-muted">No protocol yet. A protocol says how calculations combine into thermochemistry; the first one becomes the project's default.</p>
        ) : (
          <ul className="mt-2 divide-y divide-rule" data-testid="protocols">
            {loaderData.protocols.map((p) => (
              <li key={p.id} className="py-2">
                <div className="flex flex-wrap items-baseline gap-2">
                  <span className="font-medium">{p.name}</span>
                  {p.isDefault ? <span className="rounded bg-copper-soft px-1.5 text-xs text-copper">default</span> : null}
                  {can.edit ? (
                    <span className="ml-auto flex gap-3 text-xs">
                      <Link to={`?edit=${p.id}`} className="link">
                        Edit
                      </Link>
                      {!p.isDefault ? (
                        <Form method="post">
                          <input type="hidden" name="intent" value="default" />
                          <input type="hidden" name="protocolId" value={p.id} />
                          <button type="submit" className="link" disabled={busy}>
                            Make default
                          </button>
                        </Form>
                      ) : null}
                      <ConfirmForm question={`Delete protocol ${p.name}?`} fields={{ intent: "delete", protocolId: p.id, version: p.version }} label="Delete" buttonClassName="text-bad hover:underline" disabled={busy} />
                    </span>
                  ) : null}
                </div>
                <p className="font-mono text-sm" data-testid="protocol-notation">{p.notation}</p>
                <p className="text-xs text-muted">{p.settings}</p>
              </li>
            ))}
          </ul>
        )}
      </section>
      {can.edit ? <ProtocolForm levels={loaderData.levels} editing={editing} errors={errors} busy={busy} /> : null}
    </div>
  );
}
