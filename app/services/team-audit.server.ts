import { auditExtraRules, auditProject, type Finding } from "./audit.server";
import { activeAcceptances, findingKey, listComments, type AcceptanceView, type CommentView } from "./comments.server";
import { changesSinceSignOff, snapshotContentProviders, type SnapshotContent } from "./snapshots.server";

/**
 * Where the team features meet the audit: the "changed since sign-off" rule, the audit with each
 * finding's key, acceptance and comments, and the audit frozen into every snapshot.
 */
export const CHANGED_SINCE_SIGN_OFF = "changed_since_sign_off";

auditExtraRules.push(async (ctx): Promise<Finding[]> => {
  const since = await changesSinceSignOff(ctx.projectId, { values: false });
  if (!since || !since.outdated) return [];
  const counts = { added: 0, removed: 0, changed: 0 };
  for (const c of since.changes) counts[c.change]++;
  const what = (Object.keys(counts) as (keyof typeof counts)[]).filter((k) => counts[k]).map((k) => `${counts[k]} ${k}`).join(", ");
  return [
    {
      severity: "warning",
      code: CHANGED_SINCE_SIGN_OFF,
      message: `Changed since sign-off: the project was edited after snapshot #${since.snapshot.id} was signed off by ${since.snapshot.signer} on ${since.snapshot.signedAt.slice(0, 10)} (${what}); the sign-off no longer covers the live values`,
      object: { type: "snapshot", id: since.snapshot.id, label: `snapshot #${since.snapshot.id}` },
      link: `/projects/${ctx.projectId}/snapshots/${since.snapshot.id}`,
    },
  ];
});

export type AuditFinding = Finding & { key: string; acceptance: AcceptanceView | null; comments: CommentView[] };
type AuditAnswer = Awaited<ReturnType<typeof auditProject>>;

/** Joins findings with their acceptances and comments (for the live audit and a frozen one alike). */
export function annotateFindings(findings: Finding[], acceptances: Map<string, AcceptanceView>, comments: CommentView[]): AuditFinding[] {
  const byKey = new Map<string, CommentView[]>();
  for (const c of comments) {
    const list = byKey.get(c.targetKey);
    if (list) list.push(c);
    else byKey.set(c.targetKey, [c]);
  }
  return findings.map((f) => {
    const key = findingKey(f);
    return { ...f, key, acceptance: acceptances.get(key) ?? null, comments: byKey.get(key) ?? [] };
  });
}

/** The live audit with, per finding, its key, whether an auditor accepted it (and why) and its comments. */
export async function annotatedAudit(projectId: number) {
  const [audit, acceptances, comments] = await Promise.all([
    auditProject(projectId),
    activeAcceptances(projectId),
    listComments(projectId, { targetType: "finding" }),
  ]);
  const findings = annotateFindings(audit.findings, acceptances, comments);
  return { ...audit, accepted: findings.filter((f) => f.acceptance).length, findings };
}
export type AnnotatedAudit = Awaited<ReturnType<typeof annotatedAudit>>;

/** The audit as it stood at sign-off, from a snapshot's content. */
export function frozenAudit(content: SnapshotContent): AnnotatedAudit | null {
  return (content.audit as AnnotatedAudit | undefined) ?? null;
}

// Every snapshot freezes the audit as it stood, with acceptances and comments on findings.
// The new sign-off supersedes the old one, so its "changed since sign-off" finding is not frozen with it.
snapshotContentProviders.push(async (project) => {
  const audit = await annotatedAudit(project.id);
  const findings = audit.findings.filter((f) => f.code !== CHANGED_SINCE_SIGN_OFF);
  const counts = { error: 0, warning: 0, note: 0 };
  for (const f of findings) counts[f.severity]++;
  return { audit: { ...audit, counts, findings } };
});

export type { AuditAnswer };
