import { useState, type JSX } from "react";
import { JOB_KIND_LABELS, JOB_STATE_LABELS, type SeasonPlanView } from "../../lib/season/types.ts";
import { formatDay, formatRange, formatUsage } from "./api.ts";
import ItemMark, { markForJobState } from "./ItemMark.tsx";

// The season as a list by date, for a phone in the pits: events with their engines, bench jobs
// (a manager moves one by choosing a day) and projected due dates, from today on.

interface Props {
  plan: SeasonPlanView;
  canPlan: boolean;
  showPast: boolean;
  onOpenEvent: (id: number) => void;
  onOpenJob: (id: number) => void;
  onMoveJob: (id: number, startsOn: string) => Promise<boolean>;
}

interface Row {
  day: string;
  order: number;
  key: string;
  node: JSX.Element;
}

function MoveJob({ jobId, startsOn, onMove }: { jobId: number; startsOn: string; onMove: Props["onMoveJob"] }): JSX.Element {
  const [day, setDay] = useState(startsOn);
  const [busy, setBusy] = useState(false);
  return (
    <span className="mt-1 flex items-center gap-2">
      <label className="sr-only" htmlFor={`move-${jobId}`}>Move to</label>
      <input id={`move-${jobId}`} type="date" className="rl-field !w-auto !min-h-0 !py-1" value={day} onChange={(e) => setDay(e.target.value)} />
      <button
        type="button"
        className="rl-button-quiet !min-h-0 !py-1"
        disabled={busy || day === startsOn || day === ""}
        onClick={async () => {
          setBusy(true);
          if (!(await onMove(jobId, day))) setDay(startsOn);
          setBusy(false);
        }}
      >Move</button>
    </span>
  );
}

export default function SeasonList({ plan, canPlan, showPast, onOpenEvent, onOpenJob, onMoveJob }: Props): JSX.Element {
  const from = showPast ? "" : plan.today;
  const rows: Row[] = [];
  for (const ev of plan.events) {
    if (ev.endsOn < from) continue;
    rows.push({
      day: ev.startsOn,
      order: 0,
      key: `e${ev.id}`,
      node: (
        <button type="button" className="w-full text-left" onClick={() => onOpenEvent(ev.id)}>
          <span className="flex items-center gap-2 font-semibold"><ItemMark kind={ev.important ? "important" : "event"} />{ev.name}</span>
          <span className="rl-num block text-sm text-pencil">{formatRange(ev.startsOn, ev.endsOn)} · {ev.elevationM.toLocaleString("en-US")} m</span>
          <span className="rl-num block text-sm">{ev.entries.map((x) => `${x.chassisNumber}: ${x.engineName ?? "no engine"} (${formatUsage(x.expectedUsage, plan.usageUnit)})`).join(" · ") || "No chassis entered"}</span>
        </button>
      ),
    });
  }
  for (const job of plan.jobs) {
    if (job.endsOn < from || job.state === "done") continue;
    rows.push({
      day: job.startsOn,
      order: 1,
      key: `j${job.id}`,
      node: (
        <div>
          <button type="button" className="w-full text-left" onClick={() => onOpenJob(job.id)}>
            <span className="flex items-center gap-2 font-semibold"><ItemMark kind={markForJobState(job.state)} />{job.engineName} {JOB_KIND_LABELS[job.kind].toLowerCase()}{job.pinned ? <span className="text-sm font-normal text-pencil">(pinned)</span> : null}</span>
            <span className="rl-num block text-sm text-pencil">{formatRange(job.startsOn, job.endsOn)} · {job.labourHoursPlanned} h · {JOB_STATE_LABELS[job.state].toLowerCase()}</span>
          </button>
          {canPlan && job.state === "planned" ? <MoveJob jobId={job.id} startsOn={job.startsOn} onMove={onMoveJob} /> : null}
        </div>
      ),
    });
  }
  for (const w of plan.watchPoints) {
    rows.push({
      day: w.date,
      order: 2,
      key: `w${w.engineId}${w.kind}${w.date}`,
      node: (
        <span>
          <span className="flex items-center gap-2 font-semibold"><ItemMark kind="due" />{w.engineName} {w.counter} due soon</span>
          <span className="rl-num block text-sm text-pencil">{formatDay(w.date)} · {formatUsage(w.usageAfter, plan.usageUnit)} of {formatUsage(w.limit, plan.usageUnit)} after this day</span>
        </span>
      ),
    });
  }
  rows.sort((a, b) => a.day.localeCompare(b.day) || a.order - b.order || a.key.localeCompare(b.key));
  if (rows.length === 0) return <p className="text-pencil">Nothing planned from today on.</p>;
  return (
    <ol className="divide-y divide-rule border-y-hair border-rule" data-testid="season-list">
      {rows.map((r) => (
        <li key={r.key} className="flex gap-3 py-3">
          <span className="rl-num w-14 shrink-0 text-sm font-semibold leading-tight text-pencil">
            <span className="block">{formatDay(r.day).split(" ")[0]}</span>
            <span className="block whitespace-nowrap">{formatDay(r.day).split(" ").slice(1).join(" ")}</span>
          </span>
          <div className="min-w-0 flex-1">{r.node}</div>
        </li>
      ))}
    </ol>
  );
}
