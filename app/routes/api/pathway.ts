import { z } from "zod";
import type { Route } from "./+types/pathway";
import { computePathway } from "~/services/ledger-compute.server";
import { deletePathway, pathwayUpdateSchema, updatePathway } from "~/services/pathways.server";
import { expectedVersionOfDelete } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, pathwayId: positiveIntId });
const querySchema = z.object({ protocol: z.string().max(200).optional(), unit: z.string().max(40).optional() });

/** GET: the pathway computed (relative values, barriers, and for a cycle the energetic span). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, pathwayId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const query = parseSearchParams(request.url, querySchema);
  return Response.json(await computePathway(project.id, pathwayId, query), { headers: { "Cache-Control": "no-store" } });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, pathwayId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  if (request.method === "PATCH") {
    const body = await parseJsonBody(request, pathwayUpdateSchema);
    return Response.json({ pathway: await updatePathway(project, principalOf(user), pathwayId, body) });
  }
  if (request.method === "DELETE") {
    const version = await expectedVersionOfDelete(request);
    await deletePathway(project, principalOf(user), pathwayId, version);
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
