import type { EventClickArg, EventContentArg, EventDropArg } from "@fullcalendar/core";
import dayGridPlugin from "@fullcalendar/daygrid";
import interactionPlugin from "@fullcalendar/interaction";
import FullCalendar from "@fullcalendar/react";
import { useEffect, useMemo, useRef, useState, type JSX } from "react";
import type { PlanDiff, SeasonPlanView } from "../lib/season/types.ts";
import { callApi } from "./season/api.ts";
import { buildCalendarItems, type ItemProps } from "./season/calendar-items.ts";
import CalendarLink from "./season/CalendarLink.tsx";
import EventPanel from "./season/EventPanel.tsx";
import ItemMark, { markForJobState } from "./season/ItemMark.tsx";
import JobPanel from "./season/JobPanel.tsx";
import PlanNotes from "./season/PlanNotes.tsx";
import ReplanPanel from "./season/ReplanPanel.tsx";
import SeasonList from "./season/SeasonList.tsx";

// The season on a calendar: events, bench jobs and projected due dates in Ringland's marks.
// A manager drags a job to another day (the server re-checks and re-plans, or refuses with the
// reason) and previews a re-plan before accepting it; anyone opens an event for its engines and
// fuel check. Phones get the same season as a list by date.

interface Props {
  initialPlan: SeasonPlanView;
  canPlan: boolean;
  canDecideFuel: boolean;
  openEventId: number | null;
  openJobId: number | null;
}

type Selected = { type: "event"; id: number } | { type: "job"; id: number } | null;
type Status = { tone: "ok" | "refused" | "working"; text: string } | null;

function renderItem(arg: EventContentArg): JSX.Element {
  const p = arg.event.extendedProps as ItemProps;
  if (!p.type) return <span className="rl-cal-closed-label">{arg.event.title}</span>;
  const mark = p.type === "event" ? (p.conflicted ? "act" : p.important ? "important" : "event") : p.type === "job" ? markForJobState(p.state ?? "planned") : p.level === "act" ? "act" : "due";
  return (
    <span className="rl-cal-chip" data-kind={p.type} data-ref={p.refId} data-state={p.state ?? ""} title={`${p.label} · ${p.detail}`}>
      <ItemMark kind={mark} size={12} title={false} />
      <span className="rl-cal-chip-text">
        {p.label}
        {p.type === "event" && p.detail ? <span className="rl-cal-chip-detail"> · {p.detail}</span> : null}
      </span>
      {p.pinned ? <span className="rl-cal-chip-pin">pinned</span> : null}
    </span>
  );
}

export default function SeasonCalendar({ initialPlan, canPlan, canDecideFuel, openEventId, openJobId }: Props): JSX.Element {
  const [plan, setPlan] = useState(initialPlan);
  const [view, setView] = useState<"month" | "list">("month");
  const [title, setTitle] = useState("");
  const [status, setStatus] = useState<Status>(null);
  const [selected, setSelected] = useState<Selected>(openEventId ? { type: "event", id: openEventId } : openJobId ? { type: "job", id: openJobId } : null);
  const [diff, setDiff] = useState<PlanDiff | null>(null);
  const [busy, setBusy] = useState(false);
  const [version, setVersion] = useState(0);
  const [showPast, setShowPast] = useState(false);
  const calendar = useRef<FullCalendar>(null);
  const panel = useRef<HTMLDivElement>(null);
  const items = useMemo(() => buildCalendarItems(plan, canPlan), [plan, canPlan]);

  useEffect(() => {
    if (window.matchMedia("(max-width: 639px)").matches) setView("list");
  }, []);
  useEffect(() => {
    if (selected) panel.current?.scrollIntoView({ block: "nearest", behavior: "smooth" });
  }, [selected]);

  async function reload(message: Status): Promise<void> {
    const answer = await callApi<SeasonPlanView>("GET", "/api/v1/plan");
    if (answer.ok) setPlan(answer.body);
    setVersion((v) => v + 1);
    setStatus(message);
  }

  async function moveJob(jobId: number, startsOn: string): Promise<boolean> {
    setStatus({ tone: "working", text: "Asking the planner…" });
    const answer = await callApi<{ diff: PlanDiff }>("POST", `/api/v1/jobs/${jobId}`, { startsOn });
    if (!answer.ok) {
      setStatus({ tone: "refused", text: `Not moved: ${answer.message}` });
      return false;
    }
    const d = answer.body.diff;
    const knock = d.assignments.length + d.jobsAdded.length + d.jobsRemoved.length + Math.max(0, d.jobsMoved.length - 1);
    await reload({ tone: "ok", text: `Moved. The planner re-checked the season${knock ? ` and changed ${knock} other thing${knock === 1 ? "" : "s"} around it` : "; nothing else had to change"}.` });
    return true;
  }

  async function onDrop(info: EventDropArg): Promise<void> {
    const p = info.event.extendedProps as ItemProps;
    if (p.type !== "job" || !info.event.startStr) return info.revert();
    if (!(await moveJob(p.refId, info.event.startStr.slice(0, 10)))) info.revert();
  }

  function onClick(info: EventClickArg): void {
    const p = info.event.extendedProps as ItemProps;
    if (p.type === "event") setSelected({ type: "event", id: p.refId });
    else if (p.type === "job") setSelected({ type: "job", id: p.refId });
  }

  async function previewReplan(): Promise<void> {
    setBusy(true);
    setStatus({ tone: "working", text: "Planning the season from today…" });
    const answer = await callApi<{ diff: PlanDiff }>("POST", "/api/v1/plan", { accept: false });
    setBusy(false);
    if (!answer.ok) return setStatus({ tone: "refused", text: answer.message });
    setStatus(null);
    setDiff(answer.body.diff);
  }

  async function acceptReplan(): Promise<void> {
    if (!diff) return;
    setBusy(true);
    const answer = await callApi<{ diff: PlanDiff }>("POST", "/api/v1/plan", { accept: true, basis: diff.basis });
    setBusy(false);
    if (!answer.ok) {
      setStatus({ tone: "refused", text: answer.message });
      if (answer.status === 409) void previewReplan();
      return;
    }
    setDiff(null);
    await reload({ tone: "ok", text: "The new plan is accepted." });
  }

  const api = (): ReturnType<FullCalendar["getApi"]> | undefined => calendar.current?.getApi();
  return (
    <div className="rl-season" data-testid="season-calendar">
      <div className="flex flex-wrap items-center gap-2">
        <div className="flex gap-1" role="group" aria-label="View">
          <button type="button" className={view === "month" ? "rl-button !min-h-0 !py-1.5" : "rl-button-quiet !min-h-0 !py-1.5"} aria-pressed={view === "month"} onClick={() => setView("month")}>Month</button>
          <button type="button" className={view === "list" ? "rl-button !min-h-0 !py-1.5" : "rl-button-quiet !min-h-0 !py-1.5"} aria-pressed={view === "list"} onClick={() => setView("list")}>List</button>
        </div>
        {view === "month" ? (
          <div className="flex items-center gap-1">
            <button type="button" className="rl-button-quiet !min-h-0 !px-3 !py-1.5" aria-label="Previous month" onClick={() => api()?.prev()}>‹</button>
            <button type="button" className="rl-button-quiet !min-h-0 !py-1.5" onClick={() => api()?.gotoDate(plan.today)}>Today</button>
            <button type="button" className="rl-button-quiet !min-h-0 !px-3 !py-1.5" aria-label="Next month" onClick={() => api()?.next()}>›</button>
            <span className="ml-2 text-lg font-semibold" aria-live="polite" data-testid="calendar-title">{title}</span>
          </div>
        ) : (
          <label className="flex items-center gap-2 text-sm"><input type="checkbox" checked={showPast} onChange={(e) => setShowPast(e.target.checked)} /> Show past events</label>
        )}
        {canPlan ? <button type="button" className="rl-button-quiet !min-h-0 !py-1.5 sm:ml-auto" disabled={busy} onClick={() => void previewReplan()} data-testid="replan">Re-plan</button> : null}
      </div>
      <div className="mt-2 min-h-[1.5rem]" aria-live="polite">
        {status ? (
          <p className={status.tone === "refused" ? "rl-caution !text-base font-semibold" : status.tone === "ok" ? "rl-notice" : "text-pencil"} role={status.tone === "refused" ? "alert" : "status"} data-testid="season-status">{status.text}</p>
        ) : null}
      </div>
      {diff ? <ReplanPanel diff={diff} busy={busy} onAccept={() => void acceptReplan()} onDismiss={() => setDiff(null)} /> : null}
      <PlanNotes plan={plan} />
      <div className="mt-3">
        {view === "month" ? (
          <FullCalendar
            ref={calendar}
            plugins={[dayGridPlugin, interactionPlugin]}
            initialView="dayGridMonth"
            initialDate={plan.today}
            headerToolbar={false}
            firstDay={1}
            height="auto"
            fixedWeekCount={false}
            events={items}
            eventOrder="order,title"
            eventContent={renderItem}
            eventClick={onClick}
            eventDrop={(info) => void onDrop(info)}
            editable={canPlan}
            eventDurationEditable={false}
            datesSet={(arg) => setTitle(arg.view.title)}
            dayMaxEvents={false}
            now={plan.today}
          />
        ) : (
          <SeasonList plan={plan} canPlan={canPlan} showPast={showPast} onOpenEvent={(id) => setSelected({ type: "event", id })} onOpenJob={(id) => setSelected({ type: "job", id })} onMoveJob={moveJob} />
        )}
      </div>
      <Legend />
      <div ref={panel} className="mt-4">
        {selected?.type === "event" ? (
          <EventPanel
            eventId={selected.id}
            today={plan.today}
            engines={plan.engines}
            canPlan={canPlan}
            canDecideFuel={canDecideFuel}
            version={version}
            onPlanChanged={(text) => void reload({ tone: "ok", text })}
            onClose={() => setSelected(null)}
          />
        ) : selected?.type === "job" ? (
          <JobPanel key={selected.id} job={plan.jobs.find((j) => j.id === selected.id) ?? null} canPlan={canPlan} onMove={moveJob} onClose={() => setSelected(null)} />
        ) : null}
      </div>
      <CalendarLink />
    </div>
  );
}

function Legend(): JSX.Element {
  const marks: [Parameters<typeof ItemMark>[0]["kind"], string][] = [
    ["event", "event"],
    ["important", "important event"],
    ["job-planned", "planned job"],
    ["job-in_progress", "on the bench"],
    ["due", "due soon (projected)"],
    ["act", "conflict"],
  ];
  return (
    <ul className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-sm text-pencil" aria-label="What the marks mean">
      {marks.map(([kind, text]) => (
        <li key={kind} className="flex items-center gap-1.5"><ItemMark kind={kind} title={false} />{text}</li>
      ))}
      <li className="flex items-center gap-1.5"><span className="rl-cal-closed-swatch" aria-hidden="true" />shop closed</li>
      <li className="flex items-center gap-1.5"><span className="rl-cal-travel-swatch" aria-hidden="true" />travel day</li>
    </ul>
  );
}
