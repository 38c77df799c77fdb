import { z } from "zod";
import type { Route } from "./+types/protocol";
import { deleteProtocol, getProtocol, protocolUpdateSchema, setDefaultProtocol, updateProtocol } from "~/services/protocols.server";
import { expectedVersionOfDelete } from "~/services/versioned.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseJsonBody, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, itemId: z.string().min(1) });
const patchSchema = z.intersection(protocolUpdateSchema, z.object({ isDefault: z.literal(true, { message: "isDefault can only be set to true (pick another protocol to change the default)" }).optional() }));

export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ protocol: await getProtocol(project.id, itemId) });
});

/** PATCH edits (with `version`); `{"isDefault": true}` makes it the project's default. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId, itemId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  if (request.method === "PATCH") {
    const { isDefault, ...body } = await parseJsonBody(request, patchSchema);
    let protocol = Object.keys(body).some((k) => k !== "version") ? await updateProtocol(project, principalOf(user), itemId, body) : await getProtocol(project.id, itemId);
    if (isDefault) protocol = await setDefaultProtocol(project, principalOf(user), protocol.id);
    return Response.json({ protocol });
  }
  if (request.method === "DELETE") {
    await deleteProtocol(project, principalOf(user), itemId, await expectedVersionOfDelete(request));
    return new Response(null, { status: 204 });
  }
  return errorResponse(405, "method_not_allowed", "Use PATCH or DELETE");
});
