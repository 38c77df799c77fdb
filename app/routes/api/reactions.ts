import { z } from "zod";
import type { Route } from "./+types/reactions";
import { computeReactions } from "~/services/ledger-compute.server";
import { createReaction, reactionInputSchema } from "~/services/reactions.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({ protocol: z.string().max(200).optional(), unit: z.string().max(40).optional() });

/** GET: every reaction computed under ?protocol= (default: each its own, else the project's) in ?unit=. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const query = parseSearchParams(request.url, querySchema);
  return Response.json(await computeReactions(project.id, query), { headers: { "Cache-Control": "no-store" } });
});

export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to add a reaction");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const body = await parseJsonBody(request, reactionInputSchema);
  return Response.json({ reaction: await createReaction(project, principalOf(user), body) }, { status: 201 });
});
