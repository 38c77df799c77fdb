import { z } from "zod";
import type { Route } from "./+types/levels";
import { createLevel, levelInputSchema, listLevels } from "~/services/levels.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ levels: await listLevels(project.id) });
});

/** POST creates a level (201) or returns the existing level it is an alias of (200, `reused: true`). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a level");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, levelInputSchema);
  const { level, created } = await createLevel(project, principalOf(user), body);
  return Response.json({ level, reused: !created }, { status: created ? 201 : 200 });
});
