import { z } from "zod";
import type { Route } from "./+types/protocols";
import { createProtocol, listProtocols, protocolInputSchema } from "~/services/protocols.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ protocols: await listProtocols(project.id) });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a protocol");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, protocolInputSchema);
  return Response.json({ protocol: await createProtocol(project, principalOf(user), body) }, { status: 201 });
});
