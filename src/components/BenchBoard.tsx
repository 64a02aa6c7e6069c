import { useEffect, useRef, useState, type JSX } from "react";
import { JOB_KIND_LABELS, JOB_STATE_LABELS, type BenchJob, type JobState } from "../lib/season/types.ts";
import JobWork, { type Prompt } from "./bench/JobWork.tsx";
import { formatDay, formatRange } from "./season/api.ts";
import ItemMark, { markForJobState } from "./season/ItemMark.tsx";

// The bench: every job by state (planned, on the bench, done lately) as a board, or as one list
// by date; opening a job shows its checklist, parts, hours and the finish button.

interface Props {
  today: string;
  jobs: BenchJob[];
  canWork: boolean;
  canPlan: boolean;
  openJobId: number | null;
}

const COLUMNS: JobState[] = ["in_progress", "planned", "done"];

function JobCard({ job, today, active, onOpen }: { job: BenchJob; today: string; active: boolean; onOpen: () => void }): JSX.Element {
  const late = job.state === "planned" && job.startsOn < today;
  const ticked = job.checklist.filter((c) => c.done).length;
  return (
    <button type="button" onClick={onOpen} aria-current={active ? "true" : undefined} data-testid="bench-job" data-job-id={job.id}
      className={`block w-full border-l-4 px-3 py-2 text-left ${active ? "border-ink bg-sheet" : "border-transparent hover:bg-sheet"}`}>
      <span className="flex items-center gap-2 font-semibold"><ItemMark kind={markForJobState(job.state)} />{job.engineName} {JOB_KIND_LABELS[job.kind].toLowerCase()}</span>
      <span className="rl-num block text-sm text-pencil">
        {job.state === "done" && job.doneOn ? `finished ${formatDay(job.doneOn)}` : formatRange(job.startsOn, job.endsOn)} · {job.labourHoursPlanned} h{job.chassisNumber ? ` · ${job.chassisNumber}` : ""}
      </span>
      <span className="rl-num block text-sm">
        {late ? <span className="font-semibold text-oxide">late · </span> : null}checklist {ticked}/{job.checklist.length}{job.forEventName ? ` · before ${job.forEventName}` : ""}
      </span>
    </button>
  );
}

export default function BenchBoard({ today, jobs: initialJobs, canWork, canPlan, openJobId }: Props): JSX.Element {
  const [jobs, setJobs] = useState(initialJobs);
  const [view, setView] = useState<"board" | "list">("board");
  const [openId, setOpenId] = useState<number | null>(openJobId);
  const [message, setMessage] = useState("");
  const [prompt, setPrompt] = useState<Prompt | null>(null);
  const work = useRef<HTMLDivElement>(null);
  const open = jobs.find((j) => j.id === openId) ?? null;

  useEffect(() => {
    if (openId !== null) work.current?.scrollIntoView({ block: "start", behavior: "smooth" });
  }, [openId]);

  function changed(job: BenchJob, p: Prompt | null, text: string): void {
    setJobs(jobs.map((j) => (j.id === job.id ? job : j)).filter((j) => j.state !== "cancelled"));
    setMessage(text);
    if (p) setPrompt(p);
  }

  const byState = (s: JobState): BenchJob[] => jobs.filter((j) => j.state === s);
  return (
    <div data-testid="bench-board">
      <div className="flex gap-1" role="group" aria-label="View">
        <button type="button" className={view === "board" ? "rl-button !min-h-0 !py-1.5" : "rl-button-quiet !min-h-0 !py-1.5"} aria-pressed={view === "board"} onClick={() => setView("board")}>Board</button>
        <button type="button" className={view === "list" ? "rl-button !min-h-0 !py-1.5" : "rl-button-quiet !min-h-0 !py-1.5"} aria-pressed={view === "list"} onClick={() => setView("list")}>List</button>
      </div>
      <div aria-live="polite" className="mt-2">
        {message ? <p className="rl-notice" role="status">{message}</p> : null}
        {prompt ? (
          <p className="rl-notice mt-2 !border-spruce" data-testid="baseline-prompt">
            <strong>Record the new baseline</strong> for {prompt.engineName}: a fresh reading set after break-in is what every later reading is compared with.{" "}
            <a href={prompt.href} className="font-semibold">Record the new baseline</a>
          </p>
        ) : null}
      </div>
      {view === "board" ? (
        <div className="mt-3 grid gap-6 md:grid-cols-3">
          {COLUMNS.map((s) => (
            <section key={s} aria-labelledby={`col-${s}`}>
              <h2 id={`col-${s}`} className="border-b-hair border-rule pb-1 text-base font-semibold">
                {s === "done" ? "Done lately" : JOB_STATE_LABELS[s]} <span className="rl-num font-normal text-pencil">{byState(s).length}</span>
              </h2>
              {byState(s).length === 0 ? <p className="py-2 text-sm text-pencil">None.</p> : null}
              <ul className="divide-y divide-rule">
                {byState(s).map((j) => <li key={j.id}><JobCard job={j} today={today} active={j.id === openId} onOpen={() => setOpenId(j.id)} /></li>)}
              </ul>
            </section>
          ))}
        </div>
      ) : (
        <ul className="mt-3 divide-y divide-rule border-y-hair border-rule">
          {[...jobs].sort((a, b) => a.startsOn.localeCompare(b.startsOn) || a.id - b.id).map((j) => (
            <li key={j.id} className="flex items-center gap-3">
              <span className="rl-num w-20 shrink-0 text-sm text-pencil">{JOB_STATE_LABELS[j.state]}</span>
              <div className="min-w-0 flex-1"><JobCard job={j} today={today} active={j.id === openId} onOpen={() => setOpenId(j.id)} /></div>
            </li>
          ))}
        </ul>
      )}
      <div ref={work} className="mt-6 border-t-hair border-ink pt-4">
        {open ? (
          <JobWork key={`${open.id}-${open.state}`} job={open} today={today} canWork={canWork} canPlan={canPlan} onChanged={changed} />
        ) : (
          <p className="text-pencil">Open a job to see its checklist, parts and hours.</p>
        )}
      </div>
    </div>
  );
}
