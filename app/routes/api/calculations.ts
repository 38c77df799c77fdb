import { z } from "zod";
import type { Route } from "./+types/calculations";
import { calculationFilterSchema, calculationInputSchema, createCalculation, listCalculations } from "~/services/calculations.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET lists calculations, optionally `?species=` (id or label) and `?level=` (id, key or alias). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const filter = parseSearchParams(request.url, calculationFilterSchema);
  return Response.json({ calculations: await listCalculations(project.id, filter) });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a calculation");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, calculationInputSchema);
  return Response.json({ calculation: await createCalculation(project, principalOf(user), body) }, { status: 201 });
});
