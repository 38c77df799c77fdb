import { z } from "zod";
import type { Route } from "./+types/share-link";
import { revokeShareLink } from "~/services/share-links.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, shareLinkId: positiveIntId });

export const loader = apiRoute(async (_: Route.LoaderArgs) => errorResponse(405, "method_not_allowed", "Use DELETE to revoke a share link"));

/** DELETE: revokes a share link (owner); it stops working at the next request. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, shareLinkId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  if (request.method !== "DELETE") return errorResponse(405, "method_not_allowed", "Use DELETE to revoke a share link");
  return Response.json({ shareLink: await revokeShareLink(project, principalOf(user), shareLinkId) });
});
