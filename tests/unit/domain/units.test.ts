import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { unit } from "mathjs";
import {
  barToKpa,
  CC_PER_CUBIC_INCH,
  ccToCubicInches,
  celsiusToFahrenheit,
  convertFromSi,
  convertToSi,
  cubicInchesToCc,
  fahrenheitToCelsius,
  feetToMetres,
  formatNumber,
  formatQuantity,
  getUnitLabel,
  IMPERIAL_UNITS,
  inchesToMm,
  KG_PER_POUND,
  KPA_PER_PSI,
  kpaToBar,
  kpaToPsi,
  M_PER_FOOT,
  METRIC_UNITS,
  metresToFeet,
  MM_PER_INCH,
  MM_PER_THOU,
  mmToInches,
  mmToThou,
  N_PER_POUND_FORCE,
  PA_PER_PSI,
  psiToKpa,
  STANDARD_GRAVITY_M_S2,
  thouToMm,
} from "../../../src/lib/domain/units";
import type { QuantityKind } from "../../../src/lib/domain/units";
import { expectFieldError, expectRelative } from "./expect-helpers";

const EXACT = 1e-12; // REFERENCES.md: exact factors to 1e-12 relative

describe("exact unit factors", () => {
  it("match the definitions of the 1959 international yard and pound agreement", () => {
    // International yard and pound agreement (1959); NIST SP 811 appendix B: inch = 25.4 mm exactly
    expect(MM_PER_INCH).toBe(25.4);
    // Same agreement: foot = 0.3048 m exactly
    expect(M_PER_FOOT).toBe(0.3048);
    // NIST SP 811 appendix B: mil (0.001 in) = 2.54e-5 m exactly
    expectRelative(MM_PER_THOU, MM_PER_INCH / 1000, EXACT);
    // 16 CFR 500.19 and NIST SP 811: cubic inch = 16.387064 cm³ exactly (= 2.54³)
    expect(CC_PER_CUBIC_INCH).toBe(16.387064);
    expectRelative(2.54 ** 3, CC_PER_CUBIC_INCH, EXACT);
    // 1959 agreement: pound = 0.45359237 kg exactly
    expect(KG_PER_POUND).toBe(0.45359237);
  });

  it("derives the psi from the pound, standard gravity and the inch", () => {
    // NIST SP 811 appendix B: lbf = 4.4482216152605 N exactly (pound × 9.80665 m/s²)
    expectRelative(KG_PER_POUND * STANDARD_GRAVITY_M_S2, N_PER_POUND_FORCE, EXACT);
    // REFERENCES.md: psi = lbf / in² = 6894.757293168 Pa
    expectRelative(N_PER_POUND_FORCE / (0.0254 * 0.0254), PA_PER_PSI, EXACT);
    expectRelative(PA_PER_PSI, 6894.757293168, EXACT);
    expectRelative(KPA_PER_PSI * 1000, PA_PER_PSI, EXACT);
  });

  it("agree with mathjs unit() conversions, an independent registry reference", () => {
    // mathjs 15 unit definitions (npm registry reference library)
    expectRelative(unit(1, "inch").toNumber("mm"), MM_PER_INCH, EXACT);
    expectRelative(unit(1, "ft").toNumber("m"), M_PER_FOOT, EXACT);
    expectRelative(unit(1, "mil").toNumber("mm"), MM_PER_THOU, EXACT);
    expectRelative(unit(1, "in^3").toNumber("cm^3"), CC_PER_CUBIC_INCH, EXACT);
    expectRelative(unit(1, "lbm").toNumber("kg"), KG_PER_POUND, EXACT);
    expectRelative(unit(1, "lbf").toNumber("N"), N_PER_POUND_FORCE, EXACT);
    expectRelative(unit(1, "bar").toNumber("kPa"), barToKpa(1), EXACT);
    // REFERENCES.md: mathjs's psi factor agrees to 1e-10 (it is not built from the exact lbf)
    expectRelative(unit(1, "psi").toNumber("Pa"), PA_PER_PSI, 1e-10);
  });

  it("converts temperatures as mathjs does", () => {
    // mathjs degF/degC; fixed points: water boils at 212 °F = 100 °C, the scales cross at −40
    for (const f of [212, 32, -40, -13, 98.6]) {
      expect(fahrenheitToCelsius(f)).toBeCloseTo(unit(f, "degF").toNumber("degC"), 10);
    }
    expect(fahrenheitToCelsius(212)).toBe(100);
    expect(celsiusToFahrenheit(-40)).toBe(-40);
  });
});

describe("converters", () => {
  it("give the exact textbook values", () => {
    // 1959 agreement: 1 in = 25.4 mm; 1 thou = 0.0254 mm; 1 ft = 0.3048 m
    expect(inchesToMm(4)).toBeCloseTo(101.6, 12);
    expect(mmToThou(0.0254)).toBeCloseTo(1, 12);
    expect(metresToFeet(0.3048)).toBeCloseTo(1, 12);
    // 14.7 psi (the sea-level figure of Wikipedia's dynamic compression example) in kPa
    expectRelative(psiToKpa(14.7), 14.7 * 6.894757293168, EXACT);
  });

  const finite = fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true });
  const pairs: Array<[string, (x: number) => number, (x: number) => number]> = [
    ["inches", inchesToMm, mmToInches],
    ["thou", thouToMm, mmToThou],
    ["cubic inches", cubicInchesToCc, ccToCubicInches],
    ["psi", psiToKpa, kpaToPsi],
    ["bar", barToKpa, kpaToBar],
    ["feet", feetToMetres, metresToFeet],
    ["fahrenheit", fahrenheitToCelsius, celsiusToFahrenheit],
  ];
  for (const [name, there, back] of pairs) {
    it(`round-trips ${name} (property)`, () => {
      fc.assert(
        fc.property(finite, (x) => {
          const again = back(there(x));
          expect(Math.abs(again - x)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(x)) * 32);
        }),
      );
    });
  }

  it("round-trips every quantity through the user's units (property)", () => {
    const kinds: QuantityKind[] = ["length", "squish", "volume", "pressure", "elevation", "temperature", "ratio", "angle", "percent"];
    fc.assert(
      fc.property(
        fc.constantFrom(...kinds),
        fc.constantFrom<"metric" | "imperial">("metric", "imperial"),
        fc.constantFrom<"kPa" | "bar" | "psi">("kPa", "bar", "psi"),
        fc.double({ min: -1e5, max: 1e5, noNaN: true, noDefaultInfinity: true }),
        (kind, base, pressure, x) => {
          const system = { ...(base === "metric" ? METRIC_UNITS : IMPERIAL_UNITS), pressure };
          const again = convertToSi(kind, convertFromSi(kind, x, system), system);
          expect(Math.abs(again - x)).toBeLessThanOrEqual(1e-11 * Math.max(1, Math.abs(x)));
        },
      ),
    );
  });

  it("reads a user's typed value in their units", () => {
    expect(convertToSi("length", 2.835, "imperial")).toBeCloseTo(72.009, 12);
    expect(convertToSi("volume", 1, "imperial")).toBe(16.387064);
    expect(convertToSi("pressure", 1.5, { ...METRIC_UNITS, pressure: "bar" })).toBe(150);
    expect(convertToSi("elevation", 7900, "imperial")).toBeCloseTo(2407.92, 9);
    expect(convertToSi("ratio", 13.73, "imperial")).toBe(13.73);
  });
});

describe("formatQuantity", () => {
  it("shows each quantity with its unit at shop precision", () => {
    expect(formatQuantity("squish", 1.2, "metric")).toBe("1.20 mm");
    expect(formatQuantity("squish", 1.2, "imperial")).toBe("0.047 in");
    expect(formatQuantity("length", 72, "metric")).toBe("72.00 mm");
    expect(formatQuantity("volume", 23.6, "metric")).toBe("23.6 cc");
    expect(formatQuantity("volume", 16.387064, "imperial")).toBe("1.000 in³");
    expect(formatQuantity("ratio", 13.732076, "metric")).toBe("13.73:1");
    expect(formatQuantity("pressure", 101.325, "metric")).toBe("101.3 kPa");
    expect(formatQuantity("pressure", 101.325, "imperial")).toBe("14.7 psi");
    expect(formatQuantity("pressure", 101.325, { ...METRIC_UNITS, pressure: "bar" })).toBe("1.01 bar");
    expect(formatQuantity("elevation", 2408, "imperial")).toBe("7900 ft");
    expect(formatQuantity("elevation", 2408, "metric")).toBe("2408 m");
    expect(formatQuantity("temperature", -25, "imperial")).toBe("-13.0 °F");
    expect(formatQuantity("angle", 82, "metric")).toBe("82.0°");
    expect(formatQuantity("percent", -1.6949, "metric")).toBe("-1.7%");
    expect(getUnitLabel("volume", "imperial")).toBe("in³");
  });

  it("never prints a negative zero", () => {
    expect(formatQuantity("volume", -0.04, "metric")).toBe("0.0 cc");
    expect(formatNumber(-0.0001, 2)).toBe("0.00");
    expect(formatNumber(-0, 0)).toBe("0");
  });

  it("refuses NaN and infinities", () => {
    expectFieldError(() => formatQuantity("volume", Number.NaN, "metric"), "value");
    expectFieldError(() => formatQuantity("ratio", Infinity, "metric"), "value");
    expectFieldError(() => convertToSi("length", Number.NaN, "imperial"), "value");
  });
});
