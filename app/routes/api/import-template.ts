import { z } from "zod";
import type { Route } from "./+types/import-template";
import { importTemplate } from "~/services/imports.server";
import { requireProject } from "~/utils/guards.server";
import { apiRoute, attachment, parseParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId, template: z.enum(["template.csv", "template.xlsx"]) });

/** GET template.csv | template.xlsx: the filled example of the import template. */
export const loader = apiRoute(async ({ request, params }: Route.LoaderArgs) => {
  const { projectId, template } = parseParams(params, paramsSchema);
  await requireProject(request, projectId, "read");
  const t = await importTemplate(template === "template.csv" ? "csv" : "xlsx");
  return attachment(new Uint8Array(t.body), t.fileName, t.contentType);
});
