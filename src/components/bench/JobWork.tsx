import { useEffect, useState, type JSX } from "react";
import { MEASURING_CAUTIONS } from "../../lib/domain/cautions.ts";
import { JOB_KIND_LABELS, JOB_STATE_LABELS, type BenchJob, type ChecklistItem } from "../../lib/season/types.ts";
import { callApi, formatDay, formatRange } from "../season/api.ts";
import ItemMark, { markForJobState } from "../season/ItemMark.tsx";

// One job on the bench: start it, tick the checklist, write down the parts and the hours,
// finish it (which renews the engine's counters) and go take the new baseline readings.

interface ShelfPart {
  id: number;
  serial: string;
  kind: string;
  engineName: string | null;
}

interface PartLine {
  partId: number | null;
  description: string;
  quantity: number;
}

export interface Prompt {
  engineId: number;
  engineName: string;
  href: string;
}

interface Props {
  job: BenchJob;
  today: string;
  canWork: boolean;
  canPlan: boolean;
  onChanged: (job: BenchJob, prompt: Prompt | null, message: string) => void;
}


export default function JobWork({ job, today, canWork, canPlan, onChanged }: Props): JSX.Element {
  const [checklist, setChecklist] = useState<ChecklistItem[]>(job.checklist);
  const [parts, setParts] = useState<PartLine[]>(job.parts.map((p) => ({ partId: p.partId, description: p.description, quantity: p.quantity })));
  const [hours, setHours] = useState(job.labourHoursActual === null ? "" : String(job.labourHoursActual));
  const [notes, setNotes] = useState(job.notes ?? "");
  const [doneOn, setDoneOn] = useState(today);
  const [shelf, setShelf] = useState<ShelfPart[]>([]);
  const [error, setError] = useState<{ message: string; fields?: Record<string, string> } | null>(null);
  const [busy, setBusy] = useState(false);
  const editable = canWork && (job.state === "planned" || job.state === "in_progress");

  useEffect(() => {
    if (!editable) return;
    void Promise.all([
      callApi<{ parts: ShelfPart[] }>("GET", "/api/v1/parts?onShelf=true&perPage=100"),
      callApi<{ parts: ShelfPart[] }>("GET", `/api/v1/parts?engineId=${job.engineId}&perPage=100`),
    ]).then(([a, b]) => setShelf([...(a.ok ? a.body.parts : []), ...(b.ok ? b.body.parts : [])]));
  }, [editable, job.engineId]);

  async function save(patch: Record<string, unknown>, message: string): Promise<void> {
    setBusy(true);
    const answer = await callApi<{ job: BenchJob; baselinePrompt: Prompt | null }>("PATCH", `/api/v1/jobs/${job.id}`, patch);
    setBusy(false);
    if (!answer.ok) return setError({ message: answer.message, fields: answer.fields });
    setError(null);
    onChanged(answer.body.job, answer.body.baselinePrompt, message);
  }

  function record(extra: Record<string, unknown>): Record<string, unknown> {
    const labour = hours.trim() === "" ? null : Number(hours.replace(",", "."));
    return { checklist, parts: parts.filter((p) => p.description.trim() !== ""), labourHoursActual: labour, notes: notes.trim() === "" ? null : notes, ...extra };
  }

  const ticked = checklist.filter((c) => c.done).length;
  return (
    <section aria-labelledby="work-title" data-testid="job-work" id="work">
      <p className="rl-eyebrow">{JOB_STATE_LABELS[job.state]}{job.pinned ? " · pinned" : ""}</p>
      <h2 id="work-title" className="flex items-center gap-2"><ItemMark kind={markForJobState(job.state)} />{job.engineName} {JOB_KIND_LABELS[job.kind].toLowerCase()}</h2>
      <p className="rl-num text-pencil">
        {formatRange(job.startsOn, job.endsOn)} · {job.labourHoursPlanned} h planned{job.chassisNumber ? ` · in ${job.chassisNumber}` : ""}{job.forEventName ? ` · before ${job.forEventName}` : ""}
      </p>
      {job.assignedTo ? <p className="text-sm">Worked by {job.assignedTo.name}</p> : null}
      {job.doneBy ? <p className="text-sm">Finished {job.doneOn ? formatDay(job.doneOn, true) : ""} by {job.doneBy.name}</p> : null}
      {job.reason ? <p className="mt-1 text-sm text-pencil">{job.reason}</p> : null}

      <div className="rl-caution mt-3">
        <ul className="list-disc pl-5">{MEASURING_CAUTIONS.map((m) => <li key={m}>{m}</li>)}</ul>
      </div>

      <fieldset className="mt-4" disabled={!editable}>
        <legend className="font-semibold">Checklist <span className="rl-num text-sm font-normal text-pencil">{ticked} of {checklist.length}</span></legend>
        <ul className="mt-1 divide-y divide-rule border-y-hair border-rule">
          {checklist.map((c, i) => (
            <li key={i}>
              <label className="flex min-h-[2.75rem] items-center gap-3 py-1.5">
                <input type="checkbox" className="h-5 w-5 shrink-0 accent-current" checked={c.done} onChange={(e) => setChecklist(checklist.map((x, j) => (j === i ? { ...x, done: e.target.checked } : x)))} />
                <span className={c.done ? "text-pencil line-through" : ""}>{c.item}</span>
              </label>
            </li>
          ))}
        </ul>
      </fieldset>

      <fieldset className="mt-4" disabled={!editable}>
        <legend className="font-semibold">Parts used</legend>
        {parts.map((p, i) => (
          <div key={i} className="mt-2 grid grid-cols-[1fr_4.5rem_auto] gap-2 sm:grid-cols-[12rem_1fr_5rem_auto]">
            <select aria-label="Part from the records" className="rl-field col-span-3 sm:col-span-1" value={p.partId ?? ""} onChange={(e) => {
              const id = e.target.value === "" ? null : Number(e.target.value);
              const part = shelf.find((s) => s.id === id);
              setParts(parts.map((x, j) => (j === i ? { ...x, partId: id, description: x.description || (part ? `${part.kind} ${part.serial}` : "") } : x)));
            }}>
              <option value="">Not a recorded part</option>
              {shelf.map((s) => <option key={s.id} value={s.id}>{s.kind} {s.serial}{s.engineName ? ` (in ${s.engineName})` : " (shelf)"}</option>)}
            </select>
            <input aria-label="Description" className="rl-field" value={p.description} maxLength={200} onChange={(e) => setParts(parts.map((x, j) => (j === i ? { ...x, description: e.target.value } : x)))} placeholder="Piston kit, 72.00 mm" />
            <input aria-label="Quantity" className="rl-field rl-num" inputMode="numeric" value={String(p.quantity)} onChange={(e) => setParts(parts.map((x, j) => (j === i ? { ...x, quantity: Math.max(1, Math.min(100, Number(e.target.value) || 1)) } : x)))} />
            <button type="button" className="rl-button-quiet" aria-label="Remove this part" onClick={() => setParts(parts.filter((_, j) => j !== i))}>×</button>
            {error?.fields?.[`parts.${i}.partId`] ? <p className="rl-error col-span-full">{error.fields[`parts.${i}.partId`]}</p> : null}
          </div>
        ))}
        {editable ? <button type="button" className="rl-button-quiet mt-2" onClick={() => setParts([...parts, { partId: null, description: "", quantity: 1 }])}>Add a part</button> : null}
      </fieldset>

      <div className="mt-4 grid gap-3 sm:grid-cols-2">
        <div>
          <label className="rl-label" htmlFor="labour">Labour, hours</label>
          <input id="labour" className="rl-field rl-num" inputMode="decimal" value={hours} disabled={!editable} onChange={(e) => setHours(e.target.value)} />
          {error?.fields?.labourHoursActual ? <p className="rl-error">{error.fields.labourHoursActual}</p> : null}
        </div>
        {editable ? (
          <div>
            <label className="rl-label" htmlFor="done-on">Finished on</label>
            <input id="done-on" type="date" className="rl-field" max={today} value={doneOn} onChange={(e) => setDoneOn(e.target.value)} />
            {error?.fields?.doneOn ? <p className="rl-error">{error.fields.doneOn}</p> : null}
          </div>
        ) : null}
        <div className="sm:col-span-2">
          <label className="rl-label" htmlFor="job-notes">Notes</label>
          <textarea id="job-notes" className="rl-field" rows={3} maxLength={4000} value={notes} disabled={!editable} onChange={(e) => setNotes(e.target.value)} />
        </div>
      </div>
      {error ? <p className="rl-error" role="alert">{error.message}</p> : null}
      {editable ? (
        <div className="mt-4 flex flex-wrap gap-2">
          <button type="button" className="rl-button-quiet" disabled={busy} onClick={() => void save(record({}), "Saved.")}>Save</button>
          {job.state === "planned" ? <button type="button" className="rl-button" disabled={busy} onClick={() => void save(record({ state: "in_progress" }), "Started: the job is on the bench.")}>Start the job</button> : null}
          {job.state === "in_progress" ? <button type="button" className="rl-button-quiet" disabled={busy} onClick={() => void save(record({ state: "planned" }), "Put back to planned.")}>Put back</button> : null}
          <button type="button" className="rl-button" disabled={busy} onClick={() => void save(record({ state: "done", doneOn }), "Finished: the engine's counters are renewed.")} data-testid="finish-job">Finish the job</button>
          {canPlan && job.state === "planned" ? <button type="button" className="rl-button-quiet" disabled={busy} onClick={() => void save({ state: "cancelled" }, "Cancelled.")}>Cancel the job</button> : null}
        </div>
      ) : null}
    </section>
  );
}
