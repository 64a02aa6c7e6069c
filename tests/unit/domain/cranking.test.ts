import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { standardAtmosphere } from "../../../src/lib/domain/atmosphere";
import {
  convertCrankingBetweenAmbients,
  convertCrankingToElevation,
  DEFAULT_POLYTROPIC_EXPONENT,
  estimateCrankingKpa,
  fitPolytropicExponent,
} from "../../../src/lib/domain/cranking";
import type { CrankingSample } from "../../../src/lib/domain/cranking";
import { kpaToPsi, psiToKpa } from "../../../src/lib/domain/units";
import { expectFieldError, expectPrinted, expectRelative } from "./expect-helpers";

describe("cranking estimate", () => {
  it("reproduces the published dynamic-compression example", () => {
    // Wikipedia, "Compression ratio", dynamic compression ratio: 14.7 psi · 7.5^1.3 = 201.8 psia, 187.1 psig
    expect(DEFAULT_POLYTROPIC_EXPONENT).toBe(1.3);
    const estimate = estimateCrankingKpa(psiToKpa(14.7), 7.5);
    expectPrinted(kpaToPsi(estimate.absoluteKpa), 201.8, 1);
    expectPrinted(kpaToPsi(estimate.gaugeKpa), 187.1, 1);
  });

  it("reads zero on the gauge at a ratio of one and rises with the ratio (property)", () => {
    expect(estimateCrankingKpa(97, 1).gaugeKpa).toBe(0);
    fc.assert(
      fc.property(
        fc.double({ min: 30, max: 110, noNaN: true }),
        fc.double({ min: 1, max: 20, noNaN: true }),
        fc.double({ min: 1, max: 1.4, noNaN: true }),
        (ambientKpa, ratio, n) => {
          const low = estimateCrankingKpa(ambientKpa, ratio, n);
          const high = estimateCrankingKpa(ambientKpa, ratio + 0.1, n);
          expect(high.gaugeKpa).toBeGreaterThan(low.gaugeKpa);
          expect(low.absoluteKpa - low.gaugeKpa).toBeCloseTo(ambientKpa, 9);
        },
      ),
    );
  });

  it("names bad fields", () => {
    expectFieldError(() => estimateCrankingKpa(0, 7.5), "ambientKpa");
    expectFieldError(() => estimateCrankingKpa(97, 0.9), "trappedRatio");
    expectFieldError(() => estimateCrankingKpa(97, Number.NaN), "trappedRatio");
    expectFieldError(() => estimateCrankingKpa(97, 7.5, 3), "polytropicExponent");
  });
});

describe("fitting n to a team's own readings", () => {
  const elevations = [366, 451, 975, 2103, 2621];
  const ratios = [7.38, 7.38, 7.86, 7.86, 7.59];

  function readingsFor(n: number, noiseKpa: readonly number[] = []): CrankingSample[] {
    return elevations.map((elevationM, i) => {
      const ambientKpa = standardAtmosphere(elevationM).pressureKpa;
      return { ambientKpa, ratio: ratios[i], gaugeKpa: estimateCrankingKpa(ambientKpa, ratios[i], n).gaugeKpa + (noiseKpa[i] ?? 0) };
    });
  }

  it("recovers the exponent of noise-free readings", () => {
    const fit = fitPolytropicExponent(readingsFor(1.17));
    expect(fit.n).toBeCloseTo(1.17, 9);
    expect(fit.rmsErrorKpa).toBeLessThan(1e-6);
  });

  it("recovers n from the published example's single reading", () => {
    // Wikipedia, "Compression ratio": 187.1 psig at 14.7 psi and rc 7.5 means n = 1.3; the printed
    // 0.05 psi rounding allows 0.05 / (201.8 · ln 7.5) ≈ 1.3e-4 in n
    const fit = fitPolytropicExponent([{ ambientKpa: psiToKpa(14.7), ratio: 7.5, gaugeKpa: psiToKpa(187.1) }]);
    expect(Math.abs(fit.n - 1.3)).toBeLessThan(1.3e-4);
  });

  it("finds the least-squares minimum (checked by brute force on a fine grid)", () => {
    const samples = readingsFor(1.2, [12, -20, 7, -3, 15]);
    const fit = fitPolytropicExponent(samples);
    const sse = (n: number): number =>
      samples.reduce((sum, s) => sum + (estimateCrankingKpa(s.ambientKpa, s.ratio, n).gaugeKpa - s.gaugeKpa) ** 2, 0);
    let bestN = 0.5;
    for (let n = 0.5; n <= 2; n += 1e-5) if (sse(n) < sse(bestN)) bestN = n;
    expect(Math.abs(fit.n - bestN)).toBeLessThan(2e-5);
    expectRelative(fit.rmsErrorKpa, Math.sqrt(sse(fit.n) / samples.length), 1e-9);
    expect(sse(fit.n)).toBeLessThanOrEqual(sse(fit.n + 1e-4));
    expect(sse(fit.n)).toBeLessThanOrEqual(sse(fit.n - 1e-4));
  });

  it("recovers any plausible exponent (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.8, max: 1.6, noNaN: true }), (n) => {
        expect(fitPolytropicExponent(readingsFor(n)).n).toBeCloseTo(n, 8);
      }),
      { numRuns: 40 },
    );
  });

  it("refuses readings no gauge would give", () => {
    expectFieldError(() => fitPolytropicExponent([]), "samples");
    expectFieldError(() => fitPolytropicExponent([{ ambientKpa: 97, ratio: 1, gaugeKpa: 100 }]), "samples");
    expectFieldError(() => fitPolytropicExponent([{ ambientKpa: 97, ratio: 7, gaugeKpa: 50000 }]), "samples");
    expectFieldError(() => fitPolytropicExponent([{ ambientKpa: 97, ratio: 7, gaugeKpa: -5 }]), "samples[0].gaugeKpa");
    expectFieldError(() => fitPolytropicExponent([{ ambientKpa: Number.NaN, ratio: 7, gaugeKpa: 800 }]), "samples[0].ambientKpa");
  });
});

describe("carrying a reading to another elevation", () => {
  it("scales by the ratio of absolute ambient pressures", () => {
    // TRADE.md: reading_at_ref ≈ reading × p(ref) / p(where taken)
    const reading = psiToKpa(108);
    const atShop = convertCrankingToElevation(reading, 2621, 366);
    expectRelative(atShop, (reading * standardAtmosphere(366).pressureKpa) / standardAtmosphere(2621).pressureKpa, 1e-12);
    expect(atShop).toBeGreaterThan(reading);
    expect(convertCrankingToElevation(reading, 1000, 1000)).toBe(reading);
  });

  it("agrees with the model whether carried as gauge or as absolute pressure (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -500, max: 9000, noNaN: true }),
        fc.double({ min: -500, max: 9000, noNaN: true }),
        fc.double({ min: 2, max: 12, noNaN: true }),
        (from, to, ratio) => {
          const there = estimateCrankingKpa(standardAtmosphere(from).pressureKpa, ratio);
          const here = estimateCrankingKpa(standardAtmosphere(to).pressureKpa, ratio);
          expectRelative(convertCrankingToElevation(there.gaugeKpa, from, to), here.gaugeKpa, 1e-9);
          const viaAbsolute =
            convertCrankingBetweenAmbients(there.absoluteKpa, standardAtmosphere(from).pressureKpa, standardAtmosphere(to).pressureKpa) -
            standardAtmosphere(to).pressureKpa;
          expectRelative(viaAbsolute, here.gaugeKpa, 1e-9);
        },
      ),
    );
  });

  it("round-trips (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 3000, noNaN: true }), fc.double({ min: -500, max: 9000, noNaN: true }), (reading, to) => {
        expect(convertCrankingToElevation(convertCrankingToElevation(reading, 366, to), to, 366)).toBeCloseTo(reading, 8);
      }),
    );
  });

  it("names bad fields", () => {
    expectFieldError(() => convertCrankingToElevation(800, 9500, 0), "fromElevationM");
    expectFieldError(() => convertCrankingToElevation(800, 0, -600), "toElevationM");
    expectFieldError(() => convertCrankingToElevation(-1, 0, 0), "readingKpaGauge");
    expectFieldError(() => convertCrankingBetweenAmbients(800, 0, 97), "fromAmbientKpa");
  });
});
