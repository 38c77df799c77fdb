import { z } from "zod";
import type { Route } from "./+types/conformer";
import { conformerUpdateSchema, deleteConformer, updateConformer } from "~/services/species.server";
import { expectedVersionOfDelete } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, itemId: z.string().min(1), conformerId: z.string().min(1) });

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use PATCH or DELETE; the species' conformers are listed at …/conformers"));

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, itemId, conformerId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  if (request.method === "PATCH") {
    const body = await parseJsonBody(request, conformerUpdateSchema);
    return Response.json({ conformer: await updateConformer(project, principalOf(user), itemId, conformerId, body) });
  }
  if (request.method === "DELETE") {
    await deleteConformer(project, principalOf(user), itemId, conformerId, await expectedVersionOfDelete(request));
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
