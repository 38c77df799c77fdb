import { useMemo } from "react";
import { Link } from "react-router";
import { CommentList } from "./comments";
import { DISPLAY_ENERGY_UNITS, UNIT_LABEL } from "./energy-format";
import { formatEnergyValue, reactionColumns, SAFETY_NOTE, type LedgerRow } from "./grids/reaction-columns";
import { LazyGrid } from "./grids/LazyGrid";
import { PathwayAside } from "./pathway-panels";
import { profileStatesOf, renderProfileSvg } from "./profile-svg";
import type { PathwayAnswer } from "~/services/snapshots.server";

/**
 * Read-only views of the ledger, a pathway and the audit, shared by the share-link pages and the
 * snapshot pages (live or frozen values alike). They reuse the ledger's column definitions and the
 * profile drawing, and carry no edit control.
 */

/** The unit (and protocol) switch as plain links, so it works without scripts and changes nothing. */
export function UnitLinks({ unit, hrefFor }: { unit: string; hrefFor: (unit: string) => string }) {
  return (
    <nav className="flex flex-wrap items-center gap-1 text-sm" aria-label="Energy unit">
      <span className="text-muted">Unit</span>
      {DISPLAY_ENERGY_UNITS.map((u) => (
        <Link
          key={u}
          to={hrefFor(u)}
          preventScrollReset
          className={`rounded px-2 py-0.5 ${u === unit ? "bg-steel-soft font-medium text-steel" : "text-muted hover:text-ink"}`}
          aria-current={u === unit ? "true" : undefined}
          data-testid={`unit-${u}`}
        >
          {UNIT_LABEL[u]}
        </Link>
      ))}
    </nav>
  );
}

export function ProtocolLinks({
  protocols,
  current,
  hrefFor,
}: {
  protocols: { id: number; name: string; notation?: string }[];
  current: number | null;
  hrefFor: (protocolId: number | null) => string;
}) {
  if (!protocols.length) return null;
  return (
    <nav className="flex flex-wrap items-center gap-1 text-sm" aria-label="Protocol">
      <span className="text-muted">Protocol</span>
      <Link to={hrefFor(null)} className={`rounded px-2 py-0.5 ${current === null ? "bg-steel-soft font-medium text-steel" : "text-muted hover:text-ink"}`}>
        each row&apos;s own
      </Link>
      {protocols.map((p) => (
        <Link
          key={p.id}
          to={hrefFor(p.id)}
          title={p.notation}
          className={`rounded px-2 py-0.5 ${current === p.id ? "bg-steel-soft font-medium text-steel" : "text-muted hover:text-ink"}`}
        >
          {p.name}
        </Link>
      ))}
    </nav>
  );
}

export function SafetyNote() {
  return <p className="text-xs text-muted">{SAFETY_NOTE}</p>;
}

/** The reactions ledger, read-only (the ledger's own columns, no editing). */
export function LedgerTable({ rows, unit, temperatureK }: { rows: LedgerRow[]; unit: string; temperatureK: number | null }) {
  const columnDefs = useMemo(() => reactionColumns({ unit, temperatureK }), [unit, temperatureK]);
  return (
    <div className="space-y-2">
      <LazyGrid<LedgerRow>
        height={Math.min(120 + rows.length * 42, 640)}
        testId="readonly-ledger"
        rowData={rows}
        columnDefs={columnDefs}
        getRowId={(p) => String(p.data.id)}
        defaultColDef={{ sortable: true, resizable: true, editable: false }}
        tooltipShowDelay={300}
      />
      <noscript>
        <table className="table">
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <td>{r.equation}</td>
                <td>{r.status}</td>
                <td className="num">{formatEnergyValue(r.values.deltaG, unit)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </noscript>
      <SafetyNote />
    </div>
  );
}

/**
 * A pathway's energy profile (the app's own drawing) beside its states, span and problems, read-only:
 * the same drawing and panels as the pathway page.
 */
export function PathwayProfile({ answer }: { answer: PathwayAnswer }) {
  const { quantity, states: drawn } = profileStatesOf(answer.states);
  const svg = useMemo(
    () => renderProfileSvg(drawn, { unit: answer.unit, quantity, title: answer.pathway.name, name: answer.protocol?.name ?? undefined }),
    [drawn, answer.unit, quantity, answer.pathway.name, answer.protocol?.name],
  );
  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_380px]">
      <section className="card self-start overflow-x-auto">
        <div className="w-full" data-testid="pathway-diagram" dangerouslySetInnerHTML={{ __html: svg }} />
      </section>
      <PathwayAside answer={answer} />
    </div>
  );
}

export type AuditFindingView = {
  key: string;
  severity: "error" | "warning" | "note";
  code: string;
  message: string;
  object: { type: string; id: number; label: string };
  acceptance: { acceptedBy: string; reason: string; createdAt: string } | null;
  comments: { id: number; author: string; body: string; createdAt: string }[];
};

const SEVERITY_CLASS = { error: "text-bad", warning: "text-warn", note: "text-muted" } as const;

/** The audit's findings, read-only: accepted ones stay listed, marked with who accepted them and why. */
export function AuditFindings({ findings }: { findings: AuditFindingView[] }) {
  if (!findings.length) return <p className="card text-muted">No findings.</p>;
  return (
    <ul className="space-y-2" data-testid="audit-findings">
      {findings.map((f) => (
        <li key={f.key} className="card" data-finding={f.key} data-accepted={f.acceptance ? "1" : "0"}>
          <div className="flex flex-wrap items-baseline gap-x-3">
            <span className={`text-xs font-bold uppercase ${SEVERITY_CLASS[f.severity]}`}>{f.severity}</span>
            <span className="text-sm font-medium">{f.object.label}</span>
            <span className="num text-xs text-muted">{f.code}</span>
            {f.acceptance ? (
              <span className="rounded bg-green-50 px-1.5 text-xs text-ok" title={f.acceptance.reason}>
                accepted by {f.acceptance.acceptedBy}
              </span>
            ) : null}
          </div>
          <p className="mt-1 text-sm">{f.message}</p>
          {f.acceptance ? <p className="mt-1 text-xs text-muted">Reason: {f.acceptance.reason}</p> : null}
          <CommentList comments={f.comments} />
        </li>
      ))}
    </ul>
  );
}
