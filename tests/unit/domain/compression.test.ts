import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  computeCcPerMm,
  computeChamberCcForRatio,
  computeChamberOffsetCc,
  computeDisplacementCc,
  computeFlatPlateCcForRatio,
  computeGeometricRatio,
  computeHeadCutMm,
  computeInstalledCcForCutHead,
  computeInstalledCcForHead,
  computeSpread,
  computeSweptCc,
  computeTrappedRatioFromAngle,
  computeTrappedRatioFromTravel,
  summarizeCylinders,
} from "../../../src/lib/domain/compression";
import { computePistonTravelMm } from "../../../src/lib/domain/slider-crank";
import { CC_PER_CUBIC_INCH, inchesToMm } from "../../../src/lib/domain/units";
import { expectAllFinite, expectFieldError, expectPrinted, expectRelative } from "./expect-helpers";

const FORMULA = 1e-6; // REFERENCES.md: formulas to 1e-6 relative

describe("swept volume and geometric ratio", () => {
  it("follows Vs = π/4·B²·S and rc = (Vs + Vc)/Vc", () => {
    // Wikipedia, "Compression ratio", Formula section: rc = (Vd + Vc) / Vc with Vd = π/4·b²·s
    expectRelative(computeSweptCc(100, 100), (Math.PI / 4) * 100 ** 2 * 100 / 1000, FORMULA);
    expect(computeGeometricRatio(400, 40)).toBe(11);
  });

  it("matches the Circle Track engine's swept volume", () => {
    // Circle Track, "Compression ratio rules" (2004): 4.000 in bore × 3.48 in stroke = 43.731 in³
    const sweptIn3 = computeSweptCc(inchesToMm(4), inchesToMm(3.48)) / CC_PER_CUBIC_INCH;
    expectPrinted(sweptIn3, 43.731, 3);
  });

  it("matches the bore-area-per-cut table", () => {
    // TRADE.md, Machining (arithmetic): 0.229 cc per 0.1 mm at 54 mm, 0.407 at 72 mm, 0.567 at 85 mm
    expectPrinted(computeCcPerMm(54) * 0.1, 0.229, 3);
    expectPrinted(computeCcPerMm(72) * 0.1, 0.407, 3);
    expectPrinted(computeCcPerMm(85) * 0.1, 0.567, 3);
  });

  it("reproduces the demo engines' swept volumes and ratios", () => {
    // DEMO.md engine table, worked-through consistency check (printed to 0.1 cc and 0.01)
    const demo: Array<[string, number, number, number, number, number]> = [
      ["A-1", 72, 73.8, 23.6, 300.5, 13.73],
      ["A-4", 72, 73.8, 25.0, 300.5, 13.02],
      ["A-5", 85, 70, 27.5, 397.2, 15.44],
      ["A-6", 85, 70, 30.0, 397.2, 14.24],
      ["A-7", 78, 70, 24.8, 334.5, 14.49],
      ["A-2 carbon", 72, 73.8, 23.0, 300.5, 14.06],
    ];
    for (const [, bore, stroke, chamber, swept, ratio] of demo) {
      const sweptCc = computeSweptCc(bore, stroke);
      expectPrinted(sweptCc, swept, 1);
      expectPrinted(computeGeometricRatio(sweptCc, chamber), ratio, 2);
    }
    // DEMO.md prints B-1 as 10.30 and B-4 as 11.00; the arithmetic gives 10.29 and 10.99
    // (DEMO.md's rounding, not ours: the swept volumes 565.0 and 332.8 match).
    expectPrinted(computeSweptCc(92, 85), 565.0, 1);
    expectPrinted(computeGeometricRatio(computeSweptCc(92, 85), 60.8), 10.29, 2);
    expectPrinted(computeSweptCc(80, 66.2), 332.8, 1);
    expectPrinted(computeGeometricRatio(computeSweptCc(80, 66.2), 33.3), 10.99, 2);
  });

  it("multiplies by cylinders", () => {
    expectRelative(computeDisplacementCc(72, 73.8, 2), 2 * computeSweptCc(72, 73.8), 1e-15);
  });

  it("falls as the chamber grows (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 2000, noNaN: true }),
        fc.double({ min: 1, max: 200, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        (sweptCc, chamberCc, extraCc) => {
          expect(computeGeometricRatio(sweptCc, chamberCc + extraCc)).toBeLessThan(
            computeGeometricRatio(sweptCc, chamberCc),
          );
        },
      ),
    );
  });
});

describe("trapped ratio", () => {
  it("reproduces the demo engines' trapped ratios from port timing and rod", () => {
    // DEMO.md (A-1 82° ATDC rod 130; A-5 80° rod 140; A-7 81° rod 130), printed to 0.01
    const demo: Array<[number, number, number, number, number, number]> = [
      [72, 73.8, 130, 82, 23.6, 7.38],
      [72, 73.8, 130, 82, 25.0, 7.03],
      [85, 70, 140, 80, 27.5, 7.86],
      [85, 70, 140, 80, 30.0, 7.29],
      [78, 70, 130, 81, 24.8, 7.59],
    ];
    for (const [boreMm, strokeMm, rodMm, exhaustOpensDegAtdc, chamberCc, printed] of demo) {
      const t = computeTrappedRatioFromAngle({ boreMm, strokeMm, rodMm, chamberCc, exhaustOpensDegAtdc });
      expectPrinted(t.trappedRatio, printed, 2);
    }
  });

  it("from the angle equals from the travel the angle gives", () => {
    // REFERENCES.md: rc_trapped = (π/4·B²·s(A_EO) + Vc)/Vc
    const fromAngle = computeTrappedRatioFromAngle({ boreMm: 72, strokeMm: 73.8, rodMm: 130, chamberCc: 23.6, exhaustOpensDegAtdc: 82 });
    const h = computePistonTravelMm(73.8, 130, 82);
    const fromTravel = computeTrappedRatioFromTravel({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: h });
    expect(fromAngle).toEqual(fromTravel);
    expectRelative(fromTravel.trappedSweptCc, ((Math.PI / 4) * 72 * 72 * h) / 1000, FORMULA);
  });

  it("stays below the geometric ratio while the port opens before BDC (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 30, max: 110, noNaN: true }),
        fc.double({ min: 30, max: 110, noNaN: true }),
        fc.double({ min: 1.6, max: 2.5, noNaN: true }),
        fc.double({ min: 5, max: 80, noNaN: true }),
        fc.double({ min: 0, max: 179.9, noNaN: true }),
        (boreMm, strokeMm, rodShare, chamberCc, exhaustOpensDegAtdc) => {
          const t = computeTrappedRatioFromAngle({ boreMm, strokeMm, rodMm: strokeMm * rodShare, chamberCc, exhaustOpensDegAtdc });
          expect(t.trappedRatio).toBeLessThan(computeGeometricRatio(computeSweptCc(boreMm, strokeMm), chamberCc));
          expect(t.trappedRatio).toBeGreaterThanOrEqual(1);
          expectAllFinite(t);
        },
      ),
    );
  });
});

describe("chamber offset and other heads", () => {
  it("predicts the demo engines' other heads from the offset", () => {
    // DEMO.md: same cylinder, race head 26.4 cc flat → 23.6 installed; stock head 27.8 → 25.0
    const offset = computeChamberOffsetCc(23.6, 26.4);
    expect(offset).toBeCloseTo(-2.8, 12);
    expect(computeInstalledCcForHead(27.8, offset)).toBeCloseTo(25.0, 12);
    // DEMO.md: altitude inserts 31.0 → 27.5, low-altitude inserts 33.5 → 30.0
    expect(computeInstalledCcForHead(33.5, computeChamberOffsetCc(27.5, 31.0))).toBeCloseTo(30.0, 12);
  });

  it("predicts a cut head: one bore-area disc less", () => {
    // TRADE.md: 0.407 cc per 0.1 mm at 72 mm
    const installed = computeInstalledCcForCutHead(26.4, -2.8, 72, 0.1);
    expectPrinted(23.6 - installed, 0.407, 3);
  });

  it("finds the chamber, flat plate and cut for a target ratio", () => {
    const sweptCc = computeSweptCc(72, 73.8);
    // Rearranged formula rc = (Vs + Vc)/Vc → Vc = Vs/(rc − 1); round trip to 1e-12
    const chamberCc = computeChamberCcForRatio(sweptCc, computeGeometricRatio(sweptCc, 23.6));
    expect(chamberCc).toBeCloseTo(23.6, 12);
    const target = computeChamberCcForRatio(sweptCc, 14);
    expect(computeGeometricRatio(sweptCc, target)).toBeCloseTo(14, 12);
    expect(computeFlatPlateCcForRatio(sweptCc, 14, -2.8)).toBeCloseTo(target + 2.8, 12);
    const cutMm = computeHeadCutMm(72, 23.6, target);
    expect(cutMm).toBeGreaterThan(0);
    expect(cutMm * computeCcPerMm(72)).toBeCloseTo(23.6 - target, 12);
    expect(computeHeadCutMm(72, 23.6, 25)).toBeLessThan(0); // a lower ratio means add
  });
});

describe("multi-cylinder spread", () => {
  it("flags the demo triple's build-time chamber spread", () => {
    // DEMO.md A-7: 24.8 / 24.4 / 24.8 cc, over the 0.3 cc spread threshold of TRADE.md (common practice)
    const summary = summarizeCylinders(78, 70, [{ chamberCc: 24.8 }, { chamberCc: 24.4 }, { chamberCc: 24.8 }]);
    expect(summary.chamber.spread).toBeCloseTo(0.4, 12);
    expect(summary.chamber.spread).toBeGreaterThan(0.3);
    expectRelative(summary.chamber.spreadPercent, (0.4 / 24.8) * 100, 1e-12);
    expect(summary.cylinders[1].geometricRatio).toBeGreaterThan(summary.cylinders[0].geometricRatio);
    expect(summary.squish).toBeUndefined();
    // After re-opening the centre chamber to 24.7 cc
    const after = summarizeCylinders(78, 70, [{ chamberCc: 24.8 }, { chamberCc: 24.7 }, { chamberCc: 24.8 }]);
    expect(after.chamber.spread).toBeLessThan(0.3);
  });

  it("summarises ratio and squish spreads", () => {
    // DEMO.md A-2 after 5.5 h: 23.0 and 23.5 cc (spread 0.5 cc), squish 1.13 against 1.20
    const summary = summarizeCylinders(72, 73.8, [
      { chamberCc: 23.0, squishSidesMm: [1.13, 1.13] },
      { chamberCc: 23.5, squishSidesMm: [1.2, 1.21] },
    ]);
    expect(summary.chamber.spread).toBeCloseTo(0.5, 12);
    expectPrinted(summary.cylinders[0].geometricRatio, 14.06, 2);
    expect(summary.ratio.max).toBe(summary.cylinders[0].geometricRatio);
    expect(summary.squish?.spread).toBeCloseTo(0.075, 12);
  });

  it("measures spread against the highest value", () => {
    expect(computeSpread("crankingKpa", [900, 1000])).toEqual({ min: 900, max: 1000, spread: 100, spreadPercent: 10 });
  });
});

describe("invalid input", () => {
  it("names the field", () => {
    expectFieldError(() => computeSweptCc(-72, 73.8), "boreMm");
    expectFieldError(() => computeSweptCc(0, 73.8), "boreMm");
    expectFieldError(() => computeSweptCc(Number.NaN, 73.8), "boreMm");
    expectFieldError(() => computeSweptCc(72, -1), "strokeMm");
    expectFieldError(() => computeGeometricRatio(300, 0), "chamberCc");
    expectFieldError(() => computeDisplacementCc(72, 73.8, 0), "cylinders");
    expectFieldError(() => computeDisplacementCc(72, 73.8, 1.5), "cylinders");
    expectFieldError(() => computeChamberCcForRatio(300, 1), "targetRatio");
    expectFieldError(() => computeChamberCcForRatio(300, Number.NaN), "targetRatio");
    expectFieldError(() => computeTrappedRatioFromTravel({ boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: 80 }), "exhaustTravelMm");
    expectFieldError(() => computeTrappedRatioFromAngle({ boreMm: 72, strokeMm: 73.8, rodMm: 30, chamberCc: 23.6, exhaustOpensDegAtdc: 82 }), "rodMm");
    expectFieldError(() => computeTrappedRatioFromAngle({ boreMm: 72, strokeMm: 73.8, rodMm: 130, chamberCc: 23.6, exhaustOpensDegAtdc: 190 }), "exhaustOpensDegAtdc");
    expectFieldError(() => computeInstalledCcForHead(2, -2.8), "chamberOffsetCc");
    expectFieldError(() => computeInstalledCcForCutHead(26.4, -2.8, 72, 60), "headCutMm");
    expectFieldError(() => computeFlatPlateCcForRatio(300, 100, 10), "targetRatio");
    expectFieldError(() => computeSpread("chamberCc", []), "chamberCc");
    expectFieldError(() => summarizeCylinders(72, 73.8, []), "cylinders");
  });

  it("returns finite numbers for every valid input (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 200, noNaN: true }),
        fc.double({ min: 1, max: 200, noNaN: true }),
        fc.double({ min: 0.1, max: 500, noNaN: true }),
        fc.double({ min: 1.01, max: 30, noNaN: true }),
        (boreMm, strokeMm, chamberCc, targetRatio) => {
          const sweptCc = computeSweptCc(boreMm, strokeMm);
          expectAllFinite([
            sweptCc,
            computeGeometricRatio(sweptCc, chamberCc),
            computeChamberCcForRatio(sweptCc, targetRatio),
            computeHeadCutMm(boreMm, chamberCc, computeChamberCcForRatio(sweptCc, targetRatio)),
            summarizeCylinders(boreMm, strokeMm, [{ chamberCc }, { chamberCc: chamberCc * 1.01 }]),
          ]);
        },
      ),
    );
  });
});
