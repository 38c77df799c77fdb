import { Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/project-history";
import { listHistory } from "~/services/history.server";
import { listMembers } from "~/services/projects.server";
import { requireProject } from "~/utils/guards.server";
import { parseParams, parseSearchParams, positiveIntId } from "~/utils/http.server";

const paramsSchema = z.object({ projectId: positiveIntId });
const querySchema = z.object({
  objectType: z.string().max(40).optional().transform((v) => v || undefined),
  objectId: z.union([z.literal(""), positiveIntId]).optional().transform((v) => (v ? Number(v) : undefined)),
  userId: z.union([z.literal(""), positiveIntId]).optional().transform((v) => (v ? Number(v) : undefined)),
  before: z.union([z.literal(""), positiveIntId]).optional().transform((v) => (v ? Number(v) : undefined)),
});

const PAGE_SIZE = 200;

export async function loader({ request, params }: Route.LoaderArgs) {
  const { projectId } = parseParams(params, paramsSchema);
  const { project } = await requireProject(request, projectId, "read");
  const filter = parseSearchParams(request.url, querySchema);
  const [entries, members] = await Promise.all([listHistory(project.id, { ...filter, limit: PAGE_SIZE }), listMembers(project.id)]);
  // Older entries page by id; the link carries the filter along.
  const last = entries.at(-1);
  const older = entries.length === PAGE_SIZE && last ? olderHref(request.url, last.id) : null;
  return { entries, members, filter, older };
}

function olderHref(url: string, beforeId: number): string {
  const u = new URL(url);
  u.searchParams.set("before", String(beforeId));
  return `${u.pathname}?${u.searchParams.toString()}`;
}

const OBJECT_TYPES = ["project", "membership", "species", "conformer", "level", "calculation", "protocol", "reaction", "pathway", "import", "snapshot", "share-link", "comment", "invitation"];

export default function History({ loaderData }: Route.ComponentProps) {
  const { entries, members, filter, older } = loaderData;
  return (
    <section className="card">
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <h2 className="mr-auto font-bold">Change log</h2>
        <Form method="get" className="flex items-end gap-2">
          <label className="text-sm">
            <span className="label">Object</span>
            <select name="objectType" defaultValue={filter.objectType ?? ""} className="input">
              <option value="">all</option>
              {OBJECT_TYPES.map((t) => (
                <option key={t} value={t}>
                  {t}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm">
            <span className="label">Person</span>
            <select name="userId" defaultValue={filter.userId ? String(filter.userId) : ""} className="input">
              <option value="">everyone</option>
              {members.map((m) => (
                <option key={m.userId} value={m.userId}>
                  {m.name}
                </option>
              ))}
            </select>
          </label>
          <button className="btn" type="submit">
            Filter
          </button>
        </Form>
      </div>
      {filter.objectId && filter.objectType ? (
        <p className="mb-2 text-sm" data-testid="history-object">
          Changes of {filter.objectType} #{filter.objectId} only.{" "}
          <Link className="link" to={`?objectType=${encodeURIComponent(filter.objectType)}`}>
            Every {filter.objectType}
          </Link>
        </p>
      ) : null}
      {entries.length === 0 ? (
        <p className="text-muted">No changes recorded for this filter.</p>
      ) : (
        <table className="table">
          <thead>
            <tr>
              <th>When (UTC)</th>
              <th>Who</th>
              <th>What</th>
              <th>Change</th>
              <th>Old → new</th>
            </tr>
          </thead>
          <tbody>
            {entries.map((e) => (
              <tr key={e.id}>
                <td className="num whitespace-nowrap text-muted">{e.at.replace("T", " ").slice(0, 19)}</td>
                <td className="whitespace-nowrap">{e.actor.replace(/ <.*>$/, "")}</td>
                <td className="whitespace-nowrap">
                  {e.action}{" "}
                  {e.objectId ? (
                    <Link className="link" to={`?objectType=${encodeURIComponent(e.objectType)}&objectId=${e.objectId}`} title={`Every change of this ${e.objectType}`}>
                      {e.objectType} #{e.objectId}
                    </Link>
                  ) : (
                    e.objectType
                  )}
                </td>
                <td>{e.summary}</td>
                <td className="max-w-md">
                  <details>
                    <summary className="cursor-pointer text-xs text-steel">values</summary>
                    <pre className="mt-1 max-h-48 overflow-auto whitespace-pre-wrap break-all text-[11px] text-muted">
                      {e.oldValues ? `old: ${JSON.stringify(e.oldValues)}\n` : ""}
                      {e.newValues ? `new: ${JSON.stringify(e.newValues)}` : ""}
                    </pre>
                  </details>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <div className="mt-3 flex gap-4 text-sm">
        {filter.before ? <Link className="link" to="?">Newest changes</Link> : null}
        {older ? <Link className="link" to={older}>Older changes</Link> : null}
      </div>
    </section>
  );
}
