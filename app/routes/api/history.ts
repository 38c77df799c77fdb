import { z } from "zod";
import type { Route } from "./+types/history";
import { listHistory } from "~/services/history.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({
  objectType: z.string().max(40).optional(),
  objectId: positiveIntId.optional(),
  userId: positiveIntId.optional(),
  before: positiveIntId.optional(),
  limit: z.coerce.number().int().min(1).max(1000).optional(),
});

/** GET the project's change log, newest first: ?objectType=&objectId=&userId=&before=&limit=. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ history: await listHistory(project.id, parseSearchParams(request.url, querySchema)) });
});
