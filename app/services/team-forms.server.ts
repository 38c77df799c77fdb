import { data } from "react-router";
import { z } from "zod";
import type { Project, User } from "../../db/models/foundation";
import { parseForm, positiveIntId, ServiceError, serviceErrorToFields, type FieldErrors } from "../utils/http.server";
import { may, type ProjectActor } from "../utils/permissions";
import type { Principal } from "./history.server";
import { createInvitation, listPendingInvitations, revokeInvitation } from "./invitations.server";
import { createShareLink, listShareLinks, revokeShareLink } from "./share-links.server";
import { listSnapshots } from "./snapshots.server";

/**
 * The members page's team sections (invitations, share links): what its loader adds and the form
 * intents its action hands over here. Only owners (permission `manage`) see or change them.
 */
export async function membersTeamData(projectId: number, actor: ProjectActor) {
  if (!may(actor, "manage")) return { invitations: [], shareLinks: [], snapshots: [] };
  const [invitations, shareLinks, snapshots] = await Promise.all([
    listPendingInvitations(projectId),
    listShareLinks(projectId),
    listSnapshots(projectId),
  ]);
  return { invitations, shareLinks, snapshots: snapshots.map((s) => ({ id: s.id, signedAt: s.signedAt, signer: s.signer })) };
}
export type MembersTeamData = Awaited<ReturnType<typeof membersTeamData>>;

export const TEAM_INTENTS = ["invite", "revoke-invitation", "create-share-link", "revoke-share-link"] as const;

const teamFormSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("invite"), email: z.string(), role: z.string() }),
  z.object({ intent: z.literal("revoke-invitation"), invitationId: positiveIntId }),
  z.object({ intent: z.literal("create-share-link"), label: z.string(), snapshotId: z.string().optional(), expiresAt: z.string().optional() }),
  z.object({ intent: z.literal("revoke-share-link"), shareLinkId: positiveIntId }),
]);

export type TeamActionResult = { errors: FieldErrors; team?: { intent: string; notice?: string; shareUrl?: string } };

/**
 * Handles a team intent of the members page, or returns null when the form is about something else
 * (the page's own intents). Reads a clone of the request, so the page can still read the body.
 */
export async function membersTeamAction(request: Request, project: Project, user: User, by: Principal) {
  const form = await request.clone().formData();
  const intent = String(form.get("intent") ?? "");
  if (!(TEAM_INTENTS as readonly string[]).includes(intent)) return null;
  const parsed = parseForm(form, teamFormSchema);
  if (!parsed.ok) return data<TeamActionResult>({ errors: parsed.errors, team: { intent } }, { status: 422 });
  const f = parsed.data;
  try {
    if (f.intent === "invite") {
      const inv = await createInvitation(project, user, by, { email: f.email, role: f.role as never });
      return data<TeamActionResult>({ errors: {}, team: { intent, notice: `Invitation sent to ${inv.email}` } });
    }
    if (f.intent === "revoke-invitation") {
      await revokeInvitation(project, by, f.invitationId);
      return data<TeamActionResult>({ errors: {}, team: { intent, notice: "Invitation withdrawn" } });
    }
    if (f.intent === "create-share-link") {
      const created = await createShareLink(project, by, { label: f.label, snapshotId: f.snapshotId || null, expiresAt: f.expiresAt || null });
      return data<TeamActionResult>({ errors: {}, team: { intent, shareUrl: created.url } });
    }
    await revokeShareLink(project, by, f.shareLinkId);
    return data<TeamActionResult>({ errors: {}, team: { intent, notice: "Share link revoked" } });
  } catch (error) {
    if (error instanceof ServiceError) return data<TeamActionResult>({ errors: serviceErrorToFields(error), team: { intent } }, { status: error.status });
    if (error instanceof z.ZodError) {
      const errors: FieldErrors = {};
      for (const issue of error.issues) errors[issue.path.join(".") || "form"] ??= issue.message;
      return data<TeamActionResult>({ errors, team: { intent } }, { status: 422 });
    }
    throw error;
  }
}
