import { describe, expect, it } from "vitest";
import { checkPlan } from "../../../src/lib/domain/planner/check-plan";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import type { PlannerInput } from "../../../src/lib/domain/planner/types";
import { makeEngine, makeEvent, makeInput, makeShop } from "./season-builders";

// Conflicts name the numbers behind them; pins hold or say why not. 9 Feb 2026 is a Monday and
// 14 Feb a Saturday (any 2026 calendar).

function planAndCheck(input: PlannerInput): ReturnType<typeof planRebuilds> {
  const plan = planRebuilds(input);
  expect(checkPlan(input, plan)).toEqual([]);
  return plan;
}

describe("conflicts", () => {
  it("says which entry cannot run, and how short the shop is", () => {
    // One engine with 0.5 h left; #114 needs 1.5 h on Sat 14 Feb. The shop has 1 h on Mon,
    // Tue and Wed (3 h), none on Thu, and Fri 13 is the travel day; the top end needs 4 h.
    const plan = planAndCheck(
      makeInput({
        today: "2026-02-09",
        engines: [makeEngine("A-2", { top: 7.5, chassisId: "#114" })],
        events: [makeEvent("V7", "2026-02-14", "2026-02-15", [["#114", 1.5]], { name: "Harlow Lake II" })],
        shop: makeShop({ hoursPerWeekday: [1, 1, 1, 0, 0, 0, 0] }),
      }),
    );
    expect(plan.assignments).toEqual({});
    expect(plan.conflicts).toEqual([
      {
        kind: "shopCapacity",
        entryId: "V7/#114",
        eventId: "V7",
        message:
          "no engine has 1.5 h left for chassis #114 at the 14 Feb event (Harlow Lake II), and the shop has 3 h free before it; the top end needs 4 h",
      },
    ]);
  });

  it("says when parts cannot arrive in time", () => {
    const plan = planAndCheck(
      makeInput({
        today: "2026-02-09",
        engines: [makeEngine("A-2", { top: 7.5, chassisId: "#114" })],
        events: [makeEvent("V7", "2026-02-14", "2026-02-14", [["#114", 1.5]])],
        shop: makeShop({ partsLeadDays: 5 }),
      }),
    );
    expect(plan.conflicts[0].message).toBe(
      "no engine has 1.5 h left for chassis #114 at the 14 Feb event (V7), and the shop has 0 h free before it (parts arrive 14 Feb); the top end needs 4 h",
    );
  });

  it("says when an entry needs more than any engine's limit", () => {
    const plan = planAndCheck(
      makeInput({
        engines: [makeEngine("E1", { topEndLimit: 10, chassisId: "#1" })],
        events: [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 12]])],
      }),
    );
    expect(plan.conflicts).toEqual([
      expect.objectContaining({ kind: "usageOverLimit", entryId: "V1/#1" }),
    ]);
    expect(plan.conflicts[0].message).toContain("needs 12 h");
    expect(plan.conflicts[0].message).toContain("largest limit 10 h");
  });

  it("says when every engine is taken", () => {
    const plan = planAndCheck(
      makeInput({
        engines: [makeEngine("E1", { chassisId: "#1" })],
        events: [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1], ["#2", 1]])],
      }),
    );
    expect(plan.assignments).toEqual({ "V1/#1": "E1" });
    expect(plan.conflicts.map((c) => [c.kind, c.entryId])).toEqual([["noEngine", "V1/#2"]]);
    expect(plan.conflicts[0].message).toContain("all 1 usable engines are entered elsewhere");
  });
});

describe("entry pins", () => {
  const events = [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1.0]])];

  it("holds a pin the planner would not have chosen", () => {
    const plan = planAndCheck(
      makeInput({ engines: [makeEngine("OWN", { chassisId: "#1" }), makeEngine("PIN")], events, entryPins: [{ entryId: "V1/#1", engineId: "PIN" }] }),
    );
    expect(plan.assignments).toEqual({ "V1/#1": "PIN" });
    expect(plan.explanations[0].text).toContain("the manager pinned it here");
  });

  it("books the job a pinned engine needs", () => {
    const plan = planAndCheck(
      makeInput({
        engines: [makeEngine("OWN", { chassisId: "#1" }), makeEngine("PIN", { top: 7.5 })],
        events,
        entryPins: [{ entryId: "V1/#1", engineId: "PIN" }],
      }),
    );
    expect(plan.assignments).toEqual({ "V1/#1": "PIN" });
    expect(plan.jobs.map((j) => [j.engineId, j.kind])).toEqual([["PIN", "topEnd"]]);
  });

  it("reports a pin that cannot hold and leaves the entry without an engine", () => {
    const plan = planAndCheck(
      makeInput({
        engines: [makeEngine("OWN", { chassisId: "#1" }), makeEngine("OLD", { status: "retired" })],
        events,
        entryPins: [{ entryId: "V1/#1", engineId: "OLD" }],
      }),
    );
    expect(plan.assignments).toEqual({});
    expect(plan.conflicts).toEqual([
      expect.objectContaining({ kind: "entryPin", entryId: "V1/#1", engineId: "OLD" }),
    ]);
    expect(plan.conflicts[0].message).toContain("the engine is retired");
  });
});

describe("job pins", () => {
  const season = (date: string, hours = [3, 3, 3, 3, 3, 0, 0]): PlannerInput =>
    makeInput({
      engines: [makeEngine("E1", { top: 7.0, chassisId: "#1" }), makeEngine("E2")],
      events: [
        makeEvent("V1", "2026-02-07", "2026-02-08", [["#1", 0.8]], { name: "Birchmoor" }),
        makeEvent("V2", "2026-02-14", "2026-02-14", [["#1", 0.8]]),
      ],
      shop: makeShop({ hoursPerWeekday: hours, closedDates: ["2026-02-11"] }),
      jobPins: [{ jobEngineId: "E1", kind: "topEnd", date }],
    });

  it("starts a pinned job on its day and plans around it", () => {
    const plan = planAndCheck(season("2026-02-09"));
    // Mon 9: 3 h, Tue 10: the last 1 h. E1 then has a fresh top end: no second job for V2.
    expect(plan.jobs).toHaveLength(1);
    expect(plan.jobs[0]).toMatchObject({ engineId: "E1", kind: "topEnd", pinned: true, startDate: "2026-02-09", hoursByDate: { "2026-02-09": 3, "2026-02-10": 1 } });
    expect(plan.assignments).toEqual({ "V1/#1": "E1", "V2/#1": "E1" });
  });

  it("keeps an engine whose pinned job spans an event off that event", () => {
    // Thu 5 Feb: 2 h; Fri 6 is the travel day and 7–8 the event; Mon 9: the last 2 h.
    const plan = planAndCheck(season("2026-02-05", [2, 2, 2, 2, 2, 0, 0]));
    expect(plan.jobs.find((j) => j.pinned)).toMatchObject({ startDate: "2026-02-05", endDate: "2026-02-09" });
    expect(plan.assignments["V1/#1"]).toBe("E2");
  });

  it.each([
    ["2026-02-11", "the shop is closed that day"],
    ["2026-02-07", "it is an event day (Birchmoor)"],
    ["2026-02-06", "it is a travel day before Birchmoor"],
    ["2026-01-30", "the day has passed"],
  ])("refuses a pin on %s: %s", (date, reason) => {
    const plan = planAndCheck(season(date));
    expect(plan.conflicts.filter((c) => c.kind === "jobPin").map((c) => c.message)).toEqual([
      expect.stringContaining(reason),
    ]);
  });
});
