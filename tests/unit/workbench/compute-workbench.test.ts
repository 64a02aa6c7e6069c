import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { computeCompression, computeFuelCheck } from "../../../src/lib/domain/calc-api";
import { computeCcPerMm } from "../../../src/lib/domain/compression";
import { IMPERIAL_UNITS, METRIC_UNITS } from "../../../src/lib/domain/units";
import { computeWorkbench } from "../../../src/components/workbench/compute-workbench";
import { changeUnits, createEmptyState, type WorkbenchState } from "../../../src/components/workbench/workbench-state";

// DEMO.md engine A-1 (invented, consistent with Vs = π/4·B²·S): 300.5 cc, 13.73 geometric,
// 7.38 trapped, offset −2.8 cc.
function a1(patch: Partial<WorkbenchState> = {}): WorkbenchState {
  return {
    ...createEmptyState(METRIC_UNITS),
    bore: "72",
    stroke: "73.8",
    rod: "130",
    cylinders: "2",
    chamber: "23.6",
    plate: "26.4",
    exhaustOpens: "82",
    squish: "1.2",
    ...patch,
  };
}

describe("computeWorkbench", () => {
  it("gives the domain's figures for DEMO.md A-1", () => {
    const figures = computeWorkbench(a1());
    expect(figures.errors).toEqual({});
    const direct = computeCompression({ boreMm: 72, strokeMm: 73.8, rodMm: 130, cylinders: 2, chamberCc: 23.6, flatPlateCc: 26.4, exhaustOpensDegAtdc: 82 });
    expect(figures.compression).toEqual(direct);
    expect(figures.compression?.geometricRatio).toBeCloseTo(13.73, 2);
    expect(figures.compression?.trappedRatio).toBeCloseTo(7.38, 2);
  });

  it("reads the installed volume from flat plate and offset", () => {
    const figures = computeWorkbench(a1({ chamberMode: "plate", chamber: "", plate: "26.4", offset: "-2.8" }));
    expect(figures.chamberCc).toBeCloseTo(23.6, 12);
    expect(figures.compression?.chamberOffsetCc).toBeCloseTo(-2.8, 12);
  });

  it("reads the exhaust timing as a duration or a travel", () => {
    const fromAngle = computeWorkbench(a1()).compression;
    const fromDuration = computeWorkbench(a1({ exhaustMode: "duration", exhaustDuration: "196" })).compression;
    expect(fromDuration?.trappedRatio).toBeCloseTo(fromAngle?.trappedRatio ?? 0, 12);
    const travel = String(fromAngle?.exhaustTravelMm);
    const fromTravel = computeWorkbench(a1({ exhaustMode: "travel", exhaustTravel: travel })).compression;
    expect(fromTravel?.trappedRatio).toBeCloseTo(fromAngle?.trappedRatio ?? 0, 12);
  });

  it("gives the same figures in any units (property)", () => {
    const metric = computeWorkbench(a1({ elevation: "396", airTemp: "-5", target: "13", plan: [{ id: 1, kind: "keep", value: "0.3" }] }));
    fc.assert(
      fc.property(
        fc.record({
          length: fc.constantFrom("mm" as const, "in" as const),
          volume: fc.constantFrom("cc" as const, "in3" as const),
          pressure: fc.constantFrom("kPa" as const, "bar" as const, "psi" as const),
          elevation: fc.constantFrom("m" as const, "ft" as const),
          temperature: fc.constantFrom("C" as const, "F" as const),
        }),
        (units) => {
          const other = computeWorkbench(changeUnits(a1({ elevation: "396", airTemp: "-5", target: "13", plan: [{ id: 1, kind: "keep", value: "0.3" }] }), units));
          // Typed values are rounded on conversion (5 decimals of an inch, …): 1e-4 relative.
          expect(other.compression?.geometricRatio).toBeCloseTo(metric.compression?.geometricRatio ?? 0, 3);
          expect(other.compression?.trappedRatio).toBeCloseTo(metric.compression?.trappedRatio ?? 0, 3);
          expect(other.plan?.after.geometricRatio).toBeCloseTo(metric.plan?.after.geometricRatio ?? 0, 3);
          expect(Math.abs((other.fuelBefore?.crankingKpaEstimate ?? 0) - (metric.fuelBefore?.crankingKpaEstimate ?? 0))).toBeLessThan(0.5);
        },
      ),
      { numRuns: 40 },
    );
  });

  it("plans a chain of steps: cut, gasket, bowl and cut-keeping-the-ratio", () => {
    const ccPerMm = computeCcPerMm(72);
    const figures = computeWorkbench(
      a1({
        plan: [
          { id: 1, kind: "cut", value: "0.2" },
          { id: 2, kind: "gasket", value: "0.1" },
          { id: 3, kind: "bowl", value: "0.5" },
          { id: 4, kind: "keep", value: "0.3" },
        ],
      }),
    );
    const plan = figures.plan;
    expect(plan?.appliedSteps).toBe(4);
    // volume: −0.2·A + 0.1·A + 0.5 cc (the keep step nets to zero); squish: 1.2 − 0.2 + 0.1 − 0.3
    expect(plan?.after.chamberCc).toBeCloseTo(23.6 - 0.1 * ccPerMm + 0.5, 10);
    expect(plan?.after.squishMm).toBeCloseTo(0.8, 10);
    expect(plan?.keepBowlCc[4]).toBeCloseTo(0.3 * ccPerMm, 10);
    // The gasket lifts the port by 0.1 mm: the port opens earlier.
    expect(plan?.after.exhaustTravelMm).toBeCloseTo((plan?.before.exhaustTravelMm ?? 0) - 0.1, 10);
    expect(plan?.after.exhaustOpensDegAtdc).toBeLessThan(82);
    expect(plan?.totals.headCutTotalMm).toBeCloseTo(0.5, 10);
    expect(plan?.after.trappedRatio).toBeLessThan(plan?.after.geometricRatio ?? 0);
  });

  it("stops at the step that closes the squish gap, naming it", () => {
    const figures = computeWorkbench(a1({ plan: [{ id: 1, kind: "cut", value: "0.5" }, { id: 2, kind: "cut", value: "1" }, { id: 3, kind: "bowl", value: "1" }] }));
    expect(figures.plan?.appliedSteps).toBe(1);
    expect(figures.plan?.stepErrors[2]).toMatch(/squish/);
    expect(figures.plan?.stepErrors[3]).toBeUndefined();
  });

  it("checks the fuel as measured and after the plan, with the cautions", () => {
    const figures = computeWorkbench(a1({ elevation: "396", plan: [{ id: 1, kind: "cut", value: "0.2" }] }));
    const direct = computeFuelCheck({ boreMm: 72, strokeMm: 73.8, rodMm: 130, cylinders: 2, chamberCc: 23.6, flatPlateCc: 26.4, exhaustOpensDegAtdc: 82, elevationM: 396 });
    expect(figures.fuelBefore?.crankingKpaEstimate).toBeCloseTo(direct.crankingKpaEstimate, 9);
    expect(figures.fuelAfter?.crankingKpaEstimate).toBeGreaterThan(direct.crankingKpaEstimate);
    expect(figures.fuelBefore?.cautions.join(" ")).toMatch(/fire codes/);
  });

  it("lists what is missing and names each bad field, keeping what it can compute", () => {
    const empty = computeWorkbench(createEmptyState(METRIC_UNITS));
    expect(empty.missing).toEqual(["Bore", "Stroke", "Installed chamber volume"]);
    expect(empty.compression).toBeUndefined();

    const badRod = computeWorkbench(a1({ rod: "30" }));
    expect(badRod.errors.rod).toMatch(/^Rod length must be longer than half the stroke/);
    expect(badRod.compression?.geometricRatio).toBeCloseTo(13.73, 2);
    expect(badRod.compression?.trappedRatio).toBeUndefined();

    const typo = computeWorkbench(a1({ bore: "7 2", chamber: "0" }));
    expect(typo.errors.bore).toMatch(/number/);
    expect(typo.compression).toBeUndefined();

    const noChamber = computeWorkbench(a1({ chamberMode: "plate", plate: "10", offset: "-12" }));
    expect(noChamber.errors.offset).toMatch(/no chamber volume/);
  });

  it("names a target no head reaches with this offset, and keeps the other figures", () => {
    const figures = computeWorkbench(a1({ chamber: "40", plate: "5", target: "30" }));
    expect(figures.errors.target).toMatch(/no head volume/i);
    expect(figures.compression?.geometricRatio).toBeCloseTo((300.477 + 40) / 40, 3);
    expect(figures.compression?.targetChamberCc).toBeUndefined();
  });

  it("sets the estimate against the organisation's own table when it has one", () => {
    const table = { label: "Our sheet", rows: [{ upToCrankingKpa: 2000, grade: "Blend B" }] };
    const own = computeWorkbench(a1({ elevation: "396" }), table);
    expect(own.fuelBefore?.fuelGrade).toBe("Blend B");
    expect(own.fuelBefore?.fuelTableLabel).toBe("Our sheet");
    expect(own.fuelBefore?.cautions.join(" ")).not.toMatch(/seed fuel table/);
    const seed = computeWorkbench(a1({ elevation: "396" }));
    expect(seed.fuelBefore?.cautions.join(" ")).toMatch(/seed fuel table/);
  });

  it("withholds the fuel check while a fuel field is wrong", () => {
    const figures = computeWorkbench(a1({ elevation: "396", airTemp: "95" }));
    expect(figures.errors.airTemp).toMatch(/Air temperature/);
    expect(figures.fuelBefore).toBeUndefined();
    expect(figures.compression).toBeDefined();
  });

  it("never throws and never gives a non-finite figure for typed numbers (property)", () => {
    const typed = fc.oneof(fc.constant(""), fc.double({ min: -1e6, max: 1e6, noNaN: true }).map(String), fc.constantFrom("0", "-1", "abc", "1e308"));
    fc.assert(
      fc.property(typed, typed, typed, typed, typed, typed, (bore, stroke, chamber, rod, opens, elevation) => {
        const figures = computeWorkbench({ ...createEmptyState(IMPERIAL_UNITS), bore, stroke, chamber, rod, exhaustOpens: opens, elevation });
        const numbers = JSON.stringify(figures, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? "NON-FINITE" : v));
        expect(numbers).not.toContain("NON-FINITE");
      }),
      { numRuns: 300 },
    );
  });
});
