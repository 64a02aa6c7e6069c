import { describe, expect, it } from "vitest";
import { checkPlan } from "../../../src/lib/domain/planner/check-plan";
import { computeRebuildLowerBound } from "../../../src/lib/domain/planner/lower-bound";
import { planRebuilds } from "../../../src/lib/domain/planner/plan-rebuilds";
import { buildKestrelSeason } from "./kestrel-hollow-season";

// The DEMO.md season, planned by hand (h = engine hours; "life" = the tightest counter's room).
//
// Start (17 Nov): A-1 top 3.5/8, bottom 15/24 → life 4.5 (in #27); A-2 2/8, 6/24 → 6 (#114);
// A-3 fresh spare, 8; A-5 top 2/10, crank 19/25 → 6 (#27H); A-6 spare 10; A-7 top 2/8 → 6 (#9).
// The cross twins' chassis need 1.0 h on 22 Nov and 1.5 h at seven cross events: 23 h.
// From Harlow Lake (19 Dec) one engine could run at most 6 × 1.5 = 9 h more, under 1.2 fresh
// 8 h lives: the cross pool's closing stretch. There the pool's usable life (whole 1.5 h
// entries, one per event) is weighed against the demand left; while it is short (below 1.25 ×
// the demand) the engines with the most life run first, and a rebuild is made as soon as the
// usable life falls short of the demand.
//
//  22 Nov, 5 Dec: A-1 in #27 and A-2 in #114 stay (life after 5 Dec: A-1 2.0, A-2 3.5).
//  19 Dec: usable 1.5 + 3 + 7.5 = 12 of 18 h: short. The two with most life run: A-2 keeps
//         #114, A-3 (8) takes #27 from A-1. After it the pool can use A-1 1.5 + A-2 1.5 +
//         A-3 6 = 9 h of the 15 h left: A-1 is renewed for 2 Jan. Its bottom end has
//         24 − 17.5 = 6.5 h left, less than a new top end's 8 h: a bottom end (12 h), one job
//         instead of two. Window 8 Dec – 1 Jan; as late as the shop allows at 6 h a day (31 Dec
//         and 1 Jan closed): Mon 29 and Tue 30 Dec.
//  2 Jan: A-1 (fresh, 8) and A-3 (6.5) have most life: A-3 keeps #27, A-1 takes #114.
//  16 Jan, 30 Jan, 13 Feb: they stay (at 13 Feb A-3 and the idle A-2 both have 2 h: the one
//         already in an entered chassis runs).
//  6 Mar, Birchmoor Final (important): A-1 (2 h) keeps #114; A-3 has 0.5 h, so the freshest
//         free engine A-2 (2 h) takes #27.
//  Hillclimbs: A-5 runs #27H at 0.8 h five times (crank 19.0 → 21.4 after Granite Notch, the
//         figures DEMO.md quotes) and A-7 runs #9 at 0.6 h; both have life to spare, no job.
// One rebuild in all. Lower bound: the cross pool needs 23 h and holds 4.5 + 6 + 8 = 18.5 h,
// so at least ceil(4.5 / 8) = 1 rebuild: the plan is optimal.

describe("the Kestrel Hollow demo season", () => {
  const input = buildKestrelSeason();
  const plan = planRebuilds(input);

  it("passes the independent checker", () => {
    expect(checkPlan(input, plan)).toEqual([]);
  });

  it("runs the engines worked out by hand", () => {
    const cross: Record<string, [string, string]> = {
      k00: ["A-1", "A-2"],
      k01: ["A-1", "A-2"],
      k02: ["A-3", "A-2"],
      k03: ["A-3", "A-1"],
      k04: ["A-3", "A-1"],
      k05: ["A-3", "A-1"],
      k07: ["A-3", "A-1"],
      k09: ["A-2", "A-1"],
    };
    for (const [event, [on27, on114]] of Object.entries(cross)) {
      expect(plan.assignments[`${event}/#27`]).toBe(on27);
      expect(plan.assignments[`${event}/#114`]).toBe(on114);
    }
    for (const event of ["k06", "k08", "k10", "k11", "k12"]) {
      expect(plan.assignments[`${event}/#27H`]).toBe("A-5");
      expect(plan.assignments[`${event}/#9`]).toBe("A-7");
    }
    expect(plan.stats.engineMoves).toBe(3);
  });

  it("plans one bottom end on A-1, as late as the shop allows before 2 Jan", () => {
    expect(plan.jobs).toHaveLength(1);
    expect(plan.jobs[0]).toMatchObject({
      engineId: "A-1",
      kind: "bottomEnd",
      startDate: "2025-12-29",
      endDate: "2025-12-30",
      labourHours: 12,
      hoursByDate: { "2025-12-29": 6, "2025-12-30": 6 },
      forEventId: "k03",
    });
    expect(plan.stats).toMatchObject({ rebuildCount: 1, lowerBound: 1, conflictCount: 0 });
    expect(computeRebuildLowerBound(input)).toMatchObject({ rebuilds: 1, topEnd: 1, bottomEnd: 0 });
  });

  it("leaves the life worked out by hand after each event", () => {
    expect(plan.usageLeftAfter["k02/#27"]).toBeCloseTo(6.5, 9);
    expect(plan.usageLeftAfter["k03/#114"]).toBeCloseTo(6.5, 9);
    // After the final: A-1 5 × 1.5 = 7.5 of 8 since its rebuild; A-2 2 + 1 + 3 × 1.5 = 7.5 of 8.
    expect(plan.usageLeftAfter["k09/#114"]).toBeCloseTo(0.5, 9);
    expect(plan.usageLeftAfter["k09/#27"]).toBeCloseTo(0.5, 9);
    // A-5 after Cold Fork Basin: top 2 + 5 × 0.8 = 6 of 10, crank 23 of 25 → 2 h left.
    expect(plan.usageLeftAfter["k12/#27H"]).toBeCloseTo(2.0, 9);
    expect(plan.usageLeftAfter["k12/#9"]).toBeCloseTo(3.0, 9);
  });

  it("flags each counter once it passes 80 % of its limit", () => {
    // 0.8 × 8 = 6.4 h of top end: A-3 reaches 7.5 on 15 Feb, A-1 (after its rebuild) and A-2
    // on 8 Mar; 0.8 × 25 = 20 h of crank: A-5 reaches 20.6 on 1 Mar. Before that A-1 stopped
    // at 6.0 (5 Dec, then rebuilt) and A-2 at 6.0 (19 Dec, then idle), under the mark.
    expect(plan.watchPoints.map((w) => [w.engineId, w.kind, w.date])).toEqual([
      ["A-3", "topEnd", "2026-02-15"],
      ["A-5", "bottomEnd", "2026-03-01"],
      ["A-1", "topEnd", "2026-03-08"],
      ["A-2", "topEnd", "2026-03-08"],
    ]);
  });

  it("explains the moves and the job in plain words", () => {
    const afterRebuild = plan.explanations.find((e) => e.subjectId === "k03/#114")?.text ?? "";
    expect(afterRebuild).toContain("A-1 runs chassis #114 at the 2 Jan event (Red Tamarack)");
    expect(afterRebuild).toContain("Its bottom end is done just before");
    const final = plan.explanations.find((e) => e.subjectId === "k09/#27")?.text ?? "";
    expect(final).toContain("marked important and it is the freshest free engine (2 h left)");
    expect(plan.jobs[0].reason).toContain("the twin72 engines can still use only 9 h of the 15 h");
    expect(plan.warnings).toEqual([]);
  });
});
