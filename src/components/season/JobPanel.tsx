import { useState, type JSX } from "react";
import { JOB_KIND_LABELS, JOB_STATE_LABELS, type BenchJob } from "../../lib/season/types.ts";
import { formatDay, formatRange } from "./api.ts";
import ItemMark, { markForJobState } from "./ItemMark.tsx";

// A bench job seen from the calendar: when, how many hours on which days, why the planner put
// it there, and (for a manager) a day picker that moves it the same way dragging does.

interface Props {
  job: BenchJob | null;
  canPlan: boolean;
  onMove: (jobId: number, startsOn: string) => Promise<boolean>;
  onClose: () => void;
}

export default function JobPanel({ job, canPlan, onMove, onClose }: Props): JSX.Element | null {
  const [day, setDay] = useState(job?.startsOn ?? "");
  const [busy, setBusy] = useState(false);
  if (!job) return null;
  return (
    <section aria-labelledby="job-title" data-testid="job-panel">
      <div className="flex items-start justify-between gap-3">
        <div>
          <p className="rl-eyebrow">{JOB_STATE_LABELS[job.state]}{job.pinned ? " · pinned by a manager" : ""}</p>
          <h2 id="job-title" className="flex items-center gap-2"><ItemMark kind={markForJobState(job.state)} />{job.engineName} {JOB_KIND_LABELS[job.kind].toLowerCase()}</h2>
          <p className="rl-num text-pencil">{formatRange(job.startsOn, job.endsOn)} · {job.labourHoursPlanned} h of labour{job.forEventName ? ` · before ${job.forEventName}` : ""}</p>
        </div>
        <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" onClick={onClose}>Close</button>
      </div>
      <ul className="rl-num mt-2 flex flex-wrap gap-x-4 text-sm">
        {Object.entries(job.hoursByDate).map(([d, h]) => <li key={d}>{formatDay(d)}: {h} h</li>)}
      </ul>
      {job.reason ? <p className="mt-2 text-sm text-pencil">{job.reason}</p> : null}
      <div className="mt-3 flex flex-wrap items-end gap-2">
        <a className="rl-button-quiet" href={`/bench?job=${job.id}`}>Open on the bench</a>
        {canPlan && job.state === "planned" ? (
          <>
            <span>
              <label className="rl-label" htmlFor="job-move">Move to</label>
              <input id="job-move" type="date" className="rl-field !w-auto" value={day} onChange={(e) => setDay(e.target.value)} />
            </span>
            <button
              type="button"
              className="rl-button"
              disabled={busy || day === job.startsOn || day === ""}
              onClick={async () => {
                setBusy(true);
                if (!(await onMove(job.id, day))) setDay(job.startsOn);
                setBusy(false);
              }}
            >Move the job</button>
          </>
        ) : null}
      </div>
    </section>
  );
}
