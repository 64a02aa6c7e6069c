import { describe, expect, it } from "vitest";
import { guessMapping, normaliseLabel, parseAmountCell, parseDateCell } from "../../../src/lib/motors/usage-import-parse.ts";

describe("parseDateCell", () => {
  it("reads ISO, month-first and day-first dates", () => {
    expect(parseDateCell("2026-02-07", "iso")).toBe("2026-02-07");
    expect(parseDateCell("2026/2/7", "iso")).toBe("2026-02-07");
    expect(parseDateCell("2/7/2026", "mdy")).toBe("2026-02-07");
    expect(parseDateCell("7.2.2026", "dmy")).toBe("2026-02-07");
  });

  it("refuses days that are not on the calendar and other formats", () => {
    // 2026 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
    expect(parseDateCell("2026-02-29", "iso")).toBeNull();
    expect(parseDateCell("2028-02-29", "iso")).toBe("2028-02-29");
    expect(parseDateCell("31/02/2026", "dmy")).toBeNull();
    expect(parseDateCell("13/01/2026", "mdy")).toBeNull();
    expect(parseDateCell("07-02-2026", "iso")).toBeNull();
    expect(parseDateCell("yesterday", "iso")).toBeNull();
  });
});

describe("parseAmountCell", () => {
  it("reads decimal points and decimal commas, nothing else", () => {
    expect(parseAmountCell(" 1.50 ")).toBe(1.5);
    expect(parseAmountCell("1,5")).toBe(1.5);
    expect(parseAmountCell("12")).toBe(12);
    expect(parseAmountCell("1,234.5")).toBeNull();
    expect(parseAmountCell("-1")).toBeNull();
    expect(parseAmountCell("1e3")).toBeNull();
    expect(parseAmountCell("lots")).toBeNull();
  });
});

describe("guessMapping and normaliseLabel", () => {
  it("finds the columns by their usual names, whatever the case", () => {
    expect(guessMapping(["Motor", "DATE", "Hours", "Session", "Venue"])).toEqual({ engine: "Motor", date: "DATE", amount: "Hours", session: "Session", event: "Venue", notes: null });
    expect(guessMapping(["Sled", "When", "Time"])).toBeNull();
  });

  it("treats labels that differ only in case and spacing as the same", () => {
    expect(normaliseLabel("  Heat   1 ")).toBe(normaliseLabel("heat 1"));
    expect(normaliseLabel(null)).toBe("");
  });
});
