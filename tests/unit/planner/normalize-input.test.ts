import { describe, expect, it } from "vitest";
import { DomainInputError } from "../../../src/lib/domain/errors";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import type { PlannerInput } from "../../../src/lib/domain/planner/types";
import { makeEngine, makeEvent, makeInput } from "./season-builders";

// Bad input throws a DomainInputError naming the field, so the API answers 400 and nothing is
// half-planned.

function base(): PlannerInput {
  return makeInput({
    engines: [makeEngine("E1", { chassisId: "#1" })],
    events: [makeEvent("V1", "2026-02-07", "2026-02-08", [["#1", 1]])],
  });
}

function fieldOf(change: (input: PlannerInput) => void): string {
  const input = base();
  change(input);
  try {
    planRebuilds(input);
  } catch (error) {
    if (error instanceof DomainInputError) return error.field;
    throw error;
  }
  return "no error";
}

describe("planner input checks", () => {
  it("accepts the base season", () => {
    expect(fieldOf(() => undefined)).toBe("no error");
  });

  it.each<[string, (input: PlannerInput) => void, string]>([
    ["an event that ends before it starts", (i) => { i.events[0].endDate = "2026-02-06"; }, "events[0].endDate"],
    ["negative usage", (i) => { i.events[0].entries[0].expectedUsage = -1; }, "events[0].entries[0].expectedUsage"],
    ["a usage that is not a number", (i) => { i.events[0].entries[0].expectedUsage = Number.NaN; }, "events[0].entries[0].expectedUsage"],
    ["a day that does not exist", (i) => { i.events[0].startDate = "2026-02-30"; }, "events[0].startDate"],
    ["a negative counter", (i) => { i.engines[0].counters.sinceTopEnd = -2; }, "engines[0].counters.sinceTopEnd"],
    ["a plan fraction above 1", (i) => { i.engines[0].policy.planFraction = 1.2; }, "engines[0].policy.planFraction"],
    ["a zero top-end limit", (i) => { i.engines[0].policy.topEndLimit = 0; }, "engines[0].policy.topEndLimit"],
    ["two engines with one id", (i) => { i.engines.push(makeEngine("E1")); }, "engines[1].id"],
    ["two engines in one chassis", (i) => { i.engines.push(makeEngine("E2", { chassisId: "#1" })); }, "engines[1].chassisId"],
    ["a chassis entered twice in one event", (i) => { i.events[0].entries.push({ entryId: "x", chassisId: "#1", expectedUsage: 1 }); }, "events[0].entries[1].chassisId"],
    ["an entry id used twice", (i) => { i.events.push(makeEvent("V2", "2026-02-14", "2026-02-14", [["#1", 1]])); i.events[1].entries[0].entryId = "V1/#1"; }, "events[1].entries[0].entryId"],
    ["six weekdays of shop hours", (i) => { i.shop.hoursPerWeekday = [8, 8, 8, 8, 8, 0]; }, "shop.hoursPerWeekday"],
    ["negative shop hours", (i) => { i.shop.hoursPerWeekday[2] = -1; }, "shop.hoursPerWeekday[2]"],
    ["a job that takes no labour", (i) => { i.shop.labourHours.topEnd = 0; }, "shop.labourHours.topEnd"],
    ["half a day of parts lead", (i) => { i.shop.partsLeadDays = 0.5; }, "shop.partsLeadDays"],
    ["a pin on an unknown engine", (i) => { i.entryPins = [{ entryId: "V1/#1", engineId: "GHOST" }]; }, "entryPins[0].engineId"],
    ["a pin on an unknown entry", (i) => { i.entryPins = [{ entryId: "nope", engineId: "E1" }]; }, "entryPins[0].entryId"],
    ["a job pin of an unknown kind", (i) => { i.jobPins = [{ jobEngineId: "E1", kind: "paint" as never, date: "2026-02-03" }]; }, "jobPins[0].kind"],
    ["a part on an unknown engine", (i) => { i.parts = [{ id: "P", name: "P", engineId: "GHOST", usage: 0, limit: 5, renewedBy: "topEnd" }]; }, "parts[0].engineId"],
    ["a season ten years long", (i) => { i.events[0].endDate = "2037-01-01"; }, "events"],
  ])("rejects %s", (_what, change, field) => {
    expect(fieldOf(change)).toBe(field);
  });
});
