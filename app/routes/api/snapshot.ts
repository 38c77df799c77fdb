import { z } from "zod";
import type { Route } from "./+types/snapshot";
import { getSnapshot } from "~/services/snapshots.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, errorResponse, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, snapshotId: positiveIntId });

/** GET: one snapshot with its frozen content (the checksum is the SHA-256 of the content's canonical JSON). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, snapshotId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return Response.json({ snapshot: await getSnapshot(project.id, snapshotId) });
});

/** A snapshot never changes: every write method is refused, whoever asks. */
export const action = apiRoute(async ({ request, params }: Route.ActionArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "read");
  return errorResponse(405, "snapshot_immutable", `A snapshot cannot be changed or deleted (${request.method} refused); sign off a new one instead`);
});
