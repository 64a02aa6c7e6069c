import { describe, expect, it } from "vitest";
import { checkPlan } from "../../../src/lib/domain/planner/check-plan";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import type { PlannerInput } from "../../../src/lib/domain/planner/types";
import { listSaturdays, makeEngine, makeEvent, makeInput, makeShop } from "./season-builders";

// Small seasons whose plan can be worked out by hand; each expected value is derived in the
// comment beside it. Calendar facts used: 2 Feb 2026 is a Monday, so the Saturdays are 7, 14,
// 21 Feb… and the Friday before each is its travel day (any 2026 calendar).

function planAndCheck(input: PlannerInput): ReturnType<typeof planRebuilds> {
  const plan = planRebuilds(input);
  expect(checkPlan(input, plan)).toEqual([]);
  return plan;
}

/** One engine at 7.0 of 8 h, two Saturday events of 0.8 h: the second would pass the limit. */
function buildTwoEventSeason(shop = makeShop({ hoursPerWeekday: [3, 3, 3, 3, 3, 0, 0] })): PlannerInput {
  return makeInput({
    engines: [makeEngine("E1", { top: 7.0, chassisId: "#1" })],
    events: [
      makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 0.8]]),
      makeEvent("V2", "2026-02-14", "2026-02-14", [["#1", 0.8]]),
    ],
    shop,
  });
}

describe("planRebuilds: jobs", () => {
  it("books the top end after the last event it can run and as late as the shop allows", () => {
    const plan = planAndCheck(buildTwoEventSeason());
    // 7.0 + 0.8 = 7.8 ≤ 8 runs V1; 7.8 + 0.8 = 8.6 > 8 needs a top end before V2. The window is
    // Sun 8 – Thu 12 Feb (Fri 13 is the travel day). 4 h at 3 h a day, latest first:
    // Thu 12 takes 3 h, Wed 11 the last 1 h.
    expect(plan.assignments).toEqual({ "V1/#1": "E1", "V2/#1": "E1" });
    expect(plan.jobs).toHaveLength(1);
    expect(plan.jobs[0]).toMatchObject({
      engineId: "E1",
      kind: "topEnd",
      startDate: "2026-02-11",
      endDate: "2026-02-12",
      labourHours: 4,
      hoursByDate: { "2026-02-11": 1, "2026-02-12": 3 },
      forEventId: "V2",
      pinned: false,
    });
    expect(plan.usageLeftAfter["V2/#1"]).toBeCloseTo(7.2, 9);
    // Demand 1.6 h, life left 1.0 h of which 0.8 h is usable in 0.8 h entries; one fresh life
    // holds 8 h: ceil((1.6 − 0.8) / 8) = 1.
    expect(plan.stats).toMatchObject({ rebuildCount: 1, lowerBound: 1, conflictCount: 0 });
  });

  it("skips closed days when it books labour", () => {
    const plan = planAndCheck(
      buildTwoEventSeason(makeShop({ hoursPerWeekday: [3, 3, 3, 3, 3, 0, 0], closedDates: ["2026-02-12"] })),
    );
    // Thu 12 closed: Wed 11 takes 3 h and Tue 10 the last 1 h.
    expect(plan.jobs[0].hoursByDate).toEqual({ "2026-02-10": 1, "2026-02-11": 3 });
  });

  it("chooses a bottom end when the bottom end would cut the next top end short", () => {
    const season = (bottom: number): PlannerInput =>
      makeInput({
        engines: [makeEngine("E1", { top: 7.5, bottom, bottomEndLimit: 24, chassisId: "#1" })],
        events: [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1.0]])],
      });
    // 24 − 20 = 4 h of bottom end left, less than the 8 h a new top end gives: one bottom end.
    const tight = planAndCheck(season(20));
    expect(tight.jobs.map((j) => [j.kind, j.labourHours])).toEqual([["bottomEnd", 12]]);
    expect(tight.jobs[0].reason).toContain("the bottom end would run out before the next top end");
    // 24 − 10 = 14 h left, more than a top end's 8 h: a top end is enough.
    const loose = planAndCheck(season(10));
    expect(loose.jobs.map((j) => [j.kind, j.labourHours])).toEqual([["topEnd", 4]]);
  });

  it("lets a part's own limit call for the job that renews it", () => {
    const input = makeInput({
      engines: [makeEngine("E1", { top: 3, chassisId: "#1" })],
      parts: [{ id: "P1", name: "race piston", engineId: "E1", usage: 5.5, limit: 6, renewedBy: "topEnd" }],
      events: [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1.0]])],
    });
    const plan = planAndCheck(input);
    // The top end has 5 h left but the piston only 0.5 h: a top end, quoting the piston.
    expect(plan.jobs.map((j) => j.kind)).toEqual(["topEnd"]);
    expect(plan.jobs[0].reason).toContain("race piston (part) at 5.5 of 6 h");
  });

  it("does only an inspection when only the inspection is due", () => {
    const input = makeInput({
      engines: [makeEngine("E1", { top: 2, inspection: 4.5, inspectionInterval: 5, chassisId: "#1" })],
      events: [makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1.0]])],
    });
    const plan = planAndCheck(input);
    expect(plan.jobs.map((j) => [j.kind, j.labourHours])).toEqual([["inspection", 1.5]]);
    expect(plan.stats).toMatchObject({ rebuildCount: 0, inspectionCount: 1 });
  });
});

/** Six Saturdays of 2.0 h for chassis #1: 12 h ahead, more than one 8 h life. */
function buildLongSeason(engines: PlannerInput["engines"], important = false): PlannerInput {
  return makeInput({
    engines,
    events: listSaturdays(6).map((d, i) => makeEvent(`V${i + 1}`, d, d, [["#1", 2.0]], { important: important && i === 0 })),
  });
}

describe("planRebuilds: choosing engines", () => {
  it("uses the life of the most-used engine that still covers the entry", () => {
    const plan = planAndCheck(buildLongSeason([makeEngine("S-A", { top: 5 }), makeEngine("S-B", { top: 2 })]));
    // S-A has 3 h, S-B 6 h; both cover 2 h and the least that covers is S-A.
    expect(plan.assignments["V1/#1"]).toBe("S-A");
    expect(plan.explanations.find((e) => e.subjectId === "V1/#1")?.text).toContain("least life that still covers");
  });

  it("keeps the engine in its chassis while it has the life", () => {
    const plan = planAndCheck(buildLongSeason([makeEngine("OWN", { top: 2, chassisId: "#1" }), makeEngine("SPARE", { top: 5.5 })]));
    // OWN has 6 h: it covers 2 h, so it stays although SPARE (2.5 h) would fit tighter.
    expect(plan.assignments["V1/#1"]).toBe("OWN");
    expect(plan.explanations.find((e) => e.subjectId === "V1/#1")?.text).toContain("stays in its chassis");
  });

  it("gives an important event the freshest free engine", () => {
    const plan = planAndCheck(buildLongSeason([makeEngine("S-A", { top: 5 }), makeEngine("S-B", { top: 2 })], true));
    expect(plan.assignments["V1/#1"]).toBe("S-B");
    expect(plan.explanations.find((e) => e.subjectId === "V1/#1")?.text).toContain("marked important");
  });

  it("prefers an engine built for the valley at a low event and warns when only a mountain engine is left", () => {
    const both = planAndCheck(
      buildLongSeason([makeEngine("HIGH", { top: 5, minElevationM: 1800 }), makeEngine("LOW", { top: 5 })]),
    );
    expect(both.assignments["V1/#1"]).toBe("LOW");
    const only = planAndCheck(buildLongSeason([makeEngine("HIGH", { top: 5, minElevationM: 1800 })]));
    expect(only.assignments["V1/#1"]).toBe("HIGH");
    expect(only.warnings[0]).toMatchObject({ kind: "altitude", entryId: "V1/#1", engineId: "HIGH" });
    expect(only.warnings[0].message).toContain("built for 1800 m and up but runs at the 7 Feb event (V1) at 400 m");
  });

  it("never enters one engine in two events that overlap", () => {
    const events = [
      makeEvent("V1", "2026-02-07", "2026-02-08", [["#1", 1.0]]),
      makeEvent("V2", "2026-02-08", "2026-02-08", [["#2", 1.0]]),
    ];
    const two = planAndCheck(makeInput({ engines: [makeEngine("E1", { chassisId: "#1" }), makeEngine("E2")], events }));
    expect(two.assignments).toEqual({ "V1/#1": "E1", "V2/#2": "E2" });
    const one = planAndCheck(makeInput({ engines: [makeEngine("E1", { chassisId: "#1" })], events }));
    expect(one.assignments).toEqual({ "V1/#1": "E1" });
    expect(one.conflicts).toEqual([
      expect.objectContaining({ kind: "noEngine", entryId: "V2/#2" }),
    ]);
  });

  it("never runs a retired engine and waits for an engine that is away", () => {
    const plan = planAndCheck(
      makeInput({
        engines: [
          makeEngine("OLD", { status: "retired" }),
          makeEngine("AWAY", { chassisId: "#1", availableFrom: "2026-02-10" }),
          makeEngine("SPARE", { top: 4 }),
        ],
        events: [
          makeEvent("V1", "2026-02-07", "2026-02-07", [["#1", 1.0]]),
          makeEvent("V2", "2026-02-14", "2026-02-14", [["#2", 1.0]]),
        ],
      }),
    );
    expect(plan.assignments["V1/#1"]).toBe("SPARE");
    expect(Object.values(plan.assignments)).not.toContain("OLD");
  });

  it("leaves events that started before today alone but keeps their days off the bench", () => {
    const input = makeInput({
      today: "2026-02-09",
      engines: [makeEngine("E1", { top: 7.5, chassisId: "#1" })],
      events: [
        makeEvent("V0", "2026-02-06", "2026-02-10", [["#2", 1.0]]),
        makeEvent("V1", "2026-02-14", "2026-02-14", [["#1", 1.0]]),
      ],
      shop: makeShop({ hoursPerWeekday: [2, 2, 2, 2, 2, 0, 0] }),
    });
    const plan = planAndCheck(input);
    // V0 runs to Tue 10 Feb, so the 4 h top end can only use Wed 11 and Thu 12 (Fri 13 travel).
    expect(plan.assignments).toEqual({ "V1/#1": "E1" });
    expect(plan.conflicts).toEqual([]);
    expect(plan.jobs[0].hoursByDate).toEqual({ "2026-02-11": 2, "2026-02-12": 2 });
  });

  it("gives the same plan for the same input", () => {
    const a = planRebuilds(buildTwoEventSeason());
    const b = planRebuilds(buildTwoEventSeason());
    expect(b).toEqual(a);
  });
});
