import { DomainInputError } from "../errors";
import type { IsoDay } from "./types";

// Calendar days as whole numbers (days since 1970-01-01, UTC) so the planner can index arrays
// by day and never meets time zones or daylight-saving shifts.

const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;
const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

export function parseDayNumber(field: string, value: unknown): number {
  if (typeof value !== "string") {
    throw new DomainInputError(field, `${field} must be a date written YYYY-MM-DD`);
  }
  const match = ISO_DAY.exec(value);
  if (!match) throw new DomainInputError(field, `${field} must be a date written YYYY-MM-DD`);
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  const ms = Date.UTC(year, month - 1, day);
  // Date.UTC rolls 2026-02-30 over into March; a round trip catches days that do not exist.
  if (formatDayNumber(ms / MS_PER_DAY) !== value) {
    throw new DomainInputError(field, `${field} is not a real calendar day: ${value}`);
  }
  return ms / MS_PER_DAY;
}

export function formatDayNumber(dayNumber: number): IsoDay {
  const date = new Date(dayNumber * MS_PER_DAY);
  const y = String(date.getUTCFullYear()).padStart(4, "0");
  const m = String(date.getUTCMonth() + 1).padStart(2, "0");
  const d = String(date.getUTCDate()).padStart(2, "0");
  return `${y}-${m}-${d}`;
}

/** 0 = Monday … 6 = Sunday (1970-01-01, day 0, was a Thursday). */
export function findWeekdayIndex(dayNumber: number): number {
  return (((dayNumber + 3) % 7) + 7) % 7;
}

/** "14 Feb" — short enough for a conflict sentence on a phone. */
export function formatShortDay(dayNumber: number): string {
  const date = new Date(dayNumber * MS_PER_DAY);
  return `${date.getUTCDate()} ${MONTHS[date.getUTCMonth()]}`;
}
