import { z } from "zod";
import type { Route } from "./+types/project-snapshot";
import type { LedgerRow } from "~/components/grids/reaction-columns";
import { AuditFindings, LedgerTable, PathwayProfile, ProtocolLinks, UnitLinks } from "~/components/readonly-views";
import { viewAudit, viewPathways, viewReactions } from "~/services/project-view.server";
import { getSnapshot } from "~/services/snapshots.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, snapshotId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(20).optional(), protocol: z.string().max(160).optional() });

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Snapshot #${data?.snapshot.id ?? ""} · Thermotally` }];

/** One snapshot, read-only: the frozen ledger, pathways and audit (never recomputed). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId, snapshotId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const query = parseSearchParams(request.url, querySchema);
  const snapshot = await getSnapshot(project.id, snapshotId);
  const source = { project, snapshot };
  const [reactions, pathways, audit] = await Promise.all([viewReactions(source, query), viewPathways(source, query), viewAudit(source)]);
  const { content: _content, ...summary } = snapshot;
  return { snapshot: summary, reactions, pathways, audit, chosenProtocol: query.protocol ? (reactions.protocol?.id ?? null) : null };
}

export default function SnapshotView({ loaderData, params }: Route.ComponentProps) {
  const { snapshot, reactions, pathways, audit, chosenProtocol } = loaderData;
  const base = `/projects/${params.projectId}/snapshots/${snapshot.id}`;
  const href = (unit: string, protocol: number | null) => `${base}?unit=${encodeURIComponent(unit)}${protocol ? `&protocol=${protocol}` : ""}`;
  return (
    <div className="space-y-5">
      <section className="card" data-testid="snapshot-heading">
        <h2 className="font-bold">Snapshot #{snapshot.id} (read only)</h2>
        <p className="text-sm">
          Signed off by {snapshot.signer} on {snapshot.signedAt.replace("T", " ").slice(0, 16)} UTC.
          {snapshot.statement ? <> Statement: “{snapshot.statement}”</> : null}
        </p>
        <p className="mt-1 text-xs text-muted">
          SHA-256 of the content: <span className="num break-all" data-testid="snapshot-checksum">{snapshot.checksum}</span>{" "}
          {snapshot.intact ? "(verified)" : <span className="text-bad">(the stored content no longer matches)</span>}
        </p>
        <p className="mt-2">
          <a className="btn" href={`/api/v1/projects/${params.projectId}/snapshots/${snapshot.id}/export.xlsx`} download>
            Download the snapshot workbook (XLSX)
          </a>
        </p>
      </section>
      <section className="space-y-3">
        <div className="flex flex-wrap items-center gap-4">
          <h2 className="font-bold">Reactions as signed off</h2>
          <UnitLinks unit={reactions.unit} hrefFor={(u) => href(u, chosenProtocol)} />
          <ProtocolLinks protocols={reactions.protocols} current={chosenProtocol} hrefFor={(p) => href(reactions.unit, p)} />
        </div>
        <LedgerTable rows={reactions.reactions as unknown as LedgerRow[]} unit={reactions.unit} temperatureK={reactions.protocol?.temperatureK ?? null} />
      </section>
      {pathways.map((p) => (
        <section key={p.pathway.id} className="space-y-2">
          <h2 className="font-bold">{p.pathway.name}</h2>
          <PathwayProfile answer={p} />
        </section>
      ))}
      <section className="space-y-2">
        <h2 className="font-bold">Audit at sign-off</h2>
        {audit ? <AuditFindings findings={audit.findings} /> : <p className="text-muted">No audit stored.</p>}
      </section>
    </div>
  );
}
