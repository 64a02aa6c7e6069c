import { describe, expect, it } from "vitest";
import {
  buildRequest,
  changeDraftUnits,
  createDraft,
  isDraftChanged,
  mapServerFields,
  type ReadingDraft,
} from "../../../src/components/motors/reading-form-state.ts";
import { IMPERIAL_UNITS, METRIC_UNITS } from "../../../src/lib/domain/units.ts";

function draft(units = METRIC_UNITS, baseline = false): ReadingDraft {
  return createDraft({ cylinders: 2, today: "2026-12-01", shopElevationM: 366, units, baseline });
}

describe("createDraft", () => {
  it("starts at the shop's elevation in the reader's unit, with two burette fields per cylinder", () => {
    expect(draft().elevation).toBe("366");
    // 366 m / 0.3048 m per ft (exact, 1959) = 1200.79 ft
    expect(draft(IMPERIAL_UNITS).elevation).toBe("1200.8");
    expect(draft().cylinders.map((c) => c.chamber)).toEqual([["", ""], ["", ""]]);
    expect(draft(METRIC_UNITS, true)).toMatchObject({ isBaseline: true, setKind: "build" });
  });
});

describe("buildRequest", () => {
  it("sends SI values and only the cylinders that were measured", () => {
    const d = draft();
    d.cylinders[1] = { ...d.cylinders[1], chamber: ["23.4", "24,0", "23.5"], squishA: "1.19", squishB: "1.22", cranking: "0", leak: "4" };
    const { request, errors } = buildRequest(d, METRIC_UNITS, 7, [11]);
    expect(errors).toEqual({});
    expect(request?.sentCylinders).toEqual([2]);
    expect(request?.body).toMatchObject({
      engineId: 7,
      takenOn: "2026-12-01",
      elevationM: 366,
      uploadIds: [11],
      cylinders: [{ cylinderNo: 2, chamberReadingsCc: [23.4, 24, 23.5], squishAMm: 1.19, squishBMm: 1.22, crankingKpa: 0, leakdownPct: 4, flatPlateCc: null }],
    });
  });

  it("converts imperial entries: inches, cubic inches, psi and feet", () => {
    const d = draft(IMPERIAL_UNITS);
    d.cylinders[0] = { ...d.cylinders[0], chamber: ["1.44", "1.44"], squishA: "0.047", squishB: "0.048", cranking: "146" };
    const body = buildRequest(d, IMPERIAL_UNITS, 1, []).request?.body as { elevationM: number; cylinders: Record<string, number | number[]>[] };
    // Exact definitions (NIST SP 811 appendix B): 1 in³ = 16.387064 cc, 1 in = 25.4 mm, 1 psi = 6.894757 kPa
    expect((body.cylinders[0].chamberReadingsCc as number[])[0]).toBeCloseTo(23.5974, 4);
    expect(body.cylinders[0].squishAMm).toBeCloseTo(1.1938, 4);
    expect(body.cylinders[0].crankingKpa).toBeCloseTo(1006.63, 2);
    expect(body.elevationM).toBe(366);
  });

  it("names each field that cannot be sent, and sends nothing", () => {
    const d = draft();
    d.elevation = "high";
    d.cylinders[0] = { ...d.cylinders[0], chamber: ["23.6", "-1"], squishA: "1.2", leak: "120" };
    const { request, errors } = buildRequest(d, METRIC_UNITS, 1, []);
    expect(request).toBeNull();
    expect(errors).toEqual({
      elevation: "Enter a number.",
      "cyl-1-chamber-1": "Enter a value greater than zero.",
      "cyl-1-leak": "Leak-down is at most 100 %.",
      "cyl-1-squishB": "Read squish on both sides of the pin axis.",
    });
    expect(buildRequest(draft(), METRIC_UNITS, 1, []).errors.form).toBe("Enter the readings of at least one cylinder.");
  });
});

describe("mapServerFields", () => {
  it("puts the server's field names on the form's fields, by the cylinders that were sent", () => {
    expect(
      mapServerFields(
        { "cylinders.0.chamberReadingsCc.1": "Enter at most 2000 cc.", "cylinders.1.squishAMm": "Read squish on both sides.", elevationM: "Too high.", uploadIds: "Belongs elsewhere.", takenOn: "In the future." },
        [2, 3],
      ),
    ).toEqual({ "cyl-2-chamber-1": "Enter at most 2000 cc.", "cyl-3-squishA": "Read squish on both sides.", elevation: "Too high.", photos: "Belongs elsewhere.", takenOn: "In the future." });
  });
});

describe("changeDraftUnits and isDraftChanged", () => {
  it("converts what was typed and back without drift", () => {
    const d = draft();
    d.cylinders[0] = { ...d.cylinders[0], chamber: ["23.6", ""], squishA: "1.2" };
    const there = changeDraftUnits(d, METRIC_UNITS, IMPERIAL_UNITS);
    // 23.6 cc / 16.387064 cc per in³ (exact) = 1.440159 in³
    expect(there.cylinders[0].chamber).toEqual(["1.44016", ""]);
    expect(there.cylinders[0].squishA).toBe("0.04724");
    const back = changeDraftUnits(there, IMPERIAL_UNITS, METRIC_UNITS);
    expect(back.cylinders[0].chamber[0]).toBe("23.6");
    expect(back.cylinders[0].squishA).toBe("1.2");
    expect(back.elevation).toBe("366");
  });

  it("counts typing as a change, an added empty field not", () => {
    const first = draft();
    const more = { ...first, cylinders: first.cylinders.map((c, i) => (i === 0 ? { ...c, chamber: [...c.chamber, ""] } : c)) };
    expect(isDraftChanged(more, first)).toBe(false);
    expect(isDraftChanged({ ...first, methodNotes: "grease seal" }, first)).toBe(true);
  });
});
