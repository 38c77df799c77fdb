import { z } from "zod";
import type { Route } from "./+types/calculations-grid";
import { applyCalculationGrid, calculationGrid, gridInputSchema } from "~/services/calculations.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: the species × level grid of electronic energies (hartree, as stored) with the cells' flags. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json(await calculationGrid(project.id));
});

/** POST {cells: [{species, level, electronicEnergy, version?, row?, column?}]}: all cells or none. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST with {cells: [...]}");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, gridInputSchema);
  return Response.json({ grid: await applyCalculationGrid(project, principalOf(user), body.cells) });
});
