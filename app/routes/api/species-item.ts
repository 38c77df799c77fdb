import { z } from "zod";
import type { Route } from "./+types/species-item";
import { deleteSpecies, getSpecies, speciesUpdateSchema, updateSpecies } from "~/services/species.server";
import { expectedVersionOfDelete } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, itemId: z.string().min(1) });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ species: await getSpecies(project.id, itemId) });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  if (request.method === "PATCH") {
    const body = await parseJsonBody(request, speciesUpdateSchema);
    return Response.json({ species: await updateSpecies(project, principalOf(user), itemId, body) });
  }
  if (request.method === "DELETE") {
    await deleteSpecies(project, principalOf(user), itemId, await expectedVersionOfDelete(request));
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
