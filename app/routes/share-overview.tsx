import { Link } from "react-router";
import type { Route } from "./+types/share-overview";
import { SafetyNote } from "~/components/readonly-views";
import { shareSource, viewOverview } from "~/services/project-view.server";
import { requireShare } from "~/utils/guards.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const share = await requireShare(request, params.token, "read");
  return viewOverview(shareSource(share));
}

export default function ShareOverview({ loaderData, params }: Route.ComponentProps) {
  const base = `/share/${encodeURIComponent(params.token)}`;
  const o = loaderData;
  return (
    <div className="grid gap-5 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h2 className="mb-1 font-bold">About this study</h2>
        <p className="whitespace-pre-line text-muted">{o.description || "No description."}</p>
        {o.snapshot?.statement ? (
          <blockquote className="mt-3 border-l-2 border-copper pl-3 text-sm">
            Sign-off statement: {o.snapshot.statement}
          </blockquote>
        ) : null}
        <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4">
          {o.counts.map((c) => (
            <div key={c.key} className="rounded-md bg-paper px-3 py-2">
              <dt className="text-xs uppercase tracking-wide text-muted">{c.label}</dt>
              <dd className="num text-xl font-bold" data-testid={`count-${c.key}`}>{c.value}</dd>
            </div>
          ))}
        </dl>
        <div className="mt-4"><SafetyNote /></div>
      </section>
      <section className="card">
        <h2 className="mb-2 font-bold">Pathways</h2>
        {o.pathways.length ? (
          <ul className="space-y-1 text-sm">
            {o.pathways.map((p) => (
              <li key={p.id}>
                <Link className="link" to={`${base}/pathways/${p.id}`}>{p.name}</Link>
                {p.cycle ? <span className="ml-2 text-xs text-muted">catalytic cycle</span> : null}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-muted">No pathways.</p>
        )}
        {o.snapshot ? (
          <p className="mt-4 text-xs text-muted">
            Frozen values of snapshot #{o.snapshot.id}; SHA-256 <span className="num break-all">{o.snapshot.checksum}</span>
            {o.snapshot.intact ? "" : " — the stored content no longer matches this checksum"}
          </p>
        ) : null}
      </section>
    </div>
  );
}
