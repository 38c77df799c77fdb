import { Link } from "react-router";
import type { ChangesSinceSignOff, SignOffStatus } from "~/services/snapshots.server";

const day = (iso: string) => iso.slice(0, 10);
const show = (v: unknown) => {
  if (v === null || v === undefined || v === "") return "—";
  const text = typeof v === "string" ? v : JSON.stringify(v);
  return text.length > 80 ? `${text.slice(0, 77)}…` : text;
};

/** The banner on project pages: last sign-off, and whether later edits have outdated it. */
export function SignOffBanner({ projectId, status }: { projectId: number; status: SignOffStatus }) {
  if (!status) return null;
  const href = `/projects/${projectId}/snapshots`;
  if (!status.outdated) {
    return (
      <p className="mt-2 text-xs text-ok" data-testid="sign-off-banner" data-outdated="0">
        Signed off by {status.signer} on {day(status.signedAt)} (<Link className="link" to={`${href}/${status.snapshotId}`}>snapshot #{status.snapshotId}</Link>); unchanged since.
      </p>
    );
  }
  return (
    <p role="status" className="mt-2 rounded-md border border-warn/40 bg-amber-50 px-3 py-1.5 text-sm text-warn" data-testid="sign-off-banner" data-outdated="1">
      Changed since sign-off: {status.changeCount} {status.changeCount === 1 ? "change" : "changes"} after snapshot #{status.snapshotId} ({status.signer}, {day(status.signedAt)}).{" "}
      <Link className="link" to={href}>See what changed</Link>
    </p>
  );
}

/** What was added, removed or changed in the live project since the last snapshot. */
export function ChangesSinceSignOffList({ changes }: { changes: ChangesSinceSignOff }) {
  if (!changes) return <p className="text-sm text-muted">The project has not been signed off yet.</p>;
  if (!changes.outdated) return <p className="text-sm text-ok">No change since snapshot #{changes.snapshot.id}.</p>;
  return (
    <table className="table" data-testid="changes-since-sign-off">
      <thead>
        <tr>
          <th>What</th>
          <th>Object</th>
          <th>Change</th>
          <th>Before → now</th>
        </tr>
      </thead>
      <tbody>
        {changes.changes.map((c) => (
          <tr key={`${c.collection}-${c.id}-${c.change}`}>
            <td className="text-muted">{c.collection}</td>
            <td>{c.label}</td>
            <td className={c.change === "removed" ? "text-bad" : c.change === "added" ? "text-ok" : "text-warn"}>{c.change}</td>
            <td className="text-xs">
              {c.fields.map((f) => (
                <div key={f.field}>
                  <span className="font-medium">{f.field}</span>: <span className="num">{show(f.before)}</span> → <span className="num">{show(f.after)}</span>
                </div>
              ))}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
