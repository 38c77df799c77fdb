import { Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-audit";
import { FindingReview } from "~/components/comments";
import { useProject } from "~/components/use-project";
import { annotatedAudit } from "~/services/team-audit.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return annotatedAudit(project.id);
}

export const meta: Route.MetaFunction = () => [{ title: "Audit · Thermotally" }];

const GROUPS = [
  { severity: "error", title: "Errors", hint: "These block the values of the rows they concern.", tone: "text-bad border-bad" },
  { severity: "warning", title: "Warnings", hint: "Worth a look before a sign-off; nothing is blocked.", tone: "text-warn border-warn" },
  { severity: "note", title: "Notes", hint: "For the record.", tone: "text-steel border-steel" },
] as const;

type ReviewedFinding = Parameters<typeof FindingReview>[0]["finding"];

/**
 * The comments and the acceptance of one finding folded into one line; it opens on a click. The
 * summary alone says whether there is anything to read (accepted, n comments).
 */
function ReviewDisclosure({ finding, canComment, canReview }: { finding: ReviewedFinding; canComment: boolean; canReview: boolean }) {
  const n = finding.comments.length;
  if (!n && !finding.acceptance && !canComment && !canReview) return null;
  const parts = [
    finding.acceptance ? `accepted by ${finding.acceptance.acceptedBy}` : null,
    n ? `${n} comment${n === 1 ? "" : "s"}` : null,
  ].filter(Boolean);
  const action = [canComment ? "comment" : null, canReview && !finding.acceptance ? "accept" : null].filter(Boolean).join(" or ");
  return (
    <details className="basis-full text-xs" data-testid="finding-review">
      <summary className={`cursor-pointer select-none ${finding.acceptance ? "text-ok" : "text-muted"}`}>
        {parts.length ? parts.join(" · ") : action ? action[0]!.toUpperCase() + action.slice(1) + "…" : "Review"}
        {parts.length && action ? <span className="text-muted"> · {action}…</span> : null}
      </summary>
      <FindingReview finding={finding} />
    </details>
  );
}

export default function AuditPage({ loaderData }: Route.ComponentProps) {
  const { findings, counts, defaultProtocol } = loaderData;
  const { can } = useProject();
  return (
    <div className="grid gap-4">
      <section className="card">
        <h2 className="font-bold">Audit</h2>
        <p className="text-sm text-muted">
          Every rule is checked over the whole project; reaction and pathway rules under each row&apos;s own protocol (default {defaultProtocol?.name ?? "none yet"}).
        </p>
        <p className="mt-2 flex gap-4 text-sm" data-testid="audit-counts">
          <span className="text-bad">{counts.error} errors</span>
          <span className="text-warn">{counts.warning} warnings</span>
          <span className="text-steel">{counts.note} notes</span>
        </p>
      </section>
      {findings.length === 0 ? <p className="card text-ok">No findings: every rule passes.</p> : null}
      {GROUPS.map((g) => {
        const list = findings.filter((f) => f.severity === g.severity);
        if (!list.length) return null;
        return (
          <section key={g.severity} className="card" data-testid={`audit-${g.severity}`}>
            <h3 className={`mb-1 border-l-4 pl-2 font-bold ${g.tone}`}>
              {g.title} <span className="num text-muted">({list.length})</span>
            </h3>
            <p className="mb-2 text-xs text-muted">{g.hint}</p>
            <ul className="divide-y divide-rule">
              {list.map((f, i) => (
                <li key={i} className="flex flex-wrap items-baseline gap-x-3 py-1.5 text-sm">
                  <code className="text-xs text-muted">{f.code}</code>
                  <Link className="link whitespace-nowrap" to={f.link}>
                    {f.object.type} {f.object.label}
                  </Link>
                  <span className="basis-full">{f.message}</span>
                  <ReviewDisclosure finding={f} canComment={can.comment} canReview={can.review} />
                </li>
              ))}
            </ul>
          </section>
        );
      })}
    </div>
  );
}
