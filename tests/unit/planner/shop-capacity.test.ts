import { describe, expect, it } from "vitest";
import { parseDayNumber } from "../../../src/lib/domain/planner/day-math";
import { normalizePlannerInput } from "../../../src/lib/domain/planner/normalize-input";
import { bookEarliest, buildShopDays, describeDayBlock, shiftLatest, sumFreeCenti } from "../../../src/lib/domain/planner/shop-capacity";
import { makeEngine, makeEvent, makeInput, makeShop } from "./season-builders";

// Shop hours in centi-hours: 2 Feb 2026 is a Monday, 7–8 Feb the event, 6 Feb its travel day.

const day = (iso: string): number => parseDayNumber("d", iso);

function buildShop(): ReturnType<typeof buildShopDays> {
  return buildShopDays(
    normalizePlannerInput(
      makeInput({
        engines: [makeEngine("E1")],
        events: [makeEvent("V1", "2026-02-07", "2026-02-08", [["#1", 1]], { name: "Birchmoor" })],
        shop: makeShop({ hoursPerWeekday: [3, 3, 3, 3, 3, 0, 0], closedDates: ["2026-02-04"] }),
      }),
    ),
  );
}

describe("shop capacity", () => {
  it("blocks closed days, weekends, the event and its travel day", () => {
    const shop = buildShop();
    expect(describeDayBlock(shop, day("2026-02-02"))).toBe("open");
    expect(describeDayBlock(shop, day("2026-02-04"))).toBe("closed");
    expect(describeDayBlock(shop, day("2026-02-06"))).toBe("travel");
    expect(describeDayBlock(shop, day("2026-02-07"))).toBe("event");
    expect(describeDayBlock(shop, day("2026-02-15"))).toBe("noHours");
    expect(describeDayBlock(shop, day("2026-02-01"))).toBe("past");
    // Mon 2, Tue 3, Thu 5 open: 9 h; the next week Mon–Fri: 15 h.
    expect(sumFreeCenti(shop, day("2026-02-02"), day("2026-02-08"))).toBe(900);
    expect(sumFreeCenti(shop, day("2026-02-09"), day("2026-02-15"))).toBe(1500);
  });

  it("books earliest first across days and then slides the job as late as it may go", () => {
    const shop = buildShop();
    const booked = bookEarliest(shop, day("2026-02-02"), day("2026-02-13"), 700);
    expect(booked).toEqual([
      { day: day("2026-02-02"), centi: 300 },
      { day: day("2026-02-03"), centi: 300 },
      { day: day("2026-02-05"), centi: 100 },
    ]);
    expect(bookEarliest(shop, day("2026-02-02"), day("2026-02-05"), 300)).toBeNull();
    const moved = shiftLatest(shop, booked ?? [], day("2026-02-02"), day("2026-02-13"));
    expect(moved).toEqual([
      { day: day("2026-02-11"), centi: 100 },
      { day: day("2026-02-12"), centi: 300 },
      { day: day("2026-02-13"), centi: 300 },
    ]);
    expect(sumFreeCenti(shop, day("2026-02-02"), day("2026-02-13"))).toBe(2400 - 700);
  });
});
