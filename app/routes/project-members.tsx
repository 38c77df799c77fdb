import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-members";
import { ConfirmForm, Field, FormError, SelectField } from "~/components/forms";
import { TeamSections } from "~/components/team-sections";
import { useProject } from "~/components/use-project";
import { addMember, changeMemberRole, listMembers, removeMember } from "~/services/projects.server";
import { membersTeamAction, membersTeamData } from "~/services/team-forms.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { parseForm, parseParams, positiveIntId, ServiceError, serviceErrorToFields } from "~/utils/http.server";
import { PROJECT_ROLES, ROLE_DESCRIPTIONS } from "~/utils/permissions";

const paramsSchema = z.object({ projectId: positiveIntId });
const roleOptions = PROJECT_ROLES.map((r) => ({ value: r, label: r }));

const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("add"), email: z.string(), role: z.string() }),
  z.object({ intent: z.literal("role"), membershipId: positiveIntId, role: z.enum(PROJECT_ROLES) }),
  z.object({ intent: z.literal("remove"), membershipId: positiveIntId }),
]);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, actor } = await requireProject(request, projectId, "read");
  return { members: await listMembers(project.id), team: await membersTeamData(project.id, actor) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  const team = await membersTeamAction(request, project, user, principalOf(user));
  if (team) return team;
  const parsed = parseForm(await request.formData(), actionSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 422 });
  const form = parsed.data;
  try {
    if (form.intent === "add") await addMember(project, principalOf(user), { email: form.email, role: form.role as never });
    else if (form.intent === "role") await changeMemberRole(project, principalOf(user), form.membershipId, form.role);
    else await removeMember(project, principalOf(user), form.membershipId);
    return { errors: {} as Record<string, string> };
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error) }, { status: error.status });
    if (error instanceof z.ZodError) return data({ errors: { form: error.issues[0]?.message ?? "Invalid input" } }, { status: 422 });
    throw error;
  }
}

export default function Members({ loaderData, actionData }: Route.ComponentProps) {
  const { can } = useProject();
  const errors: Record<string, string> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  return (
    <div className="grid gap-5 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h2 className="mb-3 font-bold">Members</h2>
        <FormError error={errors.form} />
        <table className="table">
          <thead>
            <tr>
              <th>Name</th>
              <th>E-mail</th>
              <th>Role</th>
              {can.manage ? <th /> : null}
            </tr>
          </thead>
          <tbody>
            {loaderData.members.map((m) => (
              <tr key={m.id}>
                <td>{m.name}</td>
                <td className="text-muted">{m.email}</td>
                <td>
                  {can.manage ? (
                    <Form method="post" className="flex gap-2">
                      <input type="hidden" name="intent" value="role" />
                      <input type="hidden" name="membershipId" value={m.id} />
                      <select name="role" defaultValue={m.role} className="input w-32" aria-label={`Role of ${m.email}`}>
                        {roleOptions.map((o) => (
                          <option key={o.value} value={o.value}>
                            {o.label}
                          </option>
                        ))}
                      </select>
                      <button className="btn" type="submit" disabled={busy}>
                        Save
                      </button>
                    </Form>
                  ) : (
                    m.role
                  )}
                </td>
                {can.manage ? (
                  <td className="text-right">
                    <ConfirmForm question={`Remove ${m.email} from the project?`} fields={{ intent: "remove", membershipId: m.id }} label="Remove" buttonClassName="btn-danger" disabled={busy} />
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <aside className="space-y-4">
        {can.manage ? <TeamSections team={loaderData.team} /> : null}
        {can.manage ? (
          <Form method="post" className="card space-y-3" noValidate>
            <h2 className="font-bold">Add a member</h2>
            <p className="text-xs text-muted">The person needs an account already.</p>
            <input type="hidden" name="intent" value="add" />
            <Field label="E-mail" name="email" type="email" required error={errors.email} />
            <SelectField label="Role" name="role" options={roleOptions} defaultValue="editor" error={errors.role} />
            <button type="submit" className="btn-primary" disabled={busy}>
              Add
            </button>
          </Form>
        ) : null}
        <section className="card">
          <h2 className="mb-2 font-bold">Roles</h2>
          <dl className="space-y-2 text-sm">
            {PROJECT_ROLES.map((r) => (
              <div key={r}>
                <dt className="font-medium">{r}</dt>
                <dd className="text-muted">{ROLE_DESCRIPTIONS[r]}</dd>
              </div>
            ))}
          </dl>
        </section>
      </aside>
    </div>
  );
}
