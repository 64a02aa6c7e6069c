import { describe, expect, it } from "vitest";
import { computeRebuildLowerBound } from "../../../src/lib/domain/planner/lower-bound";
import { makeEngine, makeEvent, makeInput } from "./season-builders";

// Worked by hand from the argument in lower-bound.ts: rebuilds ≥ ceil((D − Σ usable(left)) /
// max usable(fresh)), per engine family when entries name one.

const saturdays = ["2026-02-07", "2026-02-14", "2026-02-21", "2026-02-28", "2026-03-07"];

describe("computeRebuildLowerBound", () => {
  it("counts only the life that whole entries can use", () => {
    // Ten 1.5 h entries (two chassis, five events): D = 15 h. Engines have 2, 3 and 8 h left of
    // 8 h limits; in 1.5 h steps they can use 1.5, 3 and 7.5 h (12 h), and a fresh one 7.5 h:
    // ceil((15 − 12) / 7.5) = 1. Counting raw hours (2 + 3 + 8 = 13 ≥ 15 − 8) would also say 1,
    // so add a third chassis: D = 22.5 h → ceil(10.5 / 7.5) = 2 (raw hours: ceil(9.5 / 8) = 2).
    const engines = [makeEngine("A", { top: 6 }), makeEngine("B", { top: 5 }), makeEngine("C", { top: 0 })];
    const two = makeInput({ engines, events: saturdays.map((d, i) => makeEvent(`V${i}`, d, d, [["#1", 1.5], ["#2", 1.5]])) });
    expect(computeRebuildLowerBound(two)).toEqual({ rebuilds: 1, topEnd: 1, bottomEnd: 0, demand: 15 });
    const three = makeInput({ engines, events: saturdays.map((d, i) => makeEvent(`V${i}`, d, d, [["#1", 1.5], ["#2", 1.5], ["#3", 1.5]])) });
    expect(computeRebuildLowerBound(three).rebuilds).toBe(2);
  });

  it("caps the first life by the bottom end and bounds bottom ends on their own", () => {
    // One engine, top 0 of 8 but bottom 23 of 24: before any rebuild it has 1 h, which holds no
    // 2 h entry. Five 2 h entries (D = 10): ceil(10 / 8) = 2 rebuilds, ceil(10 / 24) = 1 bottom end.
    // (Counting the top end's 8 h instead would give ceil(2 / 8) = 1.)
    const input = makeInput({
      engines: [makeEngine("A", { top: 0, bottom: 23, bottomEndLimit: 24 })],
      events: saturdays.map((d, i) => makeEvent(`V${i}`, d, d, [["#1", 2]])),
    });
    expect(computeRebuildLowerBound(input)).toEqual({ rebuilds: 2, topEnd: 2, bottomEnd: 1, demand: 10 });
  });

  it("adds the bounds of engine families that cannot stand in for each other", () => {
    // Family x: a fresh engine (8 h) and one 2 h entry → 0. Family y: an engine with nothing
    // left and five 2 h entries → ceil(10 / 8) = 2. Together 2, while one pool of both engines
    // would say ceil((12 − 8) / 8) = 1.
    const engines = [makeEngine("X", { top: 0, family: "x" }), makeEngine("Y", { top: 8, family: "y" })];
    const events = saturdays.map((d, i) => makeEvent(`Y${i}`, d, d, [["#y", 2]], { family: "y" }));
    events.push(makeEvent("X0", saturdays[0], saturdays[0], [["#x", 2]], { family: "x" }));
    expect(computeRebuildLowerBound(makeInput({ engines, events })).rebuilds).toBe(2);
    const pooled = makeInput({ engines, events: events.map((e) => ({ ...e, entries: e.entries.map(({ engineFamily: _f, ...x }) => x) })) });
    expect(computeRebuildLowerBound(pooled).rebuilds).toBe(1);
  });

  it("is zero when an engine without a limit of that kind could run everything", () => {
    const input = makeInput({
      engines: [makeEngine("A", { top: 7.5, bottomEndLimit: 24 }), makeEngine("B", { top: 7.5 })],
      events: saturdays.map((d, i) => makeEvent(`V${i}`, d, d, [["#1", 2]])),
    });
    expect(computeRebuildLowerBound(input).bottomEnd).toBe(0);
    expect(computeRebuildLowerBound(input).topEnd).toBe(2); // ceil(10 / 8) with no usable life left
  });

  it("leaves out retired engines and events before today", () => {
    const input = makeInput({
      today: "2026-02-09",
      engines: [makeEngine("A", { top: 8 }), makeEngine("OLD", { status: "retired" })],
      events: saturdays.map((d, i) => makeEvent(`V${i}`, d, d, [["#1", 2]])),
    });
    // 7 Feb is history: four 2 h entries left, A has no life: ceil(8 / 8) = 1.
    expect(computeRebuildLowerBound(input)).toEqual({ rebuilds: 1, topEnd: 1, bottomEnd: 0, demand: 8 });
  });
});
