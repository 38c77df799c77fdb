import { z } from "zod";
import type { Route } from "./+types/export-xlsx";
import { exportWorkbook, XLSX_TYPE } from "~/services/exports.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, attachment, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(20).optional(), protocol: z.string().max(160).optional() });

/** GET export.xlsx?unit=&protocol=: the Supporting Information workbook. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, user } = await requireProject(request, projectId, "export");
  const query = parseSearchParams(request.url, querySchema);
  const out = await exportWorkbook(project, user, query);
  return attachment(out.body, out.fileName, XLSX_TYPE);
});
