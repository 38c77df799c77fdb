import { data, Form, Link } from "react-router";
import type { Route } from "./+types/projects";
import { Field, FormError } from "~/components/forms";
import { principalOf, requireUser } from "~/utils/guards.server";
import { parseForm, ServiceError, serviceErrorToFields } from "~/utils/http.server";
import { createProject, listProjectsFor, projectInputSchema } from "~/services/projects.server";
import { redirect } from "react-router";

export const meta: Route.MetaFunction = () => [{ title: "Projects · Thermotally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { projects: await listProjectsFor(user) };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const parsed = parseForm(await request.formData(), projectInputSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
  try {
    const project = await createProject(user, principalOf(user), parsed.data);
    return redirect(`/projects/${project.id}`);
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    throw error;
  }
}

export default function Projects({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <main className="mx-auto grid max-w-[1400px] gap-6 px-4 py-6 lg:grid-cols-[1fr_320px]">
      <section>
        <h1 className="mb-3 text-xl font-bold">Projects</h1>
        {loaderData.projects.length === 0 ? (
          <p className="card text-muted">No projects yet. Create one to start recording calculations.</p>
        ) : (
          <ul className="divide-y divide-rule rounded-lg border border-rule bg-panel">
            {loaderData.projects.map((p) => (
              <li key={p.id} className="flex items-baseline gap-3 px-4 py-3">
                <Link to={`/projects/${p.id}`} className="font-medium text-steel hover:underline">
                  {p.name}
                </Link>
                <span className="truncate text-muted">{p.description}</span>
                <span className="ml-auto shrink-0 rounded bg-steel-soft px-1.5 py-0.5 text-xs text-steel">{p.role ?? "site admin"}</span>
              </li>
            ))}
          </ul>
        )}
      </section>
      <aside>
        <Form method="post" className="card space-y-3" noValidate>
          <h2 className="font-bold">New project</h2>
          <FormError error={errors.form} />
          <Field label="Name" name="name" required error={errors.name} placeholder="e.g. Hydroamination, Cu catalyst" />
          <Field label="Description" name="description" error={errors.description} />
          <button type="submit" className="btn-primary">
            Create project
          </button>
        </Form>
      </aside>
    </main>
  );
}
