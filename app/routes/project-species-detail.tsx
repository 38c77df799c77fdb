import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-species-detail";
import { ConfirmForm, Field, FormError, Notice, SelectField } from "~/components/forms";
import { formatCharge, formatKind, formatMultiplicity } from "~/components/grids/format";
import { useProject } from "~/components/use-project";
import { createCalculation, listCalculationsWithAuthors } from "~/services/calculations.server";
import { listLevels } from "~/services/levels.server";
import { createConformer, deleteConformer, getSpecies } from "~/services/species.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { formFailure } from "~/utils/form-errors.server";
import { parseForm, parseParams, positiveIntId, ServiceError, serviceErrorToFields } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, speciesId: positiveIntId });
const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("add-conformer"), label: z.string(), geometry: z.string().optional() }),
  z.object({ intent: z.literal("delete-conformer"), conformerId: positiveIntId, version: positiveIntId.optional() }),
]);

/** The add-a-calculation form's fields; the service checks the values and names the field at fault. */
const THERMAL_FIELDS = ["thermalTemperature", "zpe", "enthalpyCorrection", "gibbsCorrection"] as const;

function calculationFromForm(speciesId: number, f: Record<string, string>) {
  const thermalGiven = THERMAL_FIELDS.some((k) => f[k]?.trim());
  return {
    species: speciesId,
    level: f.level ?? "",
    conformer: f.conformer || null,
    electronicEnergy: f.electronicEnergy ?? "",
    frequencies: f.frequencies ?? "",
    // Stored corrections come as a set: any one given sends all four, so a missing one is named.
    thermal: thermalGiven ? { temperature: f.thermalTemperature ?? "", zpe: f.zpe ?? "", enthalpyCorrection: f.enthalpyCorrection ?? "", gibbsCorrection: f.gibbsCorrection ?? "" } : undefined,
    converged: f.converged,
    source: f.source ?? "",
  };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId, speciesId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const species = await getSpecies(project.id, speciesId).catch((error) => {
    if (error instanceof ServiceError) throw data({ error: { message: "No such species in this project" } }, { status: 404 });
    throw error;
  });
  const [calculations, levels] = await Promise.all([listCalculationsWithAuthors(project.id, { species: String(species.id) }), listLevels(project.id)]);
  return { species, calculations, levels: levels.map((l) => ({ id: l.id, name: l.name })) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId, speciesId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const formData = await request.formData();
  if (formData.get("intent") === "add-calculation") {
    try {
      const c = await createCalculation(project, principalOf(user), calculationFromForm(speciesId, Object.fromEntries(formData) as Record<string, string>));
      return { errors: {} as Record<string, string>, scope: "calculation", notice: `Added calculation #${c.id} at ${c.level.name}` };
    } catch (error) {
      const { status, errors } = formFailure(error);
      return data({ errors, scope: "calculation", notice: null }, { status });
    }
  }
  const parsed = parseForm(formData, actionSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
  try {
    if (parsed.data.intent === "add-conformer") await createConformer(project, principalOf(user), speciesId, { label: parsed.data.label, geometry: parsed.data.geometry });
    else await deleteConformer(project, principalOf(user), speciesId, parsed.data.conformerId, parsed.data.version);
    return { errors: {} as Record<string, string> };
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    if (error instanceof z.ZodError) return data({ errors: { form: error.issues[0]?.message ?? "Invalid input" } }, { status: 422 });
    throw error;
  }
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.species.label ?? "Species"} · Thermotally` }];

/** "2025-03-04 09:12 UTC" from a stored ISO timestamp. */
const utc = (iso: string) => `${iso.replace("T", " ").slice(0, 16)} UTC`;

/** Who stored a calculation and when, and who last changed it when that was a later edit. */
function StoredBy({ c }: { c: { createdByName: string | null; updatedByName: string | null; createdAt: string; updatedAt: string; version: number } }) {
  const changed = c.version > 1 || c.updatedAt !== c.createdAt;
  return (
    <span data-testid="calculation-stored-by">
      {`by ${c.createdByName ?? "unknown"}, ${utc(c.createdAt)}`}
      {changed ? (
        <>
          <br />
          {`updated by ${c.updatedByName ?? "unknown"}, ${utc(c.updatedAt)}`}
        </>
      ) : null}
    </span>
  );
}

function Frequencies({ list }: { list: number[] }) {
  return (
    <p className="num flex flex-wrap gap-x-2 text-xs" data-testid="frequencies">
      {list.map((f, i) =>
        f < 0 ? (
          <span key={i} className="font-bold text-bad" title="imaginary mode">
            {Math.abs(f).toFixed(1)}i
          </span>
        ) : (
          <span key={i}>{f.toFixed(1)}</span>
        ),
      )}
    </p>
  );
}

export default function SpeciesDetail({ loaderData, actionData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const { species, calculations } = loaderData;
  const forCalculation = !!actionData && "scope" in actionData && actionData.scope === "calculation";
  const errors: Record<string, string> = !forCalculation ? (actionData?.errors ?? {}) : {};
  const calcErrors: Record<string, string> = forCalculation ? (actionData?.errors ?? {}) : {};
  const calcNotice = forCalculation && "notice" in actionData ? actionData.notice : null;
  const busy = useNavigation().state !== "idle";
  const base = `/projects/${project.id}`;
  return (
    <div className="space-y-4">
      <p className="text-sm">
        <Link to={`${base}/species`} className="link">
          ← Species
        </Link>
      </p>
      <section className="card">
        <h2 className="text-lg font-bold" data-testid="species-label">
          {species.label}
        </h2>
        <dl className="mt-2 grid grid-cols-2 gap-x-6 gap-y-1 text-sm md:grid-cols-4">
          <div><dt className="label">Formula</dt><dd>{species.formula ?? "—"}</dd></div>
          <div><dt className="label">SMILES</dt><dd className="break-all">{species.smiles ?? "—"}</dd></div>
          <div><dt className="label">Charge · multiplicity</dt><dd>{formatCharge(species.charge)} · {formatMultiplicity(species.multiplicity)}</dd></div>
          <div><dt className="label">Kind · symmetry number</dt><dd>{formatKind(species.kind)} · σ = {species.symmetryNumber}</dd></div>
          {species.concentrationMolL !== null ? <div><dt className="label">Concentration</dt><dd>{species.concentrationMolL} mol/L</dd></div> : null}
        </dl>
      </section>

      <section className="card">
        <h2 className="mb-2 font-bold">Calculations per level</h2>
        {calculations.length === 0 ? (
          <p className="text-muted">No calculation stored for this species yet.</p>
        ) : (
          <table className="table" data-testid="species-calculations">
            <thead>
              <tr>
                <th>Level</th>
                <th>Conformer</th>
                <th className="text-right">Electronic energy (hartree)</th>
                <th>Converged</th>
                <th>Thermal corrections (hartree)</th>
                <th>Frequencies (cm⁻¹; imaginary in red)</th>
                <th>Source</th>
                <th>Stored</th>
              </tr>
            </thead>
            <tbody>
              {calculations.map((c) => (
                <tr key={c.id}>
                  <td className="whitespace-nowrap">{c.level.name}</td>
                  <td>{c.conformer?.label ?? "—"}</td>
                  <td className="num text-right" title={c.electronicEnergy ?? undefined}>
                    {c.electronicEnergy ?? "—"}
                  </td>
                  <td className={c.converged ? "" : "font-medium text-bad"}>{c.converged ? "yes" : "no"}</td>
                  <td className="num text-xs">
                    {c.thermal ? `at ${c.thermal.temperature} K: ZPE ${c.thermal.zpe}, H ${c.thermal.enthalpyCorrection}, G ${c.thermal.gibbsCorrection}` : "—"}
                  </td>
                  <td className="max-w-md">
                    {c.frequencies ? (
                      <>
                        <p className="text-xs text-muted">
                          {c.frequencies.length} modes, {c.imaginaryModes} imaginary
                        </p>
                        <Frequencies list={c.frequencies} />
                      </>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td className="text-xs text-muted">{c.source || "—"}</td>
                  <td className="whitespace-nowrap text-xs text-muted">
                    <StoredBy c={c} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <p className="mt-2 text-xs text-muted">Energies are shown here with every stored digit.</p>
        {can.edit ? <AddCalculation levels={loaderData.levels} conformers={species.conformers} errors={calcErrors} notice={calcNotice ?? null} busy={busy} /> : null}
      </section>

      <div className="grid gap-4 lg:grid-cols-2">
        <section className="card">
          <h2 className="mb-2 font-bold">Geometry (XYZ, Å)</h2>
          {species.geometry ? (
            <pre className="max-h-96 overflow-auto rounded bg-paper p-2 text-xs" data-testid="geometry">
              {species.geometry.data}
            </pre>
          ) : (
            <p className="text-muted">No geometry stored.</p>
          )}
        </section>
        <section className="card space-y-3">
          <h2 className="font-bold">Conformers</h2>
          <FormError error={errors.form} />
          {species.conformers.length === 0 ? <p className="text-muted">None.</p> : null}
          {species.conformers.map((c) => (
            <details key={c.id} className="rounded border border-rule p-2">
              <summary className="flex cursor-pointer items-center gap-2">
                <span className="font-medium">{c.label}</span>
                <span className="text-xs text-muted">{c.geometry ? "geometry stored" : "no geometry"}</span>
                {can.edit ? (
                  <ConfirmForm className="ml-auto" question={`Delete conformer ${c.label} and its calculations?`} fields={{ intent: "delete-conformer", conformerId: c.id, version: c.version }} label="Delete" disabled={busy} />
                ) : null}
              </summary>
              {c.geometry ? <pre className="mt-2 max-h-60 overflow-auto text-xs">{c.geometry.data}</pre> : null}
            </details>
          ))}
          {can.edit ? (
            <Form method="post" className="space-y-2 border-t border-rule pt-3" noValidate>
              <input type="hidden" name="intent" value="add-conformer" />
              <Field label="Conformer label" name="label" error={errors.label} />
              <div>
                <label htmlFor="conformer-geometry" className="label">
                  Geometry (XYZ, Å)
                </label>
                <textarea id="conformer-geometry" name="geometry" rows={4} className="input font-mono text-xs" />
                {errors.geometry ? <p className="field-error" role="alert">{errors.geometry}</p> : null}
              </div>
              <button className="btn" type="submit" disabled={busy}>
                Add conformer
              </button>
            </Form>
          ) : null}
        </section>
      </div>
    </div>
  );
}

/** The first message among fields named `prefix` or `prefix.<n>` (e.g. frequencies.3). */
const errorAt = (errors: Record<string, string>, prefix: string) => Object.entries(errors).find(([k]) => k === prefix || k.startsWith(`${prefix}.`))?.[1];

/**
 * A calculation typed in by hand: an electronic energy, harmonic frequencies and/or stored thermal
 * corrections at one level (the calculations grid takes electronic energies only).
 */
function AddCalculation({ levels, conformers, errors, notice, busy }: { levels: { id: number; name: string }[]; conformers: { id: number; label: string }[]; errors: Record<string, string>; notice: string | null; busy: boolean }) {
  if (levels.length === 0) return <p className="mt-3 text-xs text-muted">Add a level of theory first to store a calculation here.</p>;
  return (
    // Keyed on the notice: a stored calculation empties the form, a refused one keeps what was typed.
    <Form key={notice ?? "form"} method="post" className="mt-4 grid gap-3 border-t border-rule pt-3 md:grid-cols-4" noValidate data-testid="add-calculation">
      <h3 className="font-bold md:col-span-4">Add a calculation</h3>
      <input type="hidden" name="intent" value="add-calculation" />
      <div className="md:col-span-4">
        {notice ? <Notice>{notice}</Notice> : null}
        <FormError error={errors.form ?? errors.species} />
      </div>
      <SelectField label="Level" name="level" options={levels.map((l) => ({ value: String(l.id), label: l.name }))} error={errors.level} />
      <SelectField label="Conformer" name="conformer" options={[{ value: "", label: "the species itself" }, ...conformers.map((c) => ({ value: String(c.id), label: c.label }))]} error={errors.conformer} />
      <Field label="Electronic energy (hartree)" name="electronicEnergy" inputMode="decimal" error={errors.electronicEnergy} hint="Optional when frequencies or corrections are given" />
      <SelectField label="Converged" name="converged" options={[{ value: "yes", label: "yes" }, { value: "no", label: "no" }]} error={errors.converged} />
      <div className="md:col-span-4">
        <label htmlFor="calculation-frequencies" className="label">
          Harmonic frequencies (cm⁻¹; imaginary modes negative; separated by spaces, commas or new lines)
        </label>
        <textarea id="calculation-frequencies" name="frequencies" rows={3} className="input font-mono text-xs" aria-invalid={errorAt(errors, "frequencies") ? true : undefined} />
        {errorAt(errors, "frequencies") ? <p className="field-error" role="alert">{errorAt(errors, "frequencies")}</p> : null}
      </div>
      <Field label="Thermal corrections at (K)" name="thermalTemperature" inputMode="decimal" error={errors["thermal.temperature"] ?? errors.thermal} hint="Stored corrections: all four or none" />
      <Field label="ZPE (hartree)" name="zpe" inputMode="decimal" error={errors["thermal.zpe"]} />
      <Field label="Enthalpy correction (hartree)" name="enthalpyCorrection" inputMode="decimal" error={errors["thermal.enthalpyCorrection"]} hint="Includes the ZPE" />
      <Field label="Gibbs correction (hartree)" name="gibbsCorrection" inputMode="decimal" error={errors["thermal.gibbsCorrection"]} hint="Includes the ZPE" />
      <div className="md:col-span-3">
        <Field label="Source note" name="source" error={errors.source} hint="Where the numbers come from (file, job, notebook page)" />
      </div>
      <div className="md:col-span-4">
        <button type="submit" className="btn-primary" disabled={busy}>
          Add calculation
        </button>
      </div>
    </Form>
  );
}
