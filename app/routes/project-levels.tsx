import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-levels";
import { ConfirmForm, Field, FormError, Notice } from "~/components/forms";
import { useProject } from "~/components/use-project";
import { createLevel, deleteLevel, listLevels, type LevelView } from "~/services/levels.server";
import { expectedVersionOf } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { formFailure } from "~/utils/form-errors.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return { levels: await listLevels(project.id) };
}

type ActionResult = { errors: Record<string, string>; notice?: string };

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const form = Object.fromEntries(await request.formData()) as Record<string, string>;
  try {
    if (form.intent === "delete") {
      await deleteLevel(project, principalOf(user), form.levelId ?? "", expectedVersionOf(form));
      return { errors: {}, notice: "Level deleted" } satisfies ActionResult;
    }
    const solvation = form.solvationModel?.trim() || form.solvent?.trim() ? { model: form.solvationModel ?? "", solvent: form.solvent ?? "" } : null;
    const input = form.text?.trim()
      ? { text: form.text }
      : { method: form.method, basis: form.basis, dispersion: form.dispersion || null, solvation };
    const { level, created } = await createLevel(project, principalOf(user), input);
    return { errors: {}, notice: created ? `Added level ${level.name}` : `Same as existing level ${level.name} (#${level.id}); nothing new was added` } satisfies ActionResult;
  } catch (error) {
    const { status, errors } = formFailure(error);
    return data({ errors } satisfies ActionResult, { status });
  }
}

function basisWords(c: LevelView["classification"]["basis"]): string {
  if (!c) return "not recognised";
  const zeta = c.zeta ? (["", "single", "double", "triple", "quadruple", "quintuple", "sextuple"][c.zeta] ?? `${c.zeta}`) + "-ζ" : "ζ unknown";
  const pol = c.polarisation ? (c.polarisationHydrogen ? "polarisation on all atoms" : "polarisation on heavy atoms") : "no polarisation";
  const diffuse = c.diffuse === "none" ? "no diffuse functions" : c.diffuse === "heavy" ? "diffuse on heavy atoms" : "diffuse on all atoms";
  return `${zeta}, ${pol}, ${diffuse}`;
}

function methodWords(c: LevelView["classification"]["method"]): string {
  if (!c || c.kind === "unknown") return "not recognised";
  if (c.kind === "dft") return `DFT, ${c.rung}`;
  return c.kind === "wavefunction" ? "wavefunction" : "semiempirical";
}

export default function LevelsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { can } = useProject();
  const errors: Record<string, string> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  return (
    <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h2 className="mb-3 font-bold">Levels of theory</h2>
        {actionData && "notice" in actionData && actionData.notice ? <Notice>{actionData.notice}</Notice> : null}
        {loaderData.levels.length === 0 ? (
          <p className="text-muted">No level yet. Add the levels your calculations were run at.</p>
        ) : (
          <table className="table mt-2" data-testid="levels">
            <thead>
              <tr>
                <th>Level</th>
                <th>Canonical key</th>
                <th>Method</th>
                <th>Basis set</th>
                {can.edit ? <th /> : null}
              </tr>
            </thead>
            <tbody>
              {loaderData.levels.map((l) => (
                <tr key={l.id}>
                  <td className="font-medium">{l.name}</td>
                  <td className="font-mono text-xs text-muted">{l.key}</td>
                  <td className="text-xs">{methodWords(l.classification.method)}</td>
                  <td className="text-xs">{basisWords(l.classification.basis)}</td>
                  {can.edit ? (
                    <td className="text-right">
                      <ConfirmForm question={`Delete level ${l.name}?`} fields={{ intent: "delete", levelId: l.id, version: l.version }} label="Delete" disabled={busy} />
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <p className="mt-3 text-xs text-muted">
          Aliases compare equal (6-31G** is 6-31G(d,p), wB97X-D is ωB97X-D; case and spacing are ignored); real differences such as D3(0) and D3(BJ) stay apart.
        </p>
      </section>
      {can.edit ? (
        <Form method="post" className="card space-y-3" noValidate data-testid="add-level">
          <h2 className="font-bold">Add a level</h2>
          <FormError error={errors.form ?? errors.level} />
          <Field label="As one line" name="text" placeholder="B3LYP-D3(BJ)/def2-SVP SMD(toluene)" error={errors.text} hint="Or fill in the parts below" />
          <Field label="Method" name="method" placeholder="ωB97X-D" error={errors.method} />
          <Field label="Basis set" name="basis" placeholder="def2-TZVP" error={errors.basis} />
          <Field label="Dispersion correction" name="dispersion" placeholder="D3(BJ)" error={errors.dispersion} />
          <div className="grid grid-cols-2 gap-2">
            <Field label="Solvation model" name="solvationModel" placeholder="SMD" error={errors["solvation.model"] ?? errors.solvation} />
            <Field label="Solvent" name="solvent" placeholder="toluene" error={errors["solvation.solvent"]} />
          </div>
          <button type="submit" className="btn-primary" disabled={busy}>
            Add level
          </button>
        </Form>
      ) : null}
    </div>
  );
}
