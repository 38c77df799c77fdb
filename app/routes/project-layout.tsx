import { NavLink, Outlet } from "react-router";
import type { Route } from "./+types/project-layout";
import { PROJECT_TABS } from "~/components/project-nav";
import { SignOffBanner } from "~/components/sign-off";
import { signOffStatus } from "~/services/snapshots.server";
import { describeProject } from "~/services/projects.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";
import { may, type ProjectAction } from "~/utils/permissions";
import { z } from "zod";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project, role, actor } = await requireProject(request, projectId, "read");
  const actions: ProjectAction[] = ["read", "export", "edit", "review", "comment", "manage"];
  return {
    project: describeProject(project, role),
    can: Object.fromEntries(actions.map((a) => [a, may(actor, a)])) as Record<ProjectAction, boolean>,
    signOff: await signOffStatus(project.id),
  };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.project.name ?? "Project"} · Thermotally` }];

export default function ProjectLayout({ loaderData }: Route.ComponentProps) {
  const { project, can } = loaderData;
  const base = `/projects/${project.id}`;
  return (
    <div>
      <div className="border-b border-rule bg-panel">
        <div className="mx-auto max-w-[1400px] px-4 pt-3">
          <div className="flex items-baseline gap-3">
            <h1 className="text-lg font-bold" data-testid="project-name">
              {project.name}
            </h1>
            <span className="rounded bg-steel-soft px-1.5 py-0.5 text-xs text-steel" data-testid="project-role">
              {project.role ?? "site admin"}
            </span>
            {!can.edit ? <span className="text-xs text-muted">read only</span> : null}
          </div>
          <SignOffBanner projectId={project.id} status={loaderData.signOff} />
          <nav className="-mb-px mt-2 flex flex-wrap gap-1" aria-label="Project">
            {PROJECT_TABS.filter((t) => !t.needs || can[t.needs]).map((t) => (
              <NavLink
                key={t.to}
                to={t.to ? `${base}/${t.to}` : base}
                end={!t.to}
                className={({ isActive }) =>
                  `border-b-2 px-3 py-1.5 text-sm ${isActive ? "border-copper font-medium text-ink" : "border-transparent text-muted hover:text-ink"}`
                }
              >
                {t.label}
              </NavLink>
            ))}
          </nav>
        </div>
      </div>
      <div className="mx-auto max-w-[1400px] px-4 py-5">
        <Outlet />
      </div>
    </div>
  );
}
