import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-pathways";
import { FormError } from "~/components/forms";
import { useProject } from "~/components/use-project";
import { createPathwayFromForm, pathwaysPage } from "~/services/pathways.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId, ServiceError, serviceErrorToFields, zodDetails } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return pathwaysPage(project.id);
}

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const form = Object.fromEntries(await request.formData());
  try {
    const p = await createPathwayFromForm(project, principalOf(user), form);
    return redirect(`/projects/${project.id}/pathways/${p.id}`);
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    if (error instanceof z.ZodError) {
      const errors: Record<string, string> = {};
      for (const d of zodDetails(error)) errors[d.field?.split(".")[0] ?? "form"] ??= `${d.field ?? ""}: ${d.message}`;
      return data({ errors }, { status: 422 });
    }
    throw error;
  }
}

export const meta: Route.MetaFunction = () => [{ title: "Pathways · Thermotally" }];

const EXAMPLE = "rest: Cat + HCN + Alkene\nTS1: TS-OA + Alkene\nInt1: Ni-H-CN + Alkene\nend: Cat + Nitrile";

export default function PathwaysPage({ loaderData, actionData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const errors: Record<string, string> = (actionData as { errors?: Record<string, string> } | undefined)?.errors ?? {};
  const busy = useNavigation().state === "submitting";
  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_420px]">
      <section className="card">
        <h2 className="mb-2 font-bold">Pathways</h2>
        {loaderData.pathways.length === 0 ? (
          <p className="text-muted">No pathway yet.</p>
        ) : (
          <table className="table">
            <thead>
              <tr>
                <th>Name</th>
                <th>States</th>
                <th>Kind</th>
                <th>Protocol</th>
              </tr>
            </thead>
            <tbody>
              {loaderData.pathways.map((p) => (
                <tr key={p.id}>
                  <td>
                    <Link className="link" to={`/projects/${project.id}/pathways/${p.id}`}>
                      {p.name}
                    </Link>
                  </td>
                  <td className="num">{p.stateCount}</td>
                  <td>{p.cycle ? "catalytic cycle" : "profile"}</td>
                  <td>{loaderData.protocols.find((x) => x.id === p.protocolId)?.name ?? "project default"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      {can.edit ? (
        <section className="card">
          <h3 className="mb-2 font-bold">New pathway</h3>
          <Form method="post" className="grid gap-3" data-testid="add-pathway">
            <div>
              <label className="label" htmlFor="pw-name">Name</label>
              <input id="pw-name" name="name" className="input" required aria-invalid={errors.name ? true : undefined} />
              {errors.name ? <p className="field-error">{errors.name}</p> : null}
            </div>
            <div>
              <label className="label" htmlFor="pw-states">States, one per line: “label: A + 2 B”</label>
              <textarea id="pw-states" name="states" rows={8} className="input font-mono text-xs" placeholder={EXAMPLE} required aria-invalid={errors.states ? true : undefined} />
              <p className="mt-1 text-xs text-muted">
                The first state is the reference. For a cycle start at the resting state and end with the first state after one turnover (catalyst + products).
              </p>
              {errors.states ? <p className="field-error">{errors.states}</p> : null}
            </div>
            <label className="inline-flex items-center gap-2 text-sm">
              <input type="checkbox" name="cycle" value="true" /> catalytic cycle (energetic span and TOF)
            </label>
            <div>
              <label className="label" htmlFor="pw-protocol">Protocol</label>
              <select id="pw-protocol" name="protocol" className="input">
                <option value="">project default</option>
                {loaderData.protocols.map((p) => (
                  <option key={p.id} value={p.name}>{p.name}</option>
                ))}
              </select>
            </div>
            <FormError error={errors.form ?? errors.protocol} />
            <button className="btn btn-primary" type="submit" disabled={busy}>Create pathway</button>
          </Form>
        </section>
      ) : null}
    </div>
  );
}
