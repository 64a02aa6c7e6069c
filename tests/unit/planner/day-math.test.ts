import { describe, expect, it } from "vitest";
import { DomainInputError } from "../../../src/lib/domain/errors";
import { findWeekdayIndex, formatDayNumber, formatShortDay, parseDayNumber } from "../../../src/lib/domain/planner/day-math";

// Calendar facts from any printed calendar: 1 Jan 1970 was a Thursday, 14 Feb 2026 is a
// Saturday, 29 Feb 2000 existed (divisible by 400) and 29 Feb 2026 does not.

describe("day arithmetic", () => {
  it("numbers days from 1 Jan 1970 and back", () => {
    expect(parseDayNumber("d", "1970-01-01")).toBe(0);
    expect(parseDayNumber("d", "1970-01-02")).toBe(1);
    expect(formatDayNumber(parseDayNumber("d", "2026-02-14"))).toBe("2026-02-14");
    expect(parseDayNumber("d", "2026-03-01") - parseDayNumber("d", "2026-02-28")).toBe(1);
  });

  it("knows the weekday, Monday first", () => {
    expect(findWeekdayIndex(parseDayNumber("d", "1970-01-01"))).toBe(3);
    expect(findWeekdayIndex(parseDayNumber("d", "2026-02-14"))).toBe(5);
    expect(findWeekdayIndex(parseDayNumber("d", "2026-02-16"))).toBe(0);
    expect(findWeekdayIndex(parseDayNumber("d", "1969-12-28"))).toBe(6);
  });

  it("rejects days that do not exist, naming the field", () => {
    expect(parseDayNumber("d", "2000-02-29")).toBe(11016);
    expect(() => parseDayNumber("events[0].startDate", "2026-02-29")).toThrow(DomainInputError);
    expect(() => parseDayNumber("today", "14/02/2026")).toThrow(/today must be a date written YYYY-MM-DD/);
  });

  it("writes short days for sentences", () => {
    expect(formatShortDay(parseDayNumber("d", "2026-02-14"))).toBe("14 Feb");
  });
});
