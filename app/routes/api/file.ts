import { z } from "zod";
import type { Route } from "./+types/file";
import { openFileDownload, StoredFileCorrupt } from "~/services/files.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, attachment, errorResponse, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, fileId: positiveIntId });

/** GET: the file's bytes as uploaded, streamed, after its SHA-256 was checked. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, fileId } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "read");
  try {
    const { file, body } = await openFileDownload(projectId, fileId);
    return attachment(body, file.name, file.contentType, { "Content-Length": String(file.sizeBytes), "X-Content-SHA256": file.sha256 });
  } catch (error) {
    if (error instanceof StoredFileCorrupt) return errorResponse(500, "file_corrupt", error.message);
    throw error;
  }
});
