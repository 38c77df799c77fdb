import type { Project } from "../../db/models/foundation";
import { ServiceError } from "../utils/http.server";
import { computePathway, computePathways, computeReactions, parseUnit, type ComputeOptions } from "./ledger-compute.server";
import type { ResolvedShare } from "./share-links.server";
import { OWN_PROTOCOLS, withContent, type SnapshotFull } from "./snapshots.server";
import { annotatedAudit, frozenAudit } from "./team-audit.server";

/**
 * The read-only views (overview, ledger, pathways, audit) of either the live project or one frozen
 * snapshot. Share links and the snapshot pages read through here: live values are computed as the
 * ledger computes them; frozen ones are taken from the snapshot's content, never recomputed.
 */
export type ViewSource = { project: Project; snapshot: SnapshotFull | null };

/** What a share link shows: its project, live or as frozen in its snapshot. */
export function shareSource(share: Pick<ResolvedShare, "project" | "snapshot">): ViewSource {
  return { project: share.project, snapshot: share.snapshot ? withContent(share.snapshot) : null };
}

function frozenKey(snapshot: SnapshotFull, protocol: ComputeOptions["protocol"]): string {
  if (protocol === undefined || protocol === null || protocol === "") return OWN_PROTOCOLS;
  const text = String(protocol).trim();
  const found = snapshot.content.inputs.protocols.find((p) => String(p.id) === text || p.name === text);
  if (!found) {
    throw new ServiceError(422, "unknown_protocol", `No protocol ${JSON.stringify(text)} in this snapshot`, [{ field: "protocol", message: "not in this snapshot" }]);
  }
  return String(found.id);
}

function frozen(snapshot: SnapshotFull, options: ComputeOptions) {
  const unit = parseUnit(options.unit);
  const entry = snapshot.content.computed[frozenKey(snapshot, options.protocol)]?.[unit];
  if (!entry) throw new ServiceError(422, "not_in_snapshot", `The snapshot holds no values in ${unit}`);
  return entry;
}

export async function viewReactions(source: ViewSource, options: ComputeOptions) {
  if (source.snapshot) return frozen(source.snapshot, options).reactions;
  return computeReactions(source.project.id, options);
}

export async function viewPathways(source: ViewSource, options: ComputeOptions) {
  if (source.snapshot) return frozen(source.snapshot, options).pathways;
  return (await computePathways(source.project.id, options)).pathways;
}

export async function viewPathway(source: ViewSource, pathwayId: number, options: ComputeOptions) {
  if (!source.snapshot) return computePathway(source.project.id, pathwayId, options);
  const found = frozen(source.snapshot, options).pathways.find((p) => p.pathway.id === pathwayId);
  if (!found) throw new ServiceError(404, "not_found", "No such pathway in this snapshot");
  return found;
}

export async function viewAudit(source: ViewSource) {
  if (!source.snapshot) return annotatedAudit(source.project.id);
  return frozenAudit(source.snapshot.content);
}

/** The heading facts of a read-only view: name, description and, for a snapshot, who signed it when. */
export function viewHeading(source: ViewSource) {
  const s = source.snapshot;
  return {
    name: s ? s.content.project.name : source.project.name,
    description: s ? s.content.project.description : source.project.description,
    snapshot: s ? { id: s.id, signer: s.signer, signedAt: s.signedAt, statement: s.statement, checksum: s.checksum, intact: s.intact } : null,
  };
}

export async function viewOverview(source: ViewSource) {
  const [reactions, pathways, audit] = await Promise.all([
    viewReactions(source, {}),
    viewPathways(source, {}),
    viewAudit(source),
  ]);
  const statuses: Record<string, number> = {};
  for (const r of reactions.reactions) statuses[r.status] = (statuses[r.status] ?? 0) + 1;
  return {
    ...viewHeading(source),
    counts: [
      { key: "reactions", label: "Reactions", value: reactions.reactions.length },
      { key: "pathways", label: "Pathways", value: pathways.length },
      { key: "audit-errors", label: "Audit errors", value: audit?.counts.error ?? 0 },
      { key: "audit-warnings", label: "Audit warnings", value: audit?.counts.warning ?? 0 },
    ],
    statuses,
    pathways: pathways.map((p) => ({ id: p.pathway.id, name: p.pathway.name, cycle: p.pathway.cycle })),
  };
}
