import type { Route } from "./+types/share-audit";
import { AuditFindings } from "~/components/readonly-views";
import { shareSource, viewAudit } from "~/services/project-view.server";
import { requireShare } from "~/utils/guards.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const share = await requireShare(request, params.token, "read");
  return { audit: await viewAudit(shareSource(share)) };
}

export default function ShareAudit({ loaderData }: Route.ComponentProps) {
  const { audit } = loaderData;
  if (!audit) return <p className="card text-muted">This snapshot holds no audit.</p>;
  return (
    <section className="space-y-3">
      <h2 className="font-bold">
        Audit: <span className="text-bad">{audit.counts.error} errors</span>, <span className="text-warn">{audit.counts.warning} warnings</span>,{" "}
        {audit.counts.note} notes{audit.accepted ? `, ${audit.accepted} accepted` : ""}
      </h2>
      <AuditFindings findings={audit.findings} />
    </section>
  );
}
