import { z } from "zod";
import type { Route } from "./+types/files";
import { listFiles } from "~/services/files.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: every provenance file of the project. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "read");
  return Response.json({ files: await listFiles(projectId) });
});
