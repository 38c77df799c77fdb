import { z } from "zod";
import type { Route } from "./+types/changes";
import { changesSinceSignOff } from "~/services/snapshots.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: the last sign-off and what was added, removed or changed since ({signOff: null} if never signed off). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ signOff: await changesSinceSignOff(project.id) });
});
