import { addDays, eachDayOfInterval, format, getISODay, isValid, parseISO } from "date-fns";
import type { PlannerInput } from "./types";

// The checker's own view of the shop calendar, built with date-fns on local calendar dates and
// compared as 'YYYY-MM-DD' strings, so that it shares no date arithmetic with the planner.

export function isIsoDay(value: unknown): value is string {
  if (typeof value !== "string" || !/^\d{4}-\d{2}-\d{2}$/.test(value)) return false;
  const date = parseISO(value);
  return isValid(date) && format(date, "yyyy-MM-dd") === value;
}

export function shiftIsoDay(day: string, days: number): string {
  return format(addDays(parseISO(day), days), "yyyy-MM-dd");
}

export interface ShopView {
  /** Why no labour may be booked on a day, or null when the shop is open. */
  whyClosed(day: string): string | null;
  hoursOn(day: string): number;
}

export function buildShopView(input: PlannerInput): ShopView {
  const travel = input.shop.travelDaysBeforeEvent ?? 1;
  const blocked = new Map<string, string>();
  for (const event of input.events) {
    if (!isIsoDay(event.startDate) || !isIsoDay(event.endDate) || event.endDate < event.startDate) continue;
    const from = parseISO(shiftIsoDay(event.startDate, -travel));
    for (const date of eachDayOfInterval({ start: from, end: parseISO(event.endDate) })) {
      const day = format(date, "yyyy-MM-dd");
      const what = day < event.startDate ? `a travel day before ${event.name}` : `a day of ${event.name}`;
      if (!blocked.has(day) || day >= event.startDate) blocked.set(day, what);
    }
  }
  const closed = new Set(input.shop.closedDates);
  const hoursOn = (day: string): number => input.shop.hoursPerWeekday[getISODay(parseISO(day)) - 1] ?? 0;
  return {
    hoursOn,
    whyClosed(day: string): string | null {
      if (day < input.today) return "before today";
      if (blocked.has(day)) return blocked.get(day) ?? "an event day";
      if (closed.has(day)) return "a closed day";
      if (hoursOn(day) <= 0) return "a weekday without shop hours";
      return null;
    },
  };
}
