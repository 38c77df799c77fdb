import { z } from "zod";
import type { Route } from "./+types/project";
import { deleteProject, describeProject, projectInputSchema, updateProject } from "~/services/projects.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, role } = await requireProject(request, projectId, "read");
  return Response.json({ project: describeProject(project, role) });
});

/** PATCH renames or re-describes (owner); DELETE removes the project (owner). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user, role } = await requireProject(request, projectId, "manage");
  if (request.method === "PATCH") {
    const body = await parseJsonBody(request, projectInputSchema);
    const updated = await updateProject(project, principalOf(user), body);
    return Response.json({ project: describeProject(updated, role) });
  }
  if (request.method === "DELETE") {
    await deleteProject(project, principalOf(user));
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
