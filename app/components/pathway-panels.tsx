import type { PathwayAnswer } from "~/services/snapshots.server";
import { formatEnergyValue, formatScientific, SAFETY_NOTE } from "./grids/reaction-columns";

/**
 * The panels beside a pathway's energy profile: its states with their relative values and barriers,
 * the energetic span of a cycle, and the problems. The pathway page, the share view and the snapshot
 * page show the same answer, live or frozen, through these.
 */
export function PathwayAside({ answer }: { answer: PathwayAnswer }) {
  return (
    <aside className="grid content-start gap-4">
      <section className="card text-sm">
        <table className="table" data-testid="state-table">
          <thead>
            <tr>
              <th>State</th>
              <th className="text-right">ΔE</th>
              <th className="text-right">ΔH ⚠</th>
              <th className="text-right">ΔG</th>
              <th className="text-right">barrier</th>
            </tr>
          </thead>
          <tbody>
            {answer.states.map((s, i) => (
              <tr key={`${s.label}-${i}`}>
                <td>{s.label}{s.kind === "transition-state" ? <span className="text-copper"> ‡</span> : null}</td>
                <td className="num text-right">{formatEnergyValue(s.relativeE, answer.unit)}</td>
                <td className="num text-right">{formatEnergyValue(s.relativeH, answer.unit)}</td>
                <td className="num text-right">{formatEnergyValue(s.relativeG, answer.unit)}</td>
                <td className="num text-right" title={s.barrier ? `against ${s.barrier.from} (${s.barrier.basis})` : undefined}>{s.barrier ? formatEnergyValue(s.barrier.value, answer.unit) : ""}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="mt-1 text-xs text-muted">In {answer.unit}. Barriers against the lowest preceding state.</p>
      </section>
      {answer.pathway.cycle ? <EnergeticSpan answer={answer} /> : null}
      <p className="text-xs text-muted">⚠ {SAFETY_NOTE}</p>
      {answer.problems.length ? (
        <section className="card text-sm">
          <h3 className="mb-1 font-bold">Problems</h3>
          <ul className="list-disc pl-5">
            {answer.problems.map((p, i) => <li key={i} className={p.severity === "warning" ? "text-warn" : "text-bad"}>{p.message}</li>)}
          </ul>
        </section>
      ) : null}
    </aside>
  );
}

function EnergeticSpan({ answer }: { answer: PathwayAnswer }) {
  const span = answer.energeticSpan;
  return (
    <section className="card text-sm" data-testid="span">
      <h3 className="mb-1 font-bold">Energetic span</h3>
      {span ? (
        <>
          <dl className="grid grid-cols-2 gap-1">
            <dt className="text-muted">δE</dt><dd className="num">{formatEnergyValue(span.deltaE, answer.unit)} {answer.unit}</dd>
            <dt className="text-muted">TOF-determining TS</dt><dd>{span.tdts}</dd>
            <dt className="text-muted">TOF-determining intermediate</dt><dd>{span.tdi}</dd>
            <dt className="text-muted">TOF ⚠</dt><dd className="num">{formatScientific(span.tof)} s⁻¹</dd>
            <dt className="text-muted">ΔG of one turnover</dt><dd className="num">{formatEnergyValue(span.reactionEnergy, answer.unit)} {answer.unit}</dd>
          </dl>
          <p className="mt-2 text-xs text-muted">{span.basis}</p>
          {answer.degreeOfTofControl ? (
            <table className="table mt-2">
              <thead><tr><th>State</th><th className="text-right">degree of TOF control</th></tr></thead>
              <tbody>
                {Object.entries(answer.degreeOfTofControl).map(([k, v]) => (
                  <tr key={k}><td>{k}</td><td className="num text-right">{v.toFixed(3)}</td></tr>
                ))}
              </tbody>
            </table>
          ) : null}
        </>
      ) : (
        <p className="text-muted">Not computed: every state needs a free energy (see the problems).</p>
      )}
    </section>
  );
}
