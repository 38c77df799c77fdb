import { NavLink, Outlet } from "react-router";
import type { Route } from "./+types/share-layout";
import { Wordmark } from "~/components/logo";
import { shareSource, viewHeading } from "~/services/project-view.server";
import { requireShare } from "~/utils/guards.server";

/** The read-only frame of a share link: no sign-in, no edit control, only what `may(share, …)` allows. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const share = await requireShare(request, params.token, "read");
  return { token: params.token, heading: viewHeading(shareSource(share)) };
}

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.heading.name ?? "Shared project"} · Thermotally (read only)` },
  { name: "robots", content: "noindex" },
];

export default function ShareLayout({ loaderData }: Route.ComponentProps) {
  const { token, heading } = loaderData;
  const base = `/share/${encodeURIComponent(token)}`;
  const tabs = [
    { to: base, label: "Overview", end: true },
    { to: `${base}/ledger`, label: "Ledger" },
    { to: `${base}/audit`, label: "Audit" },
  ];
  return (
    <div className="min-h-screen bg-paper" data-share-view="1">
      <div className="border-b border-rule bg-panel">
        <div className="mx-auto max-w-[1400px] px-4 pt-3">
          <div className="flex flex-wrap items-baseline gap-3">
            <Wordmark />
            <h1 className="text-lg font-bold" data-testid="project-name">{heading.name}</h1>
            <span className="rounded bg-steel-soft px-1.5 py-0.5 text-xs text-steel" data-testid="read-only-badge">read only</span>
            {heading.snapshot ? (
              <span className="text-xs text-muted" data-testid="share-snapshot">
                snapshot #{heading.snapshot.id}, signed off by {heading.snapshot.signer} on {heading.snapshot.signedAt.slice(0, 10)} · checksum{" "}
                <span className="num">{heading.snapshot.checksum.slice(0, 16)}…</span>
              </span>
            ) : (
              <span className="text-xs text-muted">live project: values as they stand now</span>
            )}
            <a className="btn ml-auto" href={`${base}/export.xlsx`} download data-testid="share-export">
              Download workbook (XLSX)
            </a>
          </div>
          <nav className="-mb-px mt-2 flex flex-wrap gap-1" aria-label="Shared project">
            {tabs.map((t) => (
              <NavLink
                key={t.to}
                to={t.to}
                end={t.end}
                className={({ isActive }) => `border-b-2 px-3 py-1.5 text-sm ${isActive ? "border-copper font-medium text-ink" : "border-transparent text-muted hover:text-ink"}`}
              >
                {t.label}
              </NavLink>
            ))}
          </nav>
        </div>
      </div>
      <main className="mx-auto max-w-[1400px] px-4 py-5">
        <Outlet />
      </main>
    </div>
  );
}
