import { z } from "zod";
import type { Route } from "./+types/snapshot-export";
import { snapshotWorkbook } from "~/services/snapshot-export.server";
import { getSnapshot } from "~/services/snapshots.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, attachment, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, snapshotId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(20).optional(), protocol: z.string().max(160).optional() });

/** GET …/snapshots/:snapshotId/export.xlsx?unit=&protocol=: the workbook of a snapshot (cover names it and its checksum). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, snapshotId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "export");
  const query = parseSearchParams(request.url, querySchema);
  const out = snapshotWorkbook(await getSnapshot(project.id, snapshotId), `${user.name} <${user.email}>`, query);
  return attachment(out.body, out.fileName, out.contentType);
});
