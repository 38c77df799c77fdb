import { z } from "zod";
import type { Route } from "./+types/snapshots";
import { listSnapshots, signOff, signOffSchema } from "~/services/snapshots.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: the project's snapshots, newest first (members). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ snapshots: await listSnapshots(project.id) });
});

/** POST {statement?}: signs off the project as it is now, freezing a snapshot (auditor or owner). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "review");
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to sign off");
  const body = await parseJsonBody(request, signOffSchema);
  return Response.json({ snapshot: await signOff(project, principalOf(user), body) }, { status: 201 });
});
