import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { computeFourStrokeChamberForRatioCc, computeFourStrokeClearance } from "../../../src/lib/domain/four-stroke";
import type { FourStrokeParts } from "../../../src/lib/domain/four-stroke";
import { CC_PER_CUBIC_INCH, inchesToMm } from "../../../src/lib/domain/units";
import { expectFieldError, expectPrinted } from "./expect-helpers";

// Circle Track magazine, "Compression ratio rules" (2004): 4.000 in bore, 3.48 in stroke,
// deck 0.050 in, gasket 0.020 in compressed on a 4.000 in gasket bore, 5 cc valve reliefs,
// 70 cc chamber → 9.01:1 (exact arithmetic 9.0146, REFERENCES.md).
const circleTrack2004: FourStrokeParts = {
  boreMm: inchesToMm(4),
  strokeMm: inchesToMm(3.48),
  chamberCc: 70,
  gasketBoreMm: inchesToMm(4),
  gasketThicknessMm: inchesToMm(0.02),
  deckClearanceMm: inchesToMm(0.05),
  pistonVolumeCc: 5,
};

describe("four-stroke clearance volume from parts", () => {
  it("matches the Circle Track 2004 example", () => {
    const result = computeFourStrokeClearance(circleTrack2004);
    expectPrinted(result.geometricRatio, 9.01, 2); // as the article printed it
    expectPrinted(result.geometricRatio, 9.0146, 4); // REFERENCES.md exact arithmetic
    expectPrinted(result.sweptCc / CC_PER_CUBIC_INCH, 43.731, 3);
    // π/4 · 4² · 0.020 in³ and π/4 · 4² · 0.050 in³ (the formula of REFERENCES.md, in inches)
    expect(result.gasketCc).toBeCloseTo((Math.PI / 4) * 16 * 0.02 * CC_PER_CUBIC_INCH, 10);
    expect(result.deckCc).toBeCloseTo((Math.PI / 4) * 16 * 0.05 * CC_PER_CUBIC_INCH, 10);
    expect(result.clearanceCc).toBeCloseTo(70 + result.gasketCc + result.deckCc + 5, 12);
  });

  it("matches the Circle Track 2011 companion example", () => {
    // Circle Track, "Calculating compression" (2011): same engine, deck 0.033 in, 64 cc → 9.97:1 (exact 9.9674)
    const result = computeFourStrokeClearance({ ...circleTrack2004, chamberCc: 64, deckClearanceMm: inchesToMm(0.033) });
    expectPrinted(result.geometricRatio, 9.97, 2);
    expectPrinted(result.geometricRatio, 9.9674, 4);
  });

  it("counts a dome as negative volume and a piston out of the hole as negative deck", () => {
    const reliefs = computeFourStrokeClearance(circleTrack2004).geometricRatio;
    const dome = computeFourStrokeClearance({ ...circleTrack2004, pistonVolumeCc: -5 }).geometricRatio;
    const proud = computeFourStrokeClearance({ ...circleTrack2004, deckClearanceMm: -0.2 }).geometricRatio;
    expect(dome).toBeGreaterThan(reliefs);
    expect(proud).toBeGreaterThan(reliefs);
  });

  it("finds the head chamber for a target ratio", () => {
    const { chamberCc: _unused, ...parts } = circleTrack2004;
    void _unused;
    const target = computeFourStrokeClearance(circleTrack2004).geometricRatio;
    expect(computeFourStrokeChamberForRatioCc(parts, target)).toBeCloseTo(70, 9);
  });

  it("falls as the head chamber grows (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 20, max: 150, noNaN: true }), fc.double({ min: 0.1, max: 20, noNaN: true }), (chamberCc, extraCc) => {
        const small = computeFourStrokeClearance({ ...circleTrack2004, chamberCc }).geometricRatio;
        const large = computeFourStrokeClearance({ ...circleTrack2004, chamberCc: chamberCc + extraCc }).geometricRatio;
        expect(large).toBeLessThan(small);
        expect(Number.isFinite(large)).toBe(true);
      }),
    );
  });

  it("names bad fields", () => {
    expectFieldError(() => computeFourStrokeClearance({ ...circleTrack2004, chamberCc: 0 }), "chamberCc");
    expectFieldError(() => computeFourStrokeClearance({ ...circleTrack2004, gasketThicknessMm: -0.1 }), "gasketThicknessMm");
    expectFieldError(() => computeFourStrokeClearance({ ...circleTrack2004, gasketBoreMm: Number.NaN }), "gasketBoreMm");
    expectFieldError(() => computeFourStrokeClearance({ ...circleTrack2004, pistonVolumeCc: -200 }), "pistonVolumeCc");
    expectFieldError(() => computeFourStrokeClearance({ ...circleTrack2004, boreMm: -1 }), "boreMm");
    const { chamberCc: _c, ...parts } = circleTrack2004;
    void _c;
    expectFieldError(() => computeFourStrokeChamberForRatioCc(parts, 1), "targetRatio");
    expectFieldError(() => computeFourStrokeChamberForRatioCc(parts, 40), "targetRatio");
  });
});
