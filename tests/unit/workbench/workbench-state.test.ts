import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { IMPERIAL_UNITS, METRIC_UNITS, type UnitChoice } from "../../../src/lib/domain/units";
import {
  changeUnits,
  convertTypedValue,
  createEmptyState,
  formatForUnits,
  parseQuery,
  parseTypedNumber,
  serializeState,
  type WorkbenchState,
} from "../../../src/components/workbench/workbench-state";

const unitChoice = fc.record<UnitChoice>({
  length: fc.constantFrom("mm", "in"),
  volume: fc.constantFrom("cc", "in3"),
  pressure: fc.constantFrom("kPa", "bar", "psi"),
  elevation: fc.constantFrom("m", "ft"),
  temperature: fc.constantFrom("C", "F"),
});

function a1State(units: UnitChoice = METRIC_UNITS): WorkbenchState {
  return {
    ...createEmptyState(units),
    bore: "72",
    stroke: "73.8",
    rod: "130",
    cylinders: "2",
    chamber: "23.6",
    plate: "26.4",
    exhaustOpens: "82",
    squish: "1.2",
    elevation: "396",
    airTemp: "-5",
    plan: [
      { id: 1, kind: "cut", value: "0.2" },
      { id: 2, kind: "bowl", value: "0.5" },
    ],
  };
}

describe("parseTypedNumber", () => {
  it("reads plain numbers, a decimal comma and nothing else", () => {
    expect(parseTypedNumber("72")).toBe(72);
    expect(parseTypedNumber(" -2.8 ")).toBe(-2.8);
    expect(parseTypedNumber("1,2")).toBe(1.2);
    expect(parseTypedNumber(".5")).toBe(0.5);
    expect(parseTypedNumber("")).toBeUndefined();
    expect(parseTypedNumber("   ")).toBeUndefined();
    for (const bad of ["NaN", "Infinity", "0x10", "72mm", "1,234.5", "--1", "1e"]) expect(parseTypedNumber(bad)).toBeNaN();
  });
});

describe("unit conversion of typed values", () => {
  it("uses the exact factors", () => {
    // inch = 25.4 mm exactly (international yard and pound, 1959)
    expect(convertTypedValue("25.4", "length", METRIC_UNITS, IMPERIAL_UNITS)).toBe("1");
    // cubic inch = 16.387064 cc exactly
    expect(convertTypedValue("16.387064", "volume", METRIC_UNITS, IMPERIAL_UNITS)).toBe("1");
    // foot = 0.3048 m exactly; −40 °C = −40 °F
    expect(convertTypedValue("1000", "elevation", IMPERIAL_UNITS, METRIC_UNITS)).toBe("304.8");
    expect(convertTypedValue("-40", "temperature", METRIC_UNITS, IMPERIAL_UNITS)).toBe("-40");
  });

  it("leaves text that is not a number, and quantities without units, as typed", () => {
    expect(convertTypedValue("7x", "length", METRIC_UNITS, IMPERIAL_UNITS)).toBe("7x");
    expect(convertTypedValue("82", null, METRIC_UNITS, IMPERIAL_UNITS)).toBe("82");
    expect(convertTypedValue("", "volume", METRIC_UNITS, IMPERIAL_UNITS)).toBe("");
  });

  it("returns what was typed after switching there and back (property)", () => {
    // Typed values carry the shop's precision: lengths to 0.01 mm, volumes to 0.1 cc,
    // elevations to 1 m, temperatures to 0.1 °C.
    const cases = [
      { field: "bore" as const, max: 2000, step: 100 },
      { field: "squish" as const, max: 10, step: 100 },
      { field: "chamber" as const, max: 2000, step: 10 },
      { field: "elevation" as const, max: 9000, step: 1 },
      { field: "airTemp" as const, max: 60, step: 10 },
    ];
    for (const { field, max, step } of cases) {
      fc.assert(
        fc.property(fc.integer({ min: -max * step, max: max * step }), unitChoice, unitChoice, (n, start, other) => {
          const typed = String(n / step);
          const state = { ...createEmptyState(start), [field]: typed };
          const there = changeUnits(state, other);
          // Through the address (no memory), a reload is within the conversion's rounding…
          const reloaded = parseQuery(serializeState(there), start).state;
          const back = changeUnits(there, start);
          const viaAddress = changeUnits(reloaded, start);
          // (the coarsest: 0.1 °F is 0.056 °C, so half of it, 0.028 °C)
          expect(Math.abs(Number(viaAddress[field]) - n / step)).toBeLessThanOrEqual(0.03);
          // …and on the page the typed text comes back exactly.
          expect(back[field]).toBe(typed);
        }),
      );
    }
  });

  it("forgets the typed text once the converted value is edited", () => {
    const typed = { ...createEmptyState(METRIC_UNITS), elevation: "7178" };
    const inFeet = changeUnits(typed, IMPERIAL_UNITS);
    // 7178 / 0.3048 = 23549.87 ft; back from the rounded 23549.9 ft would be 7178.01 m.
    expect(inFeet.elevation).toBe("23549.9");
    expect(changeUnits(inFeet, METRIC_UNITS).elevation).toBe("7178");
    const edited = { ...inFeet, elevation: "23550" };
    expect(changeUnits(edited, METRIC_UNITS).elevation).toBe("7178.04");
  });

  it("carries every field and step to new units, and back", () => {
    const metric = a1State();
    const imperial = changeUnits(metric, IMPERIAL_UNITS);
    expect(imperial.bore).toBe("2.83465");
    expect(imperial.chamber).toBe("1.44016");
    expect(imperial.elevation).toBe("1299.2");
    expect(imperial.airTemp).toBe("23");
    expect(imperial.exhaustOpens).toBe("82");
    expect(imperial.cylinders).toBe("2");
    expect(imperial.plan.map((s) => s.value)).toEqual(["0.00787", "0.03051"]);
    const again = changeUnits(imperial, METRIC_UNITS);
    for (const field of ["bore", "stroke", "rod", "chamber", "plate", "squish", "elevation", "airTemp"] as const) {
      expect(Number(again[field])).toBeCloseTo(Number(metric[field]), 6);
    }
    expect(again.plan.map((s) => Number(s.value))).toEqual([0.2, 0.5]);
  });

  it("formats a domain value for typing in the person's units", () => {
    expect(formatForUnits("elevation", 366, IMPERIAL_UNITS)).toBe("1200.8");
    expect(formatForUnits("elevation", 366, METRIC_UNITS)).toBe("366");
  });
});

describe("the state in the query string", () => {
  it("survives a round trip", () => {
    const state = { ...a1State(IMPERIAL_UNITS), chamberMode: "plate" as const, offset: "-2.8", exhaustMode: "duration" as const, exhaustDuration: "196" };
    const query = serializeState(state);
    expect(query).toMatch(/^u=in\.in3\.psi\.ft\.F&/);
    const parsed = parseQuery(`?${query}`, METRIC_UNITS);
    expect(parsed.unitsFromQuery).toBe(true);
    expect(parsed.hasValues).toBe(true);
    expect(parsed.state).toEqual({ ...state, memory: {} });
  });

  it("survives a round trip for any units and plan (property)", () => {
    const typed = fc.stringMatching(/^-?\d{1,4}(\.\d{1,3})?$/);
    fc.assert(
      fc.property(
        unitChoice,
        typed,
        typed,
        fc.array(fc.record({ kind: fc.constantFrom("cut" as const, "gasket" as const, "bowl" as const, "keep" as const), value: typed }), { maxLength: 6 }),
        (units, bore, elevation, steps) => {
          const state: WorkbenchState = { ...createEmptyState(units), bore, elevation, plan: steps.map((s, i) => ({ id: i + 1, ...s })) };
          expect(parseQuery(serializeState(state), METRIC_UNITS).state).toEqual(state);
        },
      ),
    );
  });

  it("falls back to the saved units and ignores what it does not know", () => {
    const parsed = parseQuery("?bore=72&u=furlong.cc&plan=cut:0.1,drill:3&cm=sideways&colour=red", IMPERIAL_UNITS);
    expect(parsed.state.units).toEqual({ ...IMPERIAL_UNITS, volume: "cc" });
    expect(parsed.state.plan).toEqual([{ id: 1, kind: "cut", value: "0.1" }]);
    expect(parsed.state.chamberMode).toBe("installed");
    expect(parsed.state.bore).toBe("72");
    const empty = parseQuery("", METRIC_UNITS);
    expect(empty.hasValues).toBe(false);
    expect(empty.unitsFromQuery).toBe(false);
    expect(empty.state.units).toEqual(METRIC_UNITS);
  });

  it("cuts over-long values and plans down to size", () => {
    const long = "9".repeat(200);
    const plan = Array.from({ length: 40 }, () => "cut:0.1").join(",");
    const parsed = parseQuery(`?bore=${long}&plan=${plan}`, METRIC_UNITS);
    expect(parsed.state.bore.length).toBeLessThanOrEqual(24);
    expect(parsed.state.plan.length).toBeLessThanOrEqual(12);
  });
});
