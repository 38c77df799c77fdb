import { z } from "zod";
import type { Route } from "./+types/imports";
import { importFile } from "~/services/imports.server";
import { principalOf, requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";
import { readUploadedFile } from "~/utils/upload.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({ dryRun: z.enum(["0", "1", "true", "false"]).optional() });

/** POST multipart (field "file"): CSV/XLSX template, QCSchema JSON or XYZ; ?dryRun=1 previews only. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  if (request.method !== "POST") return errorResponse(405, "method_not_allowed", "Use POST");
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "edit");
  const { dryRun } = parseSearchParams(request.url, querySchema);
  const file = await readUploadedFile(request);
  const report = await importFile(project, principalOf(user), file, { dryRun: dryRun === "1" || dryRun === "true" });
  return Response.json({ import: report }, { status: report.committed ? 201 : 200 });
});
