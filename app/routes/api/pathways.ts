import { z } from "zod";
import type { Route } from "./+types/pathways";
import { createPathway, listPathways, pathwayInputSchema } from "~/services/pathways.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ pathways: await listPathways(project.id) });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a pathway");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, pathwayInputSchema);
  return Response.json({ pathway: await createPathway(project, principalOf(user), body) }, { status: 201 });
});
