import { z } from "zod";
import type { Route } from "./+types/comments";
import { addComment, commentInputSchema, listAcceptances, listComments } from "~/services/comments.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({
  targetType: z.enum(["finding", "reaction"]).optional(),
  targetKey: z.string().max(300).optional(),
});

/** GET ?targetType=&targetKey=: comments (and the accepted findings) of the project (members). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const filter = parseSearchParams(request.url, querySchema);
  const [comments, acceptances] = await Promise.all([listComments(project.id, filter), listAcceptances(project.id)]);
  return Response.json({ comments, acceptances });
});

/** POST {targetType: "finding" | "reaction", targetKey, body}: a comment (owner, editor, auditor). */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "comment");
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST to comment");
  const body = await parseJsonBody(request, commentInputSchema);
  return Response.json({ comment: await addComment(project, principalOf(user), body) }, { status: 201 });
});
