import { z } from "zod";
import type { Route } from "./+types/share-export";
import { exportWorkbook, XLSX_TYPE } from "~/services/exports.server";
import { shareSource } from "~/services/project-view.server";
import { snapshotWorkbook } from "~/services/snapshot-export.server";
import { requireShare } from "~/utils/guards.server";
import { apiRoute, attachment, parseParams, parseSearchParams } from "~/utils/http.server";

const paramsSchema = z.object({ token: z.string().min(1) });
const querySchema = z.object({ unit: z.string().max(20).optional(), protocol: z.string().max(160).optional() });

/** GET /share/:token/export.xlsx: the workbook of what the link shows (a snapshot's frozen tables, or the live project). */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { token } = parseParams(params, paramsSchema);
  const share = await requireShare(request, token, "export");
  const query = parseSearchParams(request.url, querySchema);
  const by = `share link “${share.link.label}”`;
  const source = shareSource(share);
  const out = source.snapshot ? snapshotWorkbook(source.snapshot, by, query) : await exportWorkbook(share.project, { name: by, email: "no sign-in" }, query);
  return attachment(out.body, out.fileName, XLSX_TYPE);
});
