import type { Route } from "./+types/projects";
import { createProject, listProjectsFor, projectInputSchema } from "~/services/projects.server";
import { principalOf, requireUser } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody } from "~/utils/http.server";

export const loader = apiRoute(async ({ request }: Route.LoaderArgs) => {
  const user = await requireUser(request);
  return Response.json({ projects: await listProjectsFor(user) });
});

export const action = apiRoute(async ({ request }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to create a project");
  const user = await requireUser(request);
  const body = await parseJsonBody(request, projectInputSchema);
  const project = await createProject(user, principalOf(user), body);
  return Response.json({ project }, { status: 201 });
});
