import type { Route } from "./+types/project-overview";
import { ChangesSinceSignOffList } from "~/components/sign-off";
import { useProject } from "~/components/use-project";
import { projectOverview } from "~/services/overview.server";
import { changesSinceSignOff } from "~/services/snapshots.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, positiveIntId } from "~/utils/http.server";
import { z } from "zod";

const paramsSchema = z.object({ projectId: positiveIntId });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  return { ...(await projectOverview(project)), changes: await changesSinceSignOff(project.id) };
}

export default function ProjectOverview({ loaderData }: Route.ComponentProps) {
  const { project } = useProject();
  return (
    <div className="grid gap-5 lg:grid-cols-[2fr_1fr]">
      <section className="card">
        <h2 className="mb-1 font-bold">About this study</h2>
        <p className="whitespace-pre-line text-muted">{project.description || "No description yet."}</p>
        <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-4">
          {loaderData.counts.map((c) => (
            <div key={c.label} className="rounded-md bg-paper px-3 py-2">
              <dt className="text-xs uppercase tracking-wide text-muted">{c.label}</dt>
              <dd className="num text-xl font-bold" data-testid={`count-${c.key}`}>
                {c.value}
              </dd>
            </div>
          ))}
        </dl>
        {loaderData.changes?.outdated ? (
          <div className="mt-4">
            <h3 className="mb-1 text-sm font-bold">Changed since the last sign-off</h3>
            <ChangesSinceSignOffList changes={loaderData.changes} />
          </div>
        ) : null}
      </section>
      <section className="card">
        <h2 className="mb-2 font-bold">Members</h2>
        <ul className="space-y-1 text-sm">
          {loaderData.members.map((m) => (
            <li key={m.id} className="flex justify-between gap-2">
              <span>{m.name}</span>
              <span className="text-muted">{m.role}</span>
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
