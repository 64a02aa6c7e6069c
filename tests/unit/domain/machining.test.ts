import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  applyMachiningSteps,
  changeBaseGasket,
  createEngineGeometry,
  cutHeadFace,
  describeGeometry,
  openBowl,
  solveBowlToKeepRatio,
} from "../../../src/lib/domain/machining";
import type { EngineGeometry } from "../../../src/lib/domain/machining";
import { expectAllFinite, expectFieldError, expectPrinted } from "./expect-helpers";

// DEMO.md engine A-1: 72 × 73.8 mm, rod 130, exhaust opens 82° ATDC, 23.6 cc installed,
// 26.4 cc flat plate, squish 1.20/1.21 mm (mean 1.205).
const a1 = (): EngineGeometry =>
  createEngineGeometry({
    boreMm: 72,
    strokeMm: 73.8,
    rodMm: 130,
    chamberCc: 23.6,
    flatPlateCc: 26.4,
    squishMm: 1.205,
    exhaustOpensDegAtdc: 82,
  });

function expectSameGeometry(a: EngineGeometry, b: EngineGeometry): void {
  expect(a.chamberCc).toBeCloseTo(b.chamberCc, 9);
  expect(a.flatPlateCc ?? 0).toBeCloseTo(b.flatPlateCc ?? 0, 9);
  expect(a.squishMm ?? 0).toBeCloseTo(b.squishMm ?? 0, 9);
  expect(a.exhaustTravelMm ?? 0).toBeCloseTo(b.exhaustTravelMm ?? 0, 9);
  expect(a.headCutTotalMm).toBeCloseTo(b.headCutTotalMm, 9);
  expect(a.baseGasketChangeMm).toBeCloseTo(b.baseGasketChangeMm, 9);
}

describe("the starting state", () => {
  it("shows the demo engine's figures", () => {
    // DEMO.md A-1 row: geometric 13.73, trapped 7.38, offset 23.6 − 26.4 = −2.8 cc (consistency check)
    const figures = describeGeometry(a1());
    expectPrinted(figures.geometricRatio, 13.73, 2);
    expectPrinted(figures.trappedRatio ?? 0, 7.38, 2);
    expect(figures.chamberOffsetCc).toBeCloseTo(-2.8, 12);
    expect(figures.exhaustOpensDegAtdc).toBeCloseTo(82, 9);
    expect(figures.exhaustDurationDeg).toBeCloseTo(196, 9);
  });
});

describe("cutting the head face", () => {
  it("takes a bore-area disc out of the volume and the cut off the squish, leaving the ports", () => {
    // TRADE.md: 0.407 cc per 0.1 mm at 72 mm; squish −t; port timing unchanged
    const before = describeGeometry(a1());
    const after = describeGeometry(cutHeadFace(a1(), 0.1));
    expectPrinted(before.chamberCc - after.chamberCc, 0.407, 3);
    expectPrinted((before.flatPlateCc ?? 0) - (after.flatPlateCc ?? 0), 0.407, 3);
    expect(after.squishMm).toBeCloseTo(1.105, 12);
    expect(after.exhaustTravelMm).toBe(before.exhaustTravelMm);
    expect(after.exhaustOpensDegAtdc).toBe(before.exhaustOpensDegAtdc);
    expect(after.geometricRatio).toBeGreaterThan(before.geometricRatio);
    expect(after.trappedRatio ?? 0).toBeGreaterThan(before.trappedRatio ?? 0);
    expect(after.chamberOffsetCc).toBeCloseTo(before.chamberOffsetCc ?? 0, 12);
  });

  it("does not change the state it was given", () => {
    const start = a1();
    cutHeadFace(start, 0.3);
    expect(start.chamberCc).toBe(23.6);
    expect(start.headCutTotalMm).toBe(0);
  });

  it("is undone by the same negative cut (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1.1, noNaN: true }), (cutMm) => {
        const start = a1();
        expectSameGeometry(cutHeadFace(cutHeadFace(start, cutMm), -cutMm), start);
      }),
    );
  });

  it("refuses a cut that would let the piston touch the head", () => {
    expectFieldError(() => cutHeadFace(a1(), 1.3), "cutMm");
    expectFieldError(() => cutHeadFace(a1(), Number.NaN), "cutMm");
  });
});

describe("changing the base gasket", () => {
  it("raises volume and squish and moves the exhaust port with the cylinder", () => {
    // TRADE.md: thicker base gasket by t: squish +t, volume +A·t, ports rise (exhaust opens
    // earlier, trapped ratio falls); 0.407 cc per 0.1 mm at 72 mm
    const before = describeGeometry(a1());
    const after = describeGeometry(changeBaseGasket(a1(), 0.1));
    expectPrinted(after.chamberCc - before.chamberCc, 0.407, 3);
    expect(after.squishMm).toBeCloseTo(1.305, 12);
    expect(after.exhaustTravelMm).toBeCloseTo((before.exhaustTravelMm ?? 0) - 0.1, 12);
    expect(after.exhaustOpensDegAtdc ?? 180).toBeLessThan(before.exhaustOpensDegAtdc ?? 0);
    expect(after.exhaustDurationDeg ?? 0).toBeGreaterThan(before.exhaustDurationDeg ?? 0);
    expect(after.trappedRatio ?? 99).toBeLessThan(before.trappedRatio ?? 0);
    expect(after.geometricRatio).toBeLessThan(before.geometricRatio);
    expect(after.flatPlateCc).toBe(before.flatPlateCc); // the head is untouched
  });

  it("is undone by the opposite change (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 2, noNaN: true }), (deltaMm) => {
        const start = a1();
        expectSameGeometry(changeBaseGasket(changeBaseGasket(start, deltaMm), -deltaMm), start);
      }),
    );
  });

  it("refuses a change that closes the squish or moves the port past TDC", () => {
    expectFieldError(() => changeBaseGasket(a1(), -1.3), "deltaMm");
    const noSquish = createEngineGeometry({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: 1 });
    expectFieldError(() => changeBaseGasket(noSquish, 1.5), "deltaMm");
  });
});

describe("opening the bowl", () => {
  it("adds volume and leaves squish alone", () => {
    const after = describeGeometry(openBowl(a1(), 0.5));
    expect(after.chamberCc).toBeCloseTo(24.1, 12);
    expect(after.flatPlateCc).toBeCloseTo(26.9, 12);
    expect(after.squishMm).toBe(1.205);
  });

  it("refuses to take out more than the chamber holds", () => {
    expectFieldError(() => openBowl(a1(), -30), "addedCc");
  });
});

describe("cut the face and re-open the bowl to keep the ratio", () => {
  it("re-opens exactly the volume the cut removed", () => {
    // TRADE.md: 0.2 mm at 72 mm is 2 × 0.407 cc (0.814 cc)
    const plan = solveBowlToKeepRatio(a1(), 0.2);
    expectPrinted(plan.bowlCc, 0.814, 3);
    const before = describeGeometry(a1());
    const after = describeGeometry(plan.geometry);
    expect(after.geometricRatio).toBeCloseTo(before.geometricRatio, 12);
    expect(after.trappedRatio ?? 0).toBeCloseTo(before.trappedRatio ?? 0, 12);
    expect(after.squishMm).toBeCloseTo(1.005, 12);
    expect(plan.geometry.headCutTotalMm).toBe(0.2);
    expect(plan.geometry.bowlAddedCc).toBeCloseTo(plan.bowlCc, 15);
  });

  it("keeps the ratio for any cut the squish allows (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1.1, noNaN: true }), (cutMm) => {
        const plan = solveBowlToKeepRatio(a1(), cutMm);
        expect(describeGeometry(plan.geometry).geometricRatio).toBeCloseTo(describeGeometry(a1()).geometricRatio, 9);
        expect(plan.bowlCc).toBeGreaterThanOrEqual(0);
      }),
    );
  });
});

describe("chained plans", () => {
  it("apply in order and equal the hand-chained calls", () => {
    const steps = [
      { kind: "cut-head", mm: 0.15 },
      { kind: "base-gasket", mm: -0.1 },
      { kind: "open-bowl", cc: 0.3 },
    ] as const;
    const chained = openBowl(changeBaseGasket(cutHeadFace(a1(), 0.15), -0.1), 0.3);
    expect(applyMachiningSteps(a1(), steps)).toEqual(chained);
    expectAllFinite(describeGeometry(chained));
  });

  it("needs a rod to place the port from its angle", () => {
    expectFieldError(
      () => createEngineGeometry({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustOpensDegAtdc: 82 }),
      "rodMm",
    );
    expectFieldError(() => createEngineGeometry({ boreMm: 72, strokeMm: 73.8, chamberCc: 0 }), "chamberCc");
    expectFieldError(
      () => createEngineGeometry({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: 90 }),
      "exhaustTravelMm",
    );
  });
});
