import { z } from "zod";
import type { Route } from "./+types/audit";
import { auditProject } from "~/services/audit.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** The project's audit findings (errors, warnings, notes), each naming and linking the object it concerns. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json(await auditProject(project.id), { headers: { "Cache-Control": "no-store" } });
});
