import type { JSX } from "react";
import type { SeasonPlanView } from "../../lib/season/types.ts";
import ItemMark from "./ItemMark.tsx";

// What the manager must know about the plan before anything else: entries the planner could not
// serve (act), engines built for altitude entered low (watch), and what no longer holds since
// the plan was accepted.

export default function PlanNotes({ plan }: { plan: SeasonPlanView }): JSX.Element | null {
  const planned = plan.plannedAt ? `Plan accepted ${plan.plannedAt.slice(0, 10)}, planned from ${plan.plannedFrom}.` : "No plan has been accepted yet: press Re-plan.";
  const hasNotes = plan.conflicts.length || plan.warnings.length || plan.checks.length || plan.notes.length;
  return (
    <div className="mt-2 space-y-2" data-testid="plan-notes">
      <p className="rl-num text-sm text-pencil">
        {planned}
        {plan.stats ? ` ${plan.stats.assignedCount} of ${plan.stats.entryCount} entries have an engine; ${plan.stats.rebuildCount} rebuild${plan.stats.rebuildCount === 1 ? "" : "s"} (proven minimum ${plan.stats.lowerBound}).` : ""}
      </p>
      {hasNotes ? (
        <ul className="space-y-1">
          {plan.conflicts.map((c, i) => <li key={`c${i}`} className="flex gap-2" data-testid="plan-conflict"><ItemMark kind="act" /><span>{c.message}</span></li>)}
          {plan.warnings.map((w, i) => <li key={`w${i}`} className="flex gap-2"><ItemMark kind="due" /><span>{w.message}</span></li>)}
          {plan.checks.map((c, i) => <li key={`k${i}`} className="flex gap-2" data-testid="plan-check"><ItemMark kind="act" /><span>{c} Re-plan to fix it.</span></li>)}
          {plan.notes.map((n, i) => <li key={`n${i}`} className="text-sm text-pencil">{n}</li>)}
        </ul>
      ) : null}
    </div>
  );
}
