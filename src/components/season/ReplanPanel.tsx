import type { JSX } from "react";
import { JOB_KIND_LABELS, type JobChange, type PlanDiff } from "../../lib/season/types.ts";
import { formatDay, formatRange } from "./api.ts";
import ItemMark from "./ItemMark.tsx";

// What a re-plan would change, shown before anything is written: engines that move between
// entries, jobs added, moved and dropped, and what still cannot be planned.

interface Props {
  diff: PlanDiff;
  busy: boolean;
  onAccept: () => void;
  onDismiss: () => void;
}

function describeJob(j: JobChange): string {
  return `${j.engineName} ${JOB_KIND_LABELS[j.kind].toLowerCase()}, ${formatRange(j.startsOn, j.endsOn)}${j.forEventName ? ` (before ${j.forEventName})` : ""}`;
}

export default function ReplanPanel({ diff, busy, onAccept, onDismiss }: Props): JSX.Element {
  return (
    <section className="border-y-hair border-ink bg-sheet px-4 py-4" aria-labelledby="replan-title" data-testid="replan-panel">
      <h2 id="replan-title">Re-plan from {formatDay(diff.today, true)}</h2>
      {diff.unchanged ? <p className="mt-2">Nothing changes: the accepted plan is already the best the planner finds.</p> : <p className="mt-2 text-pencil">Nothing is saved until you accept.</p>}
      {diff.assignments.length ? (
        <>
          <h3 className="mt-3 font-semibold">Engines on entries ({diff.assignments.length})</h3>
          <ul className="mt-1 space-y-1">
            {diff.assignments.map((a) => (
              <li key={a.entryId} className="rl-num">{a.chassisNumber} at {a.eventName} ({formatDay(a.startsOn)}): {a.from ?? "no engine"} → <strong>{a.to ?? "no engine"}</strong></li>
            ))}
          </ul>
        </>
      ) : null}
      {[
        ["Jobs added", diff.jobsAdded],
        ["Jobs moved", diff.jobsMoved],
        ["Jobs dropped", diff.jobsRemoved],
      ].map(([title, list]) =>
        (list as JobChange[]).length ? (
          <div key={title as string}>
            <h3 className="mt-3 font-semibold">{title as string} ({(list as JobChange[]).length})</h3>
            <ul className="mt-1 space-y-1">
              {(list as JobChange[]).map((j, i) => (
                <li key={i} className="rl-num">{describeJob(j)}{j.fromStartsOn ? <span className="text-pencil"> — was {formatDay(j.fromStartsOn)}</span> : null}</li>
              ))}
            </ul>
          </div>
        ) : null,
      )}
      {diff.conflicts.length ? (
        <>
          <h3 className="mt-3 font-semibold">Still not possible ({diff.conflicts.length})</h3>
          <ul className="mt-1 space-y-1">
            {diff.conflicts.map((c, i) => <li key={i} className="flex gap-2"><ItemMark kind="act" /><span>{c.message}</span></li>)}
          </ul>
        </>
      ) : null}
      <p className="rl-num mt-3 text-sm text-pencil">Rebuilds in this plan: {diff.stats.rebuildCount} (proven minimum {diff.stats.lowerBound}); inspections: {diff.stats.inspectionCount}.</p>
      <div className="mt-4 flex flex-wrap gap-2">
        <button type="button" className="rl-button" disabled={busy} onClick={onAccept}>{diff.unchanged ? "Accept anyway" : "Accept this plan"}</button>
        <button type="button" className="rl-button-quiet" disabled={busy} onClick={onDismiss}>Keep the current plan</button>
      </div>
    </section>
  );
}
