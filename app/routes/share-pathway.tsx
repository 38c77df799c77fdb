import { z } from "zod";
import type { Route } from "./+types/share-pathway";
import { PathwayProfile, UnitLinks } from "~/components/readonly-views";
import { shareSource, viewPathway } from "~/services/project-view.server";
import { requireShare } from "~/utils/guards.server";
import { parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ token: z.string(), pathwayId: positiveIntId });
const querySchema = z.object({ unit: z.string().max(20).optional() });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { token, pathwayId } = parseParams(params, paramsSchema);
  const share = await requireShare(request, token, "read");
  return viewPathway(shareSource(share), pathwayId, parseSearchParams(request.url, querySchema));
}

export default function SharePathway({ loaderData, params }: Route.ComponentProps) {
  const p = loaderData;
  const base = `/share/${encodeURIComponent(params.token)}/pathways/${p.pathway.id}`;
  return (
    <section className="space-y-3">
      <div className="flex flex-wrap items-center gap-4">
        <h2 className="font-bold">{p.pathway.name}</h2>
        <UnitLinks unit={p.unit} hrefFor={(u) => `${base}?unit=${encodeURIComponent(u)}`} />
      </div>
      <PathwayProfile answer={p} />
    </section>
  );
}
