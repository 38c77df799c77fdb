import { z } from "zod";
import type { Route } from "./+types/calculation-files";
import { attachFile, listFiles } from "~/services/files.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseParams, positiveIntId } from "~/utils/http.server";
import { readUploadedFile } from "~/utils/upload.server";

const paramsSchema = z.object({ projectId: positiveIntId, calculationId: positiveIntId });

/** GET: the provenance files of a calculation. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, calculationId } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "read");
  return Response.json({ files: await listFiles(projectId, calculationId) });
});

/** POST multipart (field "file"): attach any file untouched, as provenance. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST");
  const { projectId, calculationId } = parseParams(params, paramsSchema);
  const { user } = await requireProject(request, projectId, "edit");
  const file = await readUploadedFile(request);
  return Response.json({ file: await attachFile(projectId, calculationId, principalOf(user), file) }, { status: 201 });
});
