import { Link } from "react-router";
import type { ChangesSinceSignOff, SignOffStatus } from "~/services/snapshots.server";
import { formatEnergyValue } from "./grids/reaction-columns";

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
    <div className="space-y-3">
      <ChangedInputs changes={changes.changes} />
      <ChangedValues changes={changes.valueChanges} unit={changes.valueUnit} />
    </div>
  );
}

type Changes = NonNullable<ChangesSinceSignOff>;

function ChangedInputs({ changes }: { changes: Changes["changes"] }) {
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
        {changes.map((c) => (
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

/** Computed reaction values that moved since the sign-off (each row under its own protocol). */
function ChangedValues({ changes, unit }: { changes: Changes["valueChanges"]; unit: string }) {
  if (!changes.length) return <p className="text-xs text-muted">No computed reaction value moved.</p>;
  const show = (v: number | string | null) => (typeof v === "number" ? formatEnergyValue(v, unit) : (v ?? "—"));
  return (
    <table className="table" data-testid="values-since-sign-off">
      <thead>
        <tr>
          <th>Reaction</th>
          <th>Value</th>
          <th className="text-right">At sign-off</th>
          <th className="text-right">Now</th>
        </tr>
      </thead>
      <tbody>
        {changes.map((c) => (
          <tr key={`${c.reactionId}-${c.quantity}`}>
            <td>{c.reaction}</td>
            <td>{QUANTITY_LABEL[c.quantity] ?? c.quantity}{c.quantity === "status" ? "" : ` (${unit})`}</td>
            <td className="num text-right">{show(c.before)}</td>
            <td className="num text-right">{show(c.after)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const QUANTITY_LABEL: Record<string, string> = { deltaE: "ΔE", deltaEZPE: "Δ(E+ZPE)", deltaH: "ΔH", deltaG: "ΔG", barrierE: "ΔE‡", barrierG: "ΔG‡", status: "status" };
