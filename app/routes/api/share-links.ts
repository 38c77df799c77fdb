import { z } from "zod";
import type { Route } from "./+types/share-links";
import { createShareLink, listShareLinks, type ShareLinkInput } from "~/services/share-links.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });

/** GET: the project's share links with their state and last use (owner). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "manage");
  return Response.json({ shareLinks: await listShareLinks(project.id) });
});

/** POST {label, snapshotId?, expiresAt?}: a new read-only link; its URL is shown in this answer only. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "manage");
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to create a share link");
  // Validated once, in the service (it turns the expiry text into a date).
  const body = await parseJsonBody(request, z.looseObject({}));
  const { token, url, shareLink } = await createShareLink(project, principalOf(user), body as ShareLinkInput);
  return Response.json({ shareLink: { ...shareLink, token, url } }, { status: 201 });
});
