import { data, Form, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-settings";
import { Field, FormError, Notice } from "~/components/forms";
import { useProject } from "~/components/use-project";
import { deleteProject, projectInputSchema, updateProject } from "~/services/projects.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { parseForm, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "manage");
  return null;
}

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  const form = await request.formData();
  if (form.get("intent") === "delete") {
    if (String(form.get("confirmName") ?? "").trim() !== project.name) {
      return data({ errors: { confirmName: "Type the project's name exactly to delete it" } as Record<string, string>, saved: false }, { status: 422 });
    }
    await deleteProject(project, principalOf(user));
    return redirect("/projects");
  }
  const parsed = parseForm(form, projectInputSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, saved: false }, { status: 422 });
  await updateProject(project, principalOf(user), parsed.data);
  return { errors: {} as Record<string, string>, saved: true };
}

export default function ProjectSettings({ actionData }: Route.ComponentProps) {
  const { project } = useProject();
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <div className="grid max-w-3xl gap-5">
      <Form method="post" className="card space-y-3" noValidate>
        <h2 className="font-bold">Name and description</h2>
        {actionData?.saved ? <Notice>Saved.</Notice> : null}
        <FormError error={errors.form} />
        <Field label="Name" name="name" defaultValue={project.name} required error={errors.name} />
        <Field label="Description" name="description" defaultValue={project.description} error={errors.description} />
        <button type="submit" className="btn-primary">
          Save
        </button>
      </Form>
      <Form method="post" className="card space-y-3 border-bad/40" noValidate>
        <h2 className="font-bold text-bad">Delete the project</h2>
        <p className="text-sm text-muted">Deletes every species, calculation, reaction and snapshot in it. This cannot be undone.</p>
        <input type="hidden" name="intent" value="delete" />
        <Field label="Type the project's name to confirm" name="confirmName" error={errors.confirmName} />
        <button type="submit" className="btn-danger">
          Delete project
        </button>
      </Form>
    </div>
  );
}
