import { describe, expect, it } from "vitest";
import { checkPlan, type ViolationRule } from "../../../src/lib/domain/planner/check-plan";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import type { PlannerInput, RebuildPlan } from "../../../src/lib/domain/planner/types";
import { makeEngine, makeEvent, makeInput, makeShop } from "./season-builders";

// The checker must catch every broken hard rule. Each case starts from a valid plan, breaks
// one rule by hand (as a manager's drag or a faulty planner would) and expects that rule.
// Calendar: 2 Feb 2026 is a Monday; 7 and 14 Feb are Saturdays; 8 Feb a Sunday.

function buildBase(): PlannerInput {
  return makeInput({
    engines: [
      makeEngine("E1", { top: 7.0, chassisId: "#1", family: "twin" }),
      makeEngine("E2", { top: 1.0, chassisId: "#2", family: "twin" }),
      makeEngine("E3", { family: "single" }),
      makeEngine("OLD", { status: "retired", family: "twin" }),
    ],
    events: [
      makeEvent("V1", "2026-02-07", "2026-02-08", [["#1", 0.8], ["#2", 0.8]], { family: "twin" }),
      makeEvent("V2", "2026-02-14", "2026-02-14", [["#1", 0.8], ["#2", 0.8]], { family: "twin" }),
    ],
    shop: makeShop({ hoursPerWeekday: [3, 3, 3, 3, 3, 0, 0], closedDates: ["2026-02-10"], partsLeadDays: 1 }),
  });
}

function rulesOf(input: PlannerInput, plan: Pick<RebuildPlan, "assignments" | "jobs" | "conflicts">): ViolationRule[] {
  return [...new Set(checkPlan(input, plan).map((v) => v.rule))].sort();
}

describe("checkPlan", () => {
  const input = buildBase();
  const plan = planRebuilds(input);
  const clone = (): RebuildPlan => structuredClone(plan);

  it("accepts the planner's plan, which has a top end on E1 before V2", () => {
    expect(checkPlan(input, plan)).toEqual([]);
    expect(plan.jobs.map((j) => [j.engineId, j.kind, j.forEventId])).toEqual([["E1", "topEnd", "V2"]]);
  });

  it("catches an engine that would pass its limit", () => {
    const broken = clone();
    broken.jobs = [];
    const violations = checkPlan(input, broken);
    expect(violations.map((v) => v.rule)).toEqual(["limitPassed"]);
    expect(violations[0].message).toContain("E1 would pass its top end limit at V2");
  });

  it("catches labour on a closed day, a weekend and an event day", () => {
    const closed = clone();
    closed.jobs[0].hoursByDate = { "2026-02-10": 1, "2026-02-12": 3 };
    closed.jobs[0].startDate = "2026-02-10";
    expect(rulesOf(input, closed)).toContain("jobOnClosedDay");
    const sunday = clone();
    sunday.jobs[0].hoursByDate = { "2026-02-08": 4 };
    sunday.jobs[0].startDate = "2026-02-08";
    sunday.jobs[0].endDate = "2026-02-08";
    expect(rulesOf(input, sunday)).toEqual(["jobOnClosedDay", "jobOverlapsEvent", "shopOverCapacity"]);
  });

  it("catches a day that carries more labour than the shop has", () => {
    const broken = clone();
    broken.jobs[0].hoursByDate = { "2026-02-12": 4 };
    broken.jobs[0].startDate = "2026-02-12";
    expect(rulesOf(input, broken)).toEqual(["shopOverCapacity"]);
  });

  it("catches labour that does not add up", () => {
    const broken = clone();
    broken.jobs[0].labourHours = 3;
    expect(rulesOf(input, broken)).toEqual(["jobLabour"]);
  });

  it("catches a job that starts before its parts arrive", () => {
    const early = structuredClone(input);
    early.shop.partsLeadDays = 10; // parts on 12 Feb; the job starts 11 Feb
    expect(rulesOf(early, plan)).toEqual(["partsLead"]);
  });

  it("catches two jobs on one engine at once", () => {
    const broken = clone();
    broken.jobs.push({ ...broken.jobs[0], id: "extra", kind: "inspection", labourHours: 1.5, hoursByDate: { "2026-02-09": 1.5 }, startDate: "2026-02-09", endDate: "2026-02-09" });
    broken.jobs[0] = { ...broken.jobs[0], startDate: "2026-02-09" };
    expect(rulesOf(input, broken)).toContain("jobOverlapsJob");
  });

  it("catches one engine in two entries of the same event", () => {
    const broken = clone();
    broken.assignments["V1/#2"] = broken.assignments["V1/#1"];
    expect(rulesOf(input, broken)).toContain("doubleBooked");
  });

  it("catches an entry with neither an engine nor a conflict, and one with both", () => {
    const missing = clone();
    delete missing.assignments["V2/#2"];
    expect(rulesOf(input, missing)).toEqual(["unplannedEntry"]);
    const both = clone();
    both.conflicts.push({ kind: "noEngine", entryId: "V2/#2", message: "" });
    expect(rulesOf(input, both)).toEqual(["conflictedButAssigned"]);
  });

  it("catches retired, unknown, unavailable and wrong-family engines", () => {
    const retired = clone();
    retired.assignments["V2/#2"] = "OLD";
    expect(rulesOf(input, retired)).toContain("retiredEngine");
    const unknown = clone();
    unknown.assignments["V2/#2"] = "GHOST";
    expect(rulesOf(input, unknown)).toContain("unknownReference");
    const family = clone();
    family.assignments["V2/#2"] = "E3";
    expect(rulesOf(input, family)).toEqual(["wrongFamily"]);
    const away = structuredClone(input);
    away.engines[1].availableFrom = "2026-02-10";
    expect(rulesOf(away, plan)).toEqual(["engineUnavailable"]);
  });

  it("catches pins the plan ignores", () => {
    const pinned = structuredClone(input);
    pinned.entryPins = [{ entryId: "V2/#2", engineId: "E3" }];
    pinned.jobPins = [{ jobEngineId: "E2", kind: "inspection", date: "2026-02-09" }];
    expect(rulesOf(pinned, plan)).toEqual(["entryPin", "jobPin"]);
  });
});
