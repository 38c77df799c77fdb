import { z } from "zod";
import type { Route } from "./+types/reaction";
import { deleteReaction, getReaction, reactionUpdateSchema, updateReaction } from "~/services/reactions.server";
import { expectedVersionOfDelete } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, reactionId: positiveIntId });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, reactionId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ reaction: await getReaction(project.id, reactionId) });
});

/** PATCH {equation?, transitionState?, protocol?, notes?, version}; DELETE (?version= or {version}). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, reactionId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  if (request.method === "PATCH") {
    const body = await parseJsonBody(request, reactionUpdateSchema);
    return Response.json({ reaction: await updateReaction(project, principalOf(user), reactionId, body) });
  }
  if (request.method === "DELETE") {
    const version = await expectedVersionOfDelete(request);
    await deleteReaction(project, principalOf(user), reactionId, version);
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
