import { z } from "zod";
import type { Route } from "./+types/invitation";
import { revokeInvitation } from "~/services/invitations.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, invitationId: positiveIntId });

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use DELETE to withdraw an invitation"));

/** DELETE: withdraws a pending invitation (owner); its link stops working. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, invitationId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  if (request.method !== "DELETE") return errorResponse(405, "method_not_allowed", "Use DELETE to withdraw an invitation");
  return Response.json({ invitation: await revokeInvitation(project, principalOf(user), invitationId) });
});
