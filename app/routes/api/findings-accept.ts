import { z } from "zod";
import type { Route } from "./+types/findings-accept";
import { acceptanceInputSchema, acceptFinding, revokeAcceptance } from "~/services/comments.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const revokeSchema = z.object({ findingKey: z.string() });

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use POST {findingKey, reason} or DELETE {findingKey}"));

/** POST {findingKey, reason}: marks a finding accepted; DELETE {findingKey}: withdraws that (auditor or owner). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "review");
  if (request.method === "POST") {
    const body = await parseJsonBody(request, acceptanceInputSchema);
    return Response.json({ acceptance: await acceptFinding(project, principalOf(user), body) }, { status: 201 });
  }
  if (request.method === "DELETE") {
    const body = await parseJsonBody(request, revokeSchema);
    await revokeAcceptance(project, principalOf(user), body.findingKey);
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use POST {findingKey, reason} or DELETE {findingKey}");
});
