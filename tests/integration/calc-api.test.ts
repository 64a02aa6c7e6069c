import { beforeAll, describe, expect, it } from "vitest";
import { ApiClient, DEMO, signedIn, type ApiResponse } from "../support/api.ts";
import { clearSignInAttempts } from "../support/db.ts";

// The calculation routes of API.md against the built server. Numbers are checked against
// sources outside the project, named beside each check; DEMO.md's engine A-1 is invented but
// built to be consistent with Vs = π/4·B²·S and rc = (Vs + Vc)/Vc.

let owner: ApiClient;
let viewer: ApiClient;

beforeAll(async () => {
  await clearSignInAttempts();
  owner = await signedIn(DEMO.owner);
  viewer = await signedIn(DEMO.viewer);
});

/** Printed values are checked to half a unit of their last printed digit. */
function expectPrinted(actual: unknown, printed: number, decimals: number): void {
  expect(typeof actual).toBe("number");
  expect(Math.abs((actual as number) - printed)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-9);
}

/** Every number anywhere in a JSON body is finite (JSON cannot carry NaN; it would arrive as null). */
function expectNoNonFinite(value: unknown, path = "body"): void {
  if (value === null) throw new Error(`${path} is null: a NaN or Infinity may have been written`);
  if (typeof value === "number") expect(Number.isFinite(value), path).toBe(true);
  else if (Array.isArray(value)) value.forEach((v, i) => expectNoNonFinite(v, `${path}[${i}]`));
  else if (typeof value === "object") for (const [k, v] of Object.entries(value)) expectNoNonFinite(v, `${path}.${k}`);
}

function expectBadFields(res: ApiResponse, fields: string[]): void {
  expect(res.status, JSON.stringify(res.body)).toBe(400);
  expect(res.body.error.code).toMatch(/invalid_input|out_of_range/);
  expect(typeof res.body.error.message).toBe("string");
  for (const field of fields) expect(Object.keys(res.body.error.fields ?? {}), JSON.stringify(res.body)).toContain(field);
  expect(JSON.stringify(res.body)).not.toMatch(/NaN|Infinity|stack|at \w+ \(/);
}

const A1 = { boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82, chamberCc: 23.6, flatPlateCc: 26.4, cylinders: 2 };
const CC_PER_MM_72 = ((Math.PI / 4) * 72 * 72) / 1000;

describe("POST /api/v1/calc/compression", () => {
  it("gives DEMO.md A-1's figures", async () => {
    const res = await owner.post("/api/v1/calc/compression", A1);
    expect(res.status).toBe(200);
    // DEMO.md A-1: Vs 300.5 cc per cylinder, geometric 13.73, trapped 7.38, offset 23.6 − 26.4
    expectPrinted(res.body.sweptCc, 300.5, 1);
    expectPrinted(res.body.displacementCc, 601.0, 1);
    expectPrinted(res.body.geometricRatio, 13.73, 2);
    expectPrinted(res.body.trappedRatio, 7.38, 2);
    expect(res.body.chamberOffsetCc).toBeCloseTo(-2.8, 10);
    expect(res.body.exhaustDurationDeg).toBe(196);
    expectNoNonFinite(res.body);
  });

  it("reproduces the 1000:100 example of Wikipedia, 'Compression ratio'", async () => {
    // Wikipedia, "Compression ratio" (from memory): 900 cc swept over a 100 cc chamber is 10:1.
    const strokeMm = (900 * 1000) / ((Math.PI / 4) * 100 * 100);
    const res = await owner.post("/api/v1/calc/compression", { boreMm: 100, strokeMm, chamberCc: 100, targetRatio: 9 });
    expect(res.status).toBe(200);
    expect(res.body.sweptCc).toBeCloseTo(900, 9);
    expect(res.body.geometricRatio).toBeCloseTo(10, 12);
    // Vc = Vs / (rc − 1): 900 / 8 = 112.5 cc; reaching it means adding 12.5 cc over the bore area.
    expect(res.body.targetChamberCc).toBeCloseTo(112.5, 9);
    expect(res.body.headCutMm).toBeCloseTo(-12.5 / (((Math.PI / 4) * 100 * 100) / 1000), 9);
    expect(Object.keys(res.body).sort()).toEqual(["displacementCc", "geometricRatio", "headCutMm", "sweptCc", "targetChamberCc"]);
  });

  it("places the port with the slider-crank law of Wikipedia, 'Piston motion equations'", async () => {
    // The article's pair l = 6 in, r = 2 in (stroke 4 in): s(60°) = 1.255437 in.
    const res = await owner.post("/api/v1/calc/compression", {
      boreMm: 72,
      strokeMm: 4 * 25.4,
      rodMm: 6 * 25.4,
      chamberCc: 30,
      exhaustOpensDegAtdc: 60,
    });
    expect(res.status).toBe(200);
    expectPrinted(res.body.exhaustTravelMm / 25.4, 1.255437, 6);
    expect(res.body.trappedSweptCc).toBeCloseTo(CC_PER_MM_72 * res.body.exhaustTravelMm, 9);
    expect(res.body.trappedRatio).toBeLessThan(res.body.geometricRatio);
  });

  it("takes the port position as a travel", async () => {
    const res = await owner.post("/api/v1/calc/compression", {
      boreMm: 72,
      strokeMm: 73.8,
      chamberCc: 20,
      exhaustTravelMm: 130 / CC_PER_MM_72,
    });
    expect(res.status).toBe(200);
    expect(res.body.trappedRatio).toBeCloseTo(7.5, 12);
    expect(res.body.exhaustOpensDegAtdc).toBeUndefined();
  });

  it("answers every role, as calc:use allows", async () => {
    const res = await viewer.post("/api/v1/calc/compression", A1);
    expect(res.status).toBe(200);
    const mechanic = await signedIn(DEMO.mechanic);
    expect((await mechanic.post("/api/v1/calc/compression", A1)).status).toBe(200);
  });

  it("refuses anyone not signed in with 401", async () => {
    const res = await new ApiClient().post("/api/v1/calc/compression", A1);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe("unauthorized");
  });

  it.each([
    ["a missing field", { strokeMm: 73.8, chamberCc: 23.6 }, ["boreMm"]],
    ["every missing field", {}, ["boreMm", "strokeMm", "chamberCc"]],
    ["a non-numeric field", { ...A1, boreMm: "seventy-two" }, ["boreMm"]],
    ["a numeric string", { ...A1, strokeMm: "73.8" }, ["strokeMm"]],
    ["NaN-producing strings", { ...A1, boreMm: "NaN", strokeMm: "Infinity", chamberCc: "1e999" }, ["boreMm", "strokeMm", "chamberCc"]],
    ["a zero length", { ...A1, boreMm: 0 }, ["boreMm"]],
    ["a negative length", { ...A1, strokeMm: -73.8 }, ["strokeMm"]],
    ["a chamber volume of zero", { ...A1, chamberCc: 0 }, ["chamberCc"]],
    ["an angle above 180", { ...A1, exhaustOpensDegAtdc: 181 }, ["exhaustOpensDegAtdc"]],
    ["an angle below 0", { ...A1, exhaustOpensDegAtdc: -1 }, ["exhaustOpensDegAtdc"]],
    ["a rod shorter than half the stroke", { ...A1, rodMm: 36.9 }, ["rodMm"]],
    ["an angle without a rod", { ...A1, rodMm: undefined }, ["rodMm"]],
    ["a port below the stroke", { boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: 80 }, ["exhaustTravelMm"]],
    ["a fractional cylinder count", { ...A1, cylinders: 1.5 }, ["cylinders"]],
    ["a target ratio of 1", { ...A1, targetRatio: 1 }, ["targetRatio"]],
    ["an unknown field", { ...A1, boreMM: 72 }, ["boreMM"]],
    ["huge numbers", { boreMm: 1e308, strokeMm: 1e308, chamberCc: 1e-308 }, ["boreMm", "strokeMm"]],
    ["a body that is a list", [A1], ["body"]],
    ["a body that is a string", '"boreMm"', ["body"]],
    ["a body that is not JSON", "{boreMm: 72", ["body"]],
  ])("answers 400 naming the field for %s", async (_what, body, fields) => {
    const res = await owner.request("POST", "/api/v1/calc/compression", typeof body === "string" ? body : body, {
      "content-type": "application/json",
    });
    expectBadFields(res, fields as string[]);
  });

  it("names every bad field of one request at once, zod's and the domain's together", async () => {
    const res = await owner.post("/api/v1/calc/compression", {
      boreMm: "x",
      strokeMm: 73.8,
      chamberCc: 0,
      rodMm: 30,
      exhaustOpensDegAtdc: 200,
      extra: true,
    });
    expectBadFields(res, ["boreMm", "chamberCc", "rodMm", "exhaustOpensDegAtdc", "extra"]);
  });

  it("reads null as not given", async () => {
    const res = await owner.post("/api/v1/calc/compression", {
      boreMm: 72,
      strokeMm: 73.8,
      chamberCc: 23.6,
      rodMm: null,
      targetRatio: null,
    });
    expect(res.status).toBe(200);
    expect(res.body.targetChamberCc).toBeUndefined();
  });

  it("refuses a target no head can reach with this offset, naming targetRatio", async () => {
    const res = await owner.post("/api/v1/calc/compression", {
      boreMm: 72,
      strokeMm: 73.8,
      chamberCc: 40,
      flatPlateCc: 5,
      targetRatio: 30,
    });
    expectBadFields(res, ["targetRatio"]);
  });

  it("never answers 500 or a non-finite number over the whole range of valid sizes", async () => {
    const cases = [
      { boreMm: 1000, strokeMm: 3000, chamberCc: 0.001, targetRatio: 100, rodMm: 10_000, exhaustOpensDegAtdc: 180 },
      { boreMm: 0.001, strokeMm: 0.001, chamberCc: 1_000_000, cylinders: 24, flatPlateCc: 0.001, targetRatio: 1.000001 },
      { boreMm: 1e-9, strokeMm: 5e-324, chamberCc: 5e-324 },
      { boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, rodMm: 36.900001, exhaustOpensDegAtdc: 90 },
      { boreMm: 72, strokeMm: 73.8, chamberCc: 23.6, exhaustTravelMm: 0 },
    ];
    for (const body of cases) {
      const res = await owner.post("/api/v1/calc/compression", body);
      expect([200, 400], JSON.stringify(res.body)).toContain(res.status);
      expectNoNonFinite(res.body);
    }
  });
});

describe("GET /api/v1/calc/atmosphere", () => {
  // U.S. Standard Atmosphere 1976 tables (REFERENCES.md): sea level 101325 Pa, 15 °C, 1.2250 kg/m³;
  // at geopotential 1000 / 2000 / 3000 m, 89874.6 / 79495.2 / 70108.5 Pa. The route takes a
  // geometric elevation, so each geopotential height is turned into one: Z = r·H / (r − H).
  const R = 6356766;

  it("gives the sea-level standard", async () => {
    const res = await owner.get("/api/v1/calc/atmosphere?elevationM=0");
    expect(res.status).toBe(200);
    expect(res.body.pressureKpa).toBeCloseTo(101.325, 9);
    expect(res.body.temperatureC).toBeCloseTo(15, 9);
    expectPrinted(res.body.densityKgM3, 1.225, 4);
    expect(res.body.pressureRatio).toBeCloseTo(1, 12);
  });

  it.each([
    [1000, 89874.6],
    [2000, 79495.2],
    [3000, 70108.5],
  ])("matches the printed pressure at geopotential %i m", async (h, pa) => {
    const z = (R * h) / (R - h);
    const res = await owner.get(`/api/v1/calc/atmosphere?elevationM=${z}`);
    expect(res.status).toBe(200);
    expectPrinted(res.body.pressureKpa * 1000, pa, 1);
    // T = 288.15 − 0.0065·H
    expect(res.body.temperatureC).toBeCloseTo(15 - 0.0065 * h, 6);
    expectNoNonFinite(res.body);
  });

  it.each([
    ["missing", "", ["elevationM"]],
    ["empty", "?elevationM=", ["elevationM"]],
    ["not a number", "?elevationM=high", ["elevationM"]],
    ["NaN", "?elevationM=NaN", ["elevationM"]],
    ["Infinity", "?elevationM=Infinity", ["elevationM"]],
    ["hex", "?elevationM=0x10", ["elevationM"]],
    ["below −500", "?elevationM=-501", ["elevationM"]],
    ["above 9000", "?elevationM=9000.5", ["elevationM"]],
    ["huge", "?elevationM=1e308", ["elevationM"]],
    ["with an unknown parameter", "?elevationM=100&unit=ft", ["unit"]],
  ])("answers 400 for an elevation %s", async (_what, query, fields) => {
    expectBadFields(await owner.get(`/api/v1/calc/atmosphere${query}`), fields as string[]);
  });

  it("refuses anyone not signed in with 401", async () => {
    expect((await new ApiClient().get("/api/v1/calc/atmosphere?elevationM=0")).status).toBe(401);
  });
});

describe("POST /api/v1/calc/fuel-check", () => {
  it("scales the dynamic-compression example of Wikipedia, 'Compression ratio'", async () => {
    // rc 7.5, n 1.3, 14.7 psi → 187.1 psig: estimate / ambient = 187.1 / 14.7 at a standard sea level
    const res = await owner.post("/api/v1/calc/fuel-check", {
      boreMm: 72,
      strokeMm: 73.8,
      chamberCc: 20,
      exhaustTravelMm: 130 / CC_PER_MM_72,
      elevationM: 0,
    });
    expect(res.status).toBe(200);
    expect(res.body.trappedRatio).toBeCloseTo(7.5, 12);
    expect(Math.abs(res.body.crankingKpaEstimate / res.body.ambientKpa - 187.1 / 14.7)).toBeLessThan(0.05 / 14.7);
    expect(res.body.ambientKpa).toBeCloseTo(101.325, 9);
    expect(res.body.densityAltitudeM).toBeCloseTo(0, 6);
    expectNoNonFinite(res.body);
  });

  it("uses the organisation's table (the seed defaults) when none is sent, and says so", async () => {
    // DEMO.md A-5 (altitude inserts, not below 1,800 m) entered at Birchmoor, 396 m
    const res = await owner.post("/api/v1/calc/fuel-check", {
      boreMm: 85,
      strokeMm: 70,
      rodMm: 140,
      exhaustOpensDegAtdc: 80,
      chamberCc: 27.5,
      flatPlateCc: 31,
      cylinders: 2,
      elevationM: 396,
      builtForMinElevationM: 1800,
    });
    expect(res.status).toBe(200);
    expectPrinted(res.body.geometricRatio, 15.44, 2);
    expectPrinted(res.body.trappedRatio, 7.86, 2);
    expect(res.body.fuelTableSource).toBe("seed-defaults");
    expect(res.body.fuelTableLabel).toMatch(/common-practice defaults/i);
    expect(typeof res.body.fuelGrade).toBe("string");
    expect(typeof res.body.margin).toBe("number");
    expect(res.body.riskFlags.map((f: { code: string }) => f.code)).toContain("built-for-altitude-at-low-event");
    expect(res.body.cautions.join(" ")).toMatch(/detonation/i);
    expect(res.body.cautions.join(" ")).toMatch(/fire codes/i);
    expect(res.body.cautions.join(" ")).toMatch(/seed fuel table/i);
    // Gauge pressure = p_amb·rc^1.3 − p_amb at the density altitude's pressure (standard day here).
    const p = res.body.equivalentAmbientKpa;
    expect(res.body.crankingKpaEstimate).toBeCloseTo(p * res.body.trappedRatio ** 1.3 - p, 9);
    expectNoNonFinite(res.body);
  });

  it("uses the organisation's own table once the owner has made one in Settings", async () => {
    const table = { label: "Kestrel's sheet", rows: [{ upToCrankingKpa: 1500, grade: "Kestrel blend", octaneAki: 100 }] };
    expect((await owner.patch("/api/v1/settings", { fuelTable: table })).status).toBe(200);
    try {
      const res = await viewer.post("/api/v1/calc/fuel-check", { ...A1, elevationM: 396 });
      expect(res.status).toBe(200);
      expect(res.body.fuelTableSource).toBe("organisation");
      expect(res.body.fuelTableLabel).toBe("Kestrel's sheet");
      expect(res.body.fuelGrade).toBe("Kestrel blend");
      expect(res.body.cautions.join(" ")).not.toMatch(/seed fuel table/i);
    } finally {
      expect((await owner.patch("/api/v1/settings", { fuelTable: null })).status).toBe(200);
    }
  });

  it("uses a table sent with the request", async () => {
    const res = await owner.post("/api/v1/calc/fuel-check", {
      ...A1,
      elevationM: 2103,
      airTempC: -10,
      fuelTable: { label: "Our sheet", rows: [{ upToCrankingKpa: 2000, grade: "Blend B", octaneAki: 100 }] },
    });
    expect(res.status).toBe(200);
    expect(res.body.fuelTableSource).toBe("request");
    expect(res.body.fuelTableLabel).toBe("Our sheet");
    expect(res.body.fuelGrade).toBe("Blend B");
    expect(res.body.margin).toBeCloseTo(2000 - res.body.crankingKpaEstimate, 9);
    expect(res.body.airTempC).toBe(-10);
    expect(res.body.densityAltitudeM).toBeLessThan(2103);
  });

  it.each([
    ["no elevation", { ...A1 }, ["elevationM"]],
    ["an elevation outside −500…9000 m", { ...A1, elevationM: 9001 }, ["elevationM"]],
    ["an air temperature out of range", { ...A1, elevationM: 100, airTempC: 99 }, ["airTempC"]],
    ["an empty fuel table", { ...A1, elevationM: 100, fuelTable: [] }, ["fuelTable"]],
    ["a fuel table that is text", { ...A1, elevationM: 100, fuelTable: "premium" }, ["fuelTable"]],
    ["a fuel row without a grade", { ...A1, elevationM: 100, fuelTable: [{ upToCrankingKpa: 900, grade: " " }] }, ["fuelTable.0.grade"]],
    ["an exponent out of range", { ...A1, elevationM: 100, polytropicExponent: 5 }, ["polytropicExponent"]],
    ["a bad compression field too", { ...A1, chamberCc: -1, elevationM: "low" }, ["chamberCc", "elevationM"]],
  ])("answers 400 naming the field for %s", async (_what, body, fields) => {
    expectBadFields(await owner.post("/api/v1/calc/fuel-check", body), fields as string[]);
  });

  it("refuses anyone not signed in with 401", async () => {
    expect((await new ApiClient().post("/api/v1/calc/fuel-check", { ...A1, elevationM: 0 })).status).toBe(401);
  });
});

describe("POST /api/v1/calc/drift", () => {
  // NIST/SEMATECH e-Handbook 6.3.2.4 EWMA example: target 50, s = 2.0539, λ = 0.3, L = 3;
  // printed EWMA to 2 decimals, asymptotic limits 52.5884 / 47.4115, every point in control.
  const data = [52.0, 47.0, 53.0, 49.3, 50.1, 47.0, 51.0, 50.1, 51.2, 50.5, 49.6, 47.6, 49.9, 51.3, 47.8, 51.2, 52.6, 52.4, 53.6, 52.1];
  const printed = [
    50.6, 49.52, 50.56, 50.18, 50.16, 49.21, 49.75, 49.85, 50.26, 50.33, 50.11, 49.36, 49.52, 50.05, 49.38, 49.92, 50.73, 51.23, 51.94,
    51.99,
  ];

  it("reproduces the handbook's EWMA series and limits", async () => {
    const res = await owner.post("/api/v1/calc/drift", { values: data, target: 50, sigma: 2.0539 });
    expect(res.status).toBe(200);
    expect(res.body.lambda).toBe(0.3);
    expect(res.body.width).toBe(3);
    res.body.ewma.forEach((z: number, i: number) => expectPrinted(z, printed[i], 2));
    expect(Math.abs(res.body.upper[19] - 52.5884)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(res.body.lower[19] - 47.4115)).toBeLessThanOrEqual(1e-4);
    expect(res.body.signals).toEqual([]);
    expect(res.body.outOfTolerance).toBeUndefined();
  });

  it("lists readings outside a fixed tolerance", async () => {
    const res = await owner.post("/api/v1/calc/drift", { values: [23.6, 23.5, 23.2, 23.0], target: 23.6, sigma: 0.1, tolerance: 0.3 });
    expect(res.status).toBe(200);
    expect(res.body.outOfTolerance).toEqual([2, 3]);
    expect(res.body.signals.length).toBeGreaterThan(0);
  });

  it.each([
    ["no values", { target: 50, sigma: 1 }, ["values"]],
    ["an empty list", { values: [], target: 50, sigma: 1 }, ["values"]],
    ["a reading that is text", { values: [1, "NaN", 3], target: 50, sigma: 1 }, ["values.1"]],
    ["a zero sigma", { values: [1], target: 50, sigma: 0 }, ["sigma"]],
    ["a lambda of 0", { values: [1], target: 50, sigma: 1, lambda: 0 }, ["lambda"]],
    ["a lambda above 1", { values: [1], target: 50, sigma: 1, lambda: 1.5 }, ["lambda"]],
    ["a negative tolerance", { values: [1], target: 50, sigma: 1, tolerance: -1 }, ["tolerance"]],
    ["huge readings", { values: [1e308, 1e308], target: -1e308, sigma: 1e308 }, ["values.0", "target", "sigma"]],
  ])("answers 400 naming the field for %s", async (_what, body, fields) => {
    expectBadFields(await owner.post("/api/v1/calc/drift", body), fields as string[]);
  });

  it("refuses anyone not signed in with 401", async () => {
    expect((await new ApiClient().post("/api/v1/calc/drift", { values: [1], target: 1, sigma: 1 })).status).toBe(401);
  });
});
