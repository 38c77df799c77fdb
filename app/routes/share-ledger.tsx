import { z } from "zod";
import type { Route } from "./+types/share-ledger";
import type { LedgerRow } from "~/components/grids/reaction-columns";
import { LedgerTable, ProtocolLinks, UnitLinks } from "~/components/readonly-views";
import { shareSource, viewReactions } from "~/services/project-view.server";
import { requireShare } from "~/utils/guards.server";
import { parseSearchParams } from "~/utils/http.server";

const querySchema = z.object({ unit: z.string().max(20).optional(), protocol: z.string().max(160).optional() });

export async function loader({ request, params }: Route.LoaderArgs) {
  const share = await requireShare(request, params.token, "read");
  const query = parseSearchParams(request.url, querySchema);
  const answer = await viewReactions(shareSource(share), query);
  return { answer, chosenProtocol: query.protocol ? (answer.protocol?.id ?? null) : null };
}

export default function ShareLedger({ loaderData, params }: Route.ComponentProps) {
  const { answer, chosenProtocol } = loaderData;
  const base = `/share/${encodeURIComponent(params.token)}/ledger`;
  const href = (unit: string, protocol: number | null) => `${base}?unit=${encodeURIComponent(unit)}${protocol ? `&protocol=${protocol}` : ""}`;
  return (
    <section className="space-y-3">
      <div className="flex flex-wrap items-center gap-4">
        <h2 className="font-bold">Reactions</h2>
        <UnitLinks unit={answer.unit} hrefFor={(u) => href(u, chosenProtocol)} />
        <ProtocolLinks protocols={answer.protocols} current={chosenProtocol} hrefFor={(p) => href(answer.unit, p)} />
      </div>
      <LedgerTable rows={answer.reactions as unknown as LedgerRow[]} unit={answer.unit} temperatureK={answer.protocol?.temperatureK ?? null} />
    </section>
  );
}
