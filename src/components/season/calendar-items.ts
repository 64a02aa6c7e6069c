import type { EventInput } from "@fullcalendar/core";
import { JOB_KIND_LABELS, type BenchJob, type SeasonPlanView } from "../../lib/season/types.ts";
import { addDays } from "./api.ts";

// The plan turned into calendar items: events, bench jobs, projected due dates and closed shop
// days, each tagged with its kind so the calendar can draw it in Ringland's own marks.

export type ItemKind = "event" | "job" | "due";

export interface ItemProps {
  type: ItemKind;
  order: number;
  refId: number;
  label: string;
  detail: string;
  important?: boolean;
  conflicted?: boolean;
  state?: BenchJob["state"];
  pinned?: boolean;
  level?: "watch" | "act";
}

export function buildCalendarItems(plan: SeasonPlanView, canMove: boolean): EventInput[] {
  const conflictedEvents = new Set(plan.conflicts.map((c) => c.eventId).filter((id): id is number => id !== undefined));
  const items: EventInput[] = [];
  for (const ev of plan.events) {
    const engines = ev.entries.map((x) => `${x.chassisNumber}: ${x.engineName ?? "no engine"}`).join(" · ");
    const props: ItemProps = { type: "event", order: 0, refId: ev.id, label: ev.name, detail: engines, important: ev.important, conflicted: conflictedEvents.has(ev.id) };
    items.push({ id: `event-${ev.id}`, title: ev.name, start: ev.startsOn, end: addDays(ev.endsOn, 1), allDay: true, editable: false, extendedProps: props, classNames: ["rl-cal-item", "rl-cal-event"] });
  }
  for (const job of plan.jobs) {
    const kind = JOB_KIND_LABELS[job.kind].toLowerCase();
    const props: ItemProps = { type: "job", order: 1, refId: job.id, label: `${job.engineName} ${kind}`, detail: `${job.labourHoursPlanned} h`, state: job.state, pinned: job.pinned };
    items.push({
      id: `job-${job.id}`,
      title: `${job.engineName} ${kind}`,
      start: job.startsOn,
      end: addDays(job.endsOn, 1),
      allDay: true,
      startEditable: canMove && job.state === "planned",
      durationEditable: false,
      extendedProps: props,
      classNames: ["rl-cal-item", "rl-cal-job", `rl-cal-job-${job.state}`],
    });
  }
  for (const w of plan.watchPoints) {
    const props: ItemProps = { type: "due", order: 2, refId: w.engineId, label: `${w.engineName} ${w.counter}`, detail: `${w.usageAfter} of ${w.limit}`, level: w.usageAfter >= w.limit ? "act" : "watch" };
    items.push({ id: `due-${w.engineId}-${w.kind}-${w.date}`, title: `${w.engineName} ${w.counter} due`, start: w.date, allDay: true, editable: false, extendedProps: props, classNames: ["rl-cal-item", "rl-cal-due"] });
  }
  // The crew travels the day(s) before an event and the shop is shut: a drag there is refused.
  const eventDays = new Set<string>();
  for (const ev of plan.events) for (let d = ev.startsOn; d <= ev.endsOn; d = addDays(d, 1)) eventDays.add(d);
  const travel = new Set<string>();
  for (const ev of plan.events) {
    for (let i = 1; i <= plan.shop.travelDaysBeforeEvent; i++) {
      const day = addDays(ev.startsOn, -i);
      if (!eventDays.has(day) && !plan.closedDays.some((c) => c.day === day)) travel.add(day);
    }
  }
  for (const day of travel) {
    items.push({ id: `travel-${day}`, start: day, allDay: true, display: "background", title: "Travel", classNames: ["rl-cal-travel"] });
  }
  for (const d of plan.closedDays) {
    items.push({ id: `closed-${d.day}`, start: d.day, allDay: true, display: "background", title: d.reason ?? "Shop closed", classNames: ["rl-cal-closed"] });
  }
  return items;
}
