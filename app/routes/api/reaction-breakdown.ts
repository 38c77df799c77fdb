import { z } from "zod";
import type { Route } from "./+types/reaction-breakdown";
import { reactionBreakdown } from "~/services/ledger-compute.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, reactionId: positiveIntId });
const querySchema = z.object({ protocol: z.string().max(200).optional(), unit: z.string().max(40).optional() });

/** Every term of one reaction: the calculations used, each contribution, and why a value is missing. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, reactionId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const query = parseSearchParams(request.url, querySchema);
  return Response.json(await reactionBreakdown(project.id, reactionId, query), { headers: { "Cache-Control": "no-store" } });
});
