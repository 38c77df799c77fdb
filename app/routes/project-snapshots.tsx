import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-snapshots";
import { FormError } from "~/components/forms";
import { ChangesSinceSignOffList } from "~/components/sign-off";
import { useProject } from "~/components/use-project";
import { changesSinceSignOff, listSnapshots, signOff } from "~/services/snapshots.server";
import { annotatedAudit } from "~/services/team-audit.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { parseForm, parseParams, positiveIntId, ServiceError, serviceErrorToFields } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const formSchema = z.object({ statement: z.string().max(5000, "At most 5000 characters").optional() });

export const meta: Route.MetaFunction = () => [{ title: "Sign-off · Thermotally" }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const [snapshots, changes, audit] = await Promise.all([listSnapshots(project.id), changesSinceSignOff(project.id), annotatedAudit(project.id)]);
  return { snapshots, changes, auditCounts: audit.counts, accepted: audit.accepted };
}

/** Sign-off: freezes the project as it is now into a snapshot (auditor or owner). */
export async function action({ request, params }: Route.ActionArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "review");
  const parsed = parseForm(await request.formData(), formSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, signed: null }, { status: 422 });
  try {
    const snapshot = await signOff(project, principalOf(user), { statement: parsed.data.statement ?? "" });
    return { errors: {} as Record<string, string>, signed: snapshot.id };
  } catch (error) {
    if (error instanceof ServiceError) return data({ errors: serviceErrorToFields(error), signed: null }, { status: error.status });
    throw error;
  }
}

export default function Snapshots({ loaderData, actionData }: Route.ComponentProps) {
  const { project, can } = useProject();
  const errors: Record<string, string> = actionData?.errors ?? {};
  const busy = useNavigation().state !== "idle";
  const { snapshots, changes, auditCounts, accepted } = loaderData;
  return (
    <div className="grid gap-5 lg:grid-cols-[2fr_1fr]">
      <div className="space-y-5">
        <section className="card">
          <h2 className="mb-2 font-bold">Changes since the last sign-off</h2>
          <ChangesSinceSignOffList changes={changes} />
        </section>
        <section className="card">
          <h2 className="mb-2 font-bold">Snapshots</h2>
          {snapshots.length ? (
            <table className="table" data-testid="snapshot-list">
              <thead>
                <tr><th>#</th><th>Signed off</th><th>By</th><th>Statement</th><th>Checksum (SHA-256)</th></tr>
              </thead>
              <tbody>
                {snapshots.map((s) => (
                  <tr key={s.id}>
                    <td><Link className="link" to={`/projects/${project.id}/snapshots/${s.id}`}>#{s.id}</Link></td>
                    <td className="num">{s.signedAt.replace("T", " ").slice(0, 16)}</td>
                    <td>{s.signer}</td>
                    <td className="max-w-xs truncate" title={s.statement}>{s.statement || "—"}</td>
                    <td className="num text-xs">{s.checksum.slice(0, 16)}…</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-sm text-muted">No snapshot yet.</p>
          )}
        </section>
      </div>
      <aside>
        {can.review ? (
          <Form method="post" className="card space-y-3" noValidate>
            <h2 className="font-bold">Sign off</h2>
            <p className="text-sm">
              The audit shows <span className="text-bad">{auditCounts.error} errors</span> and <span className="text-warn">{auditCounts.warning} warnings</span>
              {accepted ? ` (${accepted} findings accepted)` : ""}. <Link className="link" to={`/projects/${project.id}/audit`}>Review the audit</Link> first.
            </p>
            <p className="text-xs text-muted">
              Signing off freezes every input and every computed value under every protocol, with your name, the time and a checksum. A snapshot never changes.
            </p>
            <FormError error={errors.form} />
            {actionData?.signed ? <p className="text-sm text-ok" role="status">Snapshot #{actionData.signed} signed off.</p> : null}
            <label className="label" htmlFor="statement">Statement (optional)</label>
            <textarea id="statement" name="statement" className="input min-h-24" placeholder="e.g. Checked for the SI of the manuscript" />
            {errors.statement ? <p className="field-error" role="alert">{errors.statement}</p> : null}
            <button type="submit" className="btn-primary" disabled={busy}>Sign off and freeze a snapshot</button>
          </Form>
        ) : (
          <p className="card text-sm text-muted">An auditor or owner signs off.</p>
        )}
      </aside>
    </div>
  );
}
