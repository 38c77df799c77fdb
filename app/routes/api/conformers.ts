import { z } from "zod";
import type { Route } from "./+types/conformers";
import { conformerInputSchema, createConformer, getSpecies } from "~/services/species.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, itemId: z.string().min(1) });

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ conformers: (await getSpecies(project.id, itemId)).conformers });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a conformer");
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, conformerInputSchema);
  return Response.json({ conformer: await createConformer(project, principalOf(user), itemId, body) }, { status: 201 });
});
