import { z } from "zod";
import type { Route } from "./+types/invitations";
import { createInvitation, invitationInputSchema, listPendingInvitations } from "~/services/invitations.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: pending invitations (owner). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "manage");
  return Response.json({ invitations: await listPendingInvitations(project.id) });
});

/** POST {email, role}: invites by e-mail (owner); the link goes out by mail and is not in the answer. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to invite");
  const body = await parseJsonBody(request, invitationInputSchema);
  const invitation = await createInvitation(project, user, principalOf(user), body);
  return Response.json({ invitation }, { status: 201 });
});
