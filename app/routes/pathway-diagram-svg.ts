import { z } from "zod";
import type { Route } from "./+types/pathway-diagram-svg";
import { pathwayDiagram } from "~/services/pathway-diagram.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, attachment, parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, pathwayId: positiveIntId });
const querySchema = z.object({
  unit: z.string().max(40).optional(),
  protocol: z.string().max(200).optional(),
  compare: z.string().max(200).optional(),
  quantity: z.enum(["auto", "G", "E"]).optional(),
});

/** The energy profile as an SVG file, ready for a manuscript figure. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, pathwayId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "export");
  const query = parseSearchParams(request.url, querySchema);
  const { svg, filename } = await pathwayDiagram(project.id, pathwayId, query);
  return attachment(svg, filename, "image/svg+xml; charset=utf-8");
});
