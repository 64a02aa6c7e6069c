import { describe, it, expect } from "vitest";
import fc from "fast-check";
import {
  DEFAULT_THRESHOLDS,
  evaluateEngineSignals,
  mergeThresholds,
  reconcileSignals,
  type EngineSignalInput,
  type ReadingSet,
  type Signal,
} from "../../../src/lib/domain/signals";
import { convertCrankingToElevation } from "../../../src/lib/domain/cranking";
import { DomainInputError } from "../../../src/lib/domain/errors";

// Engines, venues and readings below are the invented demo season (DEMO.md); thresholds are
// the labelled defaults of TRADE.md (common practice / from memory).

// psi = 6894.757293168 Pa, exact from the pound and the pound-force (REFERENCES.md, Units).
const KPA_PER_PSI = 6.894757293168361;
const psi = (p: number): number => p * KPA_PER_PSI;

function find(signals: Signal[], kind: string, metric?: string, cylinder?: number): Signal | undefined {
  return signals.find(
    (s) => s.kind === kind && (metric === undefined || s.metric === metric) && (cylinder === undefined || s.cylinder === cylinder),
  );
}

function expectFieldError(fn: () => unknown, field: string): void {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(DomainInputError);
    expect((err as DomainInputError).field).toBe(field);
    return;
  }
  throw new Error(`expected a DomainInputError naming ${field}`);
}

// A-2, carbon on one cylinder, read cold at the shop (366 m).
const a2Baseline: ReadingSet = {
  elevationM: 366,
  engineHours: 0,
  cylinders: [
    { cylinder: 1, chamberCc: 23.6, squishMm: [1.2, 1.21] },
    { cylinder: 2, chamberCc: 23.6, squishMm: [1.21, 1.2] },
  ],
};
const a2After4h: ReadingSet = {
  elevationM: 366,
  engineHours: 4.0,
  cylinders: [
    { cylinder: 1, chamberCc: 23.2, squishMm: [1.17, 1.18] },
    { cylinder: 2, chamberCc: 23.5, squishMm: [1.2, 1.2] },
  ],
};
const a2After55h: ReadingSet = {
  elevationM: 366,
  engineHours: 5.5,
  cylinders: [
    { cylinder: 1, chamberCc: 23.0, squishMm: [1.13, 1.14] },
    { cylinder: 2, chamberCc: 23.5, squishMm: [1.2, 1.2] },
  ],
};
function a2(readings: ReadingSet[], extra: Partial<EngineSignalInput> = {}): EngineSignalInput {
  return { engineId: "A-2", engineName: "A-2", cylinderCount: 2, baseline: a2Baseline, readings, ...extra };
}

// A-5, bottom end wearing: baseline at the shop (366 m), then read at Copperjack Basin
// (2,103 m), Quillmore Ridge (2,377 m) and Granite Notch (2,621 m). DEMO.md's 121 → 114 → 108 psi
// "looks −29 % raw": that puts the shop baseline at about 153 psi (108/153 = −29.4 %).
const a5Sets: ReadingSet[] = [
  { elevationM: 366, engineHours: 19.0, cylinders: [
    { cylinder: 1, squishMm: [1.45, 1.46], crankingKpa: psi(153) },
    { cylinder: 2, squishMm: [1.46, 1.45], crankingKpa: psi(152) },
  ] },
  { elevationM: 2103, engineHours: 19.8, cylinders: [
    { cylinder: 1, squishMm: [1.47, 1.47], crankingKpa: psi(121) },
    { cylinder: 2, squishMm: [1.46, 1.45], crankingKpa: psi(120) },
  ] },
  { elevationM: 2377, engineHours: 20.6, cylinders: [
    { cylinder: 1, squishMm: [1.5, 1.49], crankingKpa: psi(114) },
    { cylinder: 2, squishMm: [1.46, 1.45], crankingKpa: psi(113) },
  ] },
  { elevationM: 2621, engineHours: 21.4, cylinders: [
    { cylinder: 1, squishMm: [1.53, 1.51], crankingKpa: psi(108) },
    { cylinder: 2, squishMm: [1.46, 1.46], crankingKpa: psi(107) },
  ] },
];
function a5(upTo: number): EngineSignalInput {
  return { engineId: "A-5", engineName: "A-5", cylinderCount: 2, baseline: a5Sets[0], readings: a5Sets.slice(1, upTo + 1) };
}

// B-2, tour ATV, read at the 2,408 m shop every 100 h.
const b2Sets: ReadingSet[] = [
  [0, 118, 6],
  [100, 115, 7],
  [200, 108, 10],
  [300, 99, 15],
].map(([h, p, l]) => ({ elevationM: 2408, engineHours: h, cylinders: [{ cylinder: 1, crankingKpa: psi(p), leakdownPct: l }] }));
function b2(upTo: number): EngineSignalInput {
  return { engineId: "B-2", engineName: "B-2", cylinderCount: 1, baseline: b2Sets[0], readings: b2Sets.slice(1, upTo + 1) };
}

describe("DEFAULT_THRESHOLDS", () => {
  it("carries TRADE.md's table and its provenance label", () => {
    expect(DEFAULT_THRESHOLDS.provenance).toBe("common practice / from memory");
    expect(DEFAULT_THRESHOLDS.chamber).toEqual({ watchDropPct: 1.5, actDropPct: 3 });
    expect(DEFAULT_THRESHOLDS.chamberSpread).toEqual({ watchPct: 1, actPct: 1.5, actCc: 0.3 });
    expect(DEFAULT_THRESHOLDS.squish).toEqual({ watchMm: 0.05, actDownMm: 0.1, actUpMm: 0.08 });
    expect(DEFAULT_THRESHOLDS.squishSides).toEqual({ watchMm: 0.08, actMm: 0.15 });
    expect(DEFAULT_THRESHOLDS.cranking).toEqual({ watchDropPct: 10, actDropPct: 15, watchRisePct: 8, actRisePct: 12 });
    expect(DEFAULT_THRESHOLDS.crankingSpread).toEqual({ watchPct: 5, actPct: 10 });
    expect(DEFAULT_THRESHOLDS.leakdown).toEqual({ watchPct: 10, actPct: 15, watchPoints: 5, actPoints: 8 });
    expect(DEFAULT_THRESHOLDS.usage.planningFraction).toBe(0.8);
    expect(Object.isFrozen(DEFAULT_THRESHOLDS.chamber)).toBe(true);
  });

  it("merges edits and refuses bad ones, naming the field", () => {
    const merged = mergeThresholds({ chamber: { watchDropPct: 1 }, provenance: "engine builder's sheet" });
    expect(merged.chamber).toEqual({ watchDropPct: 1, actDropPct: 3 });
    expect(merged.provenance).toBe("engine builder's sheet");
    expect(DEFAULT_THRESHOLDS.chamber.watchDropPct).toBe(1.5);
    expectFieldError(() => mergeThresholds({ chamber: { watchDropPct: -1 } }), "thresholds.chamber.watchDropPct");
    expectFieldError(() => mergeThresholds({ chamber: { watchDropPct: 4 } }), "thresholds.chamber.actDropPct");
    expectFieldError(() => mergeThresholds({ ewma: { lambda: 1.5 } }), "thresholds.ewma.lambda");
  });
});

describe("drift: A-2 carbon on one cylinder (DEMO.md)", () => {
  it("after 4.0 h: watch on cylinder 1's chamber (−1.7 %) and on the 0.3 cc spread, nothing to act on", () => {
    const signals = evaluateEngineSignals(a2([a2After4h]));
    const chamber = find(signals, "drift", "chamber", 1);
    expect(chamber?.severity).toBe("watch");
    expect(chamber?.numbers.changePct).toBeCloseTo(-1.695, 3);
    expect(chamber?.message).toContain("23.2 cc");
    expect(chamber?.message).toContain("1.7 % below its baseline of 23.6 cc");
    const spread = find(signals, "spread", "chamber");
    expect(spread?.severity).toBe("watch");
    expect(spread?.numbers.spreadCc).toBeCloseTo(0.3, 9);
    expect(signals.filter((s) => s.severity === "act")).toEqual([]);
    expect(find(signals, "drift", "chamber", 2)).toBeUndefined();
  });

  it("after 5.5 h: act on cylinder 1's chamber (−2.5 %, confirmed by the EWMA) and on the 0.5 cc spread", () => {
    const signals = evaluateEngineSignals(a2([a2After4h, a2After55h]));
    const chamber = find(signals, "drift", "chamber", 1);
    expect(chamber?.severity).toBe("act");
    expect(chamber?.numbers.changePct).toBeCloseTo(-2.542, 3);
    // EWMA by hand: 23.6 → 23.48 → 23.336; lower limit 23.6 − 3·0.15·√(0.3/1.7·(1 − 0.7⁴)) = 23.4352.
    expect(chamber?.numbers.ewmaCc).toBeCloseTo(23.336, 9);
    expect(chamber?.numbers.ewmaLowerCc).toBeCloseTo(23.6 - 3 * 0.15 * Math.sqrt((0.3 / 1.7) * (1 - 0.7 ** 4)), 9);
    expect(chamber?.message).toContain("sustained change");
    const spread = find(signals, "spread", "chamber");
    expect(spread?.severity).toBe("act");
    expect(spread?.numbers.spreadCc).toBeCloseTo(0.5, 9);
    expect(spread?.numbers.lowCylinder).toBe(1);
    // The squish band carbon shows too (−0.07 mm, past the ±0.05 mm watch).
    expect(find(signals, "drift", "squish-a", 1)).toBeDefined();
    expect(find(signals, "drift", "chamber", 2)).toBeUndefined();
  });

  it("keeps a persisting condition's key and reports the rise from watch to act", () => {
    const first = evaluateEngineSignals(a2([a2After4h]));
    const second = evaluateEngineSignals(a2([a2After4h, a2After55h]));
    const key = find(first, "drift", "chamber", 1)!.key;
    expect(find(second, "drift", "chamber", 1)!.key).toBe(key);
    expect(key).toBe("A-2|drift|1|chamber");
    const r = reconcileSignals(first.map((s) => ({ key: s.key, severity: s.severity })), second);
    expect(r.unchanged).toContain(key);
    expect(r.toOpen.map((s) => s.key)).not.toContain(key);
    expect(r.escalated.map((s) => s.key)).toEqual(expect.arrayContaining([key, find(second, "spread", "chamber")!.key]));
    expect(r.toAutoResolve).toEqual([]);
  });

  it("adds class-rule signals below the class minimums", () => {
    const signals = evaluateEngineSignals(
      a2([a2After4h, a2After55h], { classLimits: { className: "Pro Open", minSquishMm: 1.15, minChamberCc: 23.1 } }),
    );
    const squish = find(signals, "class-rule", "squish", 1);
    expect(squish?.severity).toBe("act");
    expect(squish?.numbers.squishMm).toBeCloseTo(1.135, 9);
    expect(squish?.message).toContain("Pro Open minimum of 1.15 mm");
    expect(find(signals, "class-rule", "chamber", 1)?.severity).toBe("act");
    expect(find(signals, "class-rule", "squish", 2)).toBeUndefined();
  });
});

describe("drift: A-5 squish growth read at rising venues (DEMO.md)", () => {
  it("raises nothing at the first venue", () => {
    expect(evaluateEngineSignals(a5(1))).toEqual([]);
  });

  it("watches side A at 1.50 mm and acts at 1.53 mm", () => {
    const at150 = find(evaluateEngineSignals(a5(2)), "drift", "squish-a", 1);
    expect(at150?.severity).toBe("watch");
    expect(at150?.numbers.changeMm).toBeCloseTo(0.05, 9);
    const at153 = find(evaluateEngineSignals(a5(3)), "drift", "squish-a", 1);
    expect(at153?.severity).toBe("act");
    expect(at153?.message).toContain("1.53 mm");
    expect(at153?.message).toContain("0.08 mm above its baseline of 1.45 mm");
  });

  it("raises no cranking signal: −29 % raw is about −7 % at the shop's elevation", () => {
    const signals = evaluateEngineSignals(a5(3));
    expect(signals.filter((s) => s.metric === "cranking")).toEqual([]);
    // The same readings as if taken at the shop would be an act.
    const asIfAtShop = a5(3);
    asIfAtShop.readings = asIfAtShop.readings!.map((s) => ({ ...s, elevationM: 366 }));
    expect(find(evaluateEngineSignals(asIfAtShop), "drift", "cranking", 1)?.severity).toBe("act");
    // Independent arithmetic: standard-atmosphere pressures p = 101.325·(1 − 0.0065·H/288.15)^5.255876,
    // H = 6356766·Z/(6356766 + Z) (REFERENCES.md): 108 psi at 2,621 m is 142.4 psi at 366 m.
    const p = (z: number): number => 101.325 * (1 - (0.0065 * ((6356766 * z) / (6356766 + z))) / 288.15) ** 5.255876;
    const corrected = (108 * p(366)) / p(2621);
    expect(corrected).toBeCloseTo(142.41, 1);
    expect(corrected / 153 - 1).toBeCloseTo(-0.069, 3);
    // Formulas agree to 1e-6 relative (REFERENCES.md): the module computes the exponent 5.255876… unrounded.
    expect(Math.abs(convertCrankingToElevation(psi(108), 2621, 366) / KPA_PER_PSI / corrected - 1)).toBeLessThan(1e-6);
  });
});

describe("drift: B-2 compression loss over 300 h (DEMO.md)", () => {
  it("is quiet at 100 h", () => {
    expect(evaluateEngineSignals(b2(1))).toEqual([]);
  });

  it("watches at 200 h (leak-down trending up), with nothing to act on", () => {
    const signals = evaluateEngineSignals(b2(2));
    expect(signals.length).toBeGreaterThan(0);
    expect(signals.every((s) => s.severity === "watch")).toBe(true);
    const leak = find(signals, "drift", "leakdown", 1);
    expect(leak?.numbers.changePoints).toBe(4);
    // EWMA by hand: 6 → 6.3 → 7.41 against 6 + 3·1·√(0.3/1.7·(1 − 0.7⁴)) = 7.0986.
    expect(leak?.numbers.ewmaPct).toBeCloseTo(7.41, 9);
    expect(find(signals, "drift", "cranking", 1)).toBeUndefined();
  });

  it("acts at 300 h on cranking (−16 %) and leak-down (15 %, +9 points)", () => {
    const signals = evaluateEngineSignals(b2(3));
    const cranking = find(signals, "drift", "cranking", 1);
    expect(cranking?.severity).toBe("act");
    expect(cranking?.numbers.changePct).toBeCloseTo((99 / 118 - 1) * 100, 6);
    expect(cranking?.message).toMatch(/683 kPa \(99 psi\)/);
    expect(find(signals, "drift", "leakdown", 1)?.severity).toBe("act");
  });
});

describe("a healthy engine read at a high event", () => {
  const p = (z: number): number => 101.325 * (1 - (0.0065 * ((6356766 * z) / (6356766 + z))) / 288.15) ** 5.255876;
  const atGraniteNotch = (shopPsi: number): number => psi(Math.round((shopPsi * p(2621)) / p(366)));
  const a7: EngineSignalInput = {
    engineId: "A-7",
    engineName: "A-7",
    cylinderCount: 3,
    usage: [{ id: "top-end", label: "top end", scope: "engine", span: "top-end", used: 3.0, limit: 8, unit: "h" }],
    nextEvent: { name: "Fenwick Summit", expectedHours: 0.6 },
    baseline: {
      elevationM: 366,
      cylinders: [
        { cylinder: 1, chamberCc: 24.8, squishMm: [1.3, 1.3], crankingKpa: psi(150), leakdownPct: 4 },
        { cylinder: 2, chamberCc: 24.7, squishMm: [1.3, 1.31], crankingKpa: psi(149), leakdownPct: 5 },
        { cylinder: 3, chamberCc: 24.8, squishMm: [1.3, 1.3], crankingKpa: psi(151), leakdownPct: 4 },
      ],
    },
    readings: [
      {
        elevationM: 2621,
        cylinders: [
          { cylinder: 1, squishMm: [1.31, 1.3], crankingKpa: atGraniteNotch(150), leakdownPct: 5 },
          { cylinder: 2, squishMm: [1.3, 1.3], crankingKpa: atGraniteNotch(149), leakdownPct: 5 },
          { cylinder: 3, squishMm: [1.3, 1.31], crankingKpa: atGraniteNotch(151), leakdownPct: 4 },
        ],
      },
    ],
  };

  it("raises no signal although its gauge reads about 24 % low", () => {
    expect(a7.readings![0].cylinders[0].crankingKpa! / psi(150)).toBeLessThan(0.77);
    expect(evaluateEngineSignals(a7)).toEqual([]);
  });

  it("raises none at any elevation when every reading matches its baseline (property)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -500, max: 9000 }),
        fc.integer({ min: -500, max: 9000 }),
        fc.double({ min: 20, max: 40, noNaN: true }),
        fc.double({ min: 0.8, max: 2, noNaN: true }),
        fc.double({ min: 300, max: 1500, noNaN: true }),
        fc.double({ min: 1, max: 9, noNaN: true }),
        (baseElevation, elevation, chamberCc, squishMm, crankingKpa, leakdownPct) => {
          const reading = { cylinder: 1, chamberCc, squishMm: [squishMm, squishMm] as [number, number], leakdownPct };
          const input: EngineSignalInput = {
            engineId: "X",
            engineName: "X",
            cylinderCount: 1,
            baseline: { elevationM: baseElevation, cylinders: [{ ...reading, crankingKpa }] },
            readings: [
              {
                elevationM: elevation,
                cylinders: [{ ...reading, crankingKpa: convertCrankingToElevation(crankingKpa, baseElevation, elevation) }],
              },
            ],
          };
          expect(evaluateEngineSignals(input)).toEqual([]);
        },
      ),
    );
  });
});

describe("due soon and overdue", () => {
  const engine = (used: number, nextEvent?: EngineSignalInput["nextEvent"]): EngineSignalInput => ({
    engineId: "A-1",
    engineName: "A-1",
    cylinderCount: 2,
    usage: [{ id: "top-end", label: "top end", scope: "engine", span: "top-end", used, limit: 8, unit: "h" }],
    nextEvent,
  });

  it("is due soon at 80 % of the interval and overdue at 100 %", () => {
    expect(evaluateEngineSignals(engine(6.3))).toEqual([]);
    const due = evaluateEngineSignals(engine(6.4));
    expect(due).toHaveLength(1);
    expect(due[0]).toMatchObject({ kind: "due-soon", severity: "watch", metric: "top-end", key: "A-1|due-soon|engine|top-end" });
    expect(due[0].numbers.usedPct).toBeCloseTo(80, 9);
    expect(due[0].message).toContain("6.4 h");
    const overdue = evaluateEngineSignals(engine(8));
    expect(overdue[0]).toMatchObject({ kind: "overdue", severity: "act" });
    expect(overdue[0].message).toContain("overdue");
  });

  it("looks ahead to the next planned event", () => {
    expect(evaluateEngineSignals(engine(5, { name: "Harlow Lake", expectedHours: 1.3 }))).toEqual([]);
    const soon = evaluateEngineSignals(engine(5, { name: "Harlow Lake", expectedHours: 1.5 }));
    expect(soon[0]).toMatchObject({ kind: "due-soon", severity: "watch" });
    expect(soon[0].numbers.projectedAfterNextEvent).toBeCloseTo(6.5, 9);
    const past = evaluateEngineSignals(engine(7, { name: "Harlow Lake", expectedHours: 1.5 }));
    expect(past[0]).toMatchObject({ kind: "due-soon", severity: "act" });
    expect(past[0].message).toContain("Harlow Lake");
    // Ending the event exactly on the limit does not pass it.
    expect(evaluateEngineSignals(engine(6.5, { name: "Harlow Lake", expectedHours: 1.5 }))[0].severity).toBe("watch");
    // 6.4 + 1.6 is 8.000000000000002 in doubles: still exactly on the limit, not past it.
    expect(evaluateEngineSignals(engine(6.4, { name: "Harlow Lake", expectedHours: 1.6 }))[0].severity).toBe("watch");
  });

  it("handles part counters and counters kept in litres, and an engine's own planning fraction", () => {
    const input: EngineSignalInput = {
      engineId: "K-1",
      engineName: "K-1",
      cylinderCount: 1,
      planningFraction: 0.9,
      usage: [
        { id: "part:crank-17", label: "crank", scope: "part", span: "bottom-end", used: 20, limit: 24, unit: "h" },
        { id: "fuel", label: "top end", scope: "engine", span: "top-end", used: 150, limit: 200, unit: "L" },
      ],
      nextEvent: { name: "Club race", expectedHours: 1, expectedLitres: 40 },
    };
    const signals = evaluateEngineSignals(input);
    expect(find(signals, "due-soon", "part:crank-17")).toBeUndefined(); // 21 h < 0.9 × 24 = 21.6 h
    expect(find(signals, "due-soon", "fuel")?.severity).toBe("watch"); // 190 L ≥ 180 L
    expect(find(signals, "due-soon", "fuel")?.message).toContain("L");
  });
});

describe("spread, sides and unconfirmed readings", () => {
  it("acts on A-7's build-time chambers 24.8 / 24.4 / 24.8 cc and is quiet after re-opening to 24.7", () => {
    const build = (centre: number): EngineSignalInput => ({
      engineId: "A-7",
      engineName: "A-7",
      cylinderCount: 3,
      baseline: { elevationM: 366, cylinders: [1, 2, 3].map((c) => ({ cylinder: c, chamberCc: c === 2 ? centre : 24.8 })) },
    });
    const spread = find(evaluateEngineSignals(build(24.4)), "spread", "chamber");
    expect(spread?.severity).toBe("act");
    expect(spread?.numbers.spreadCc).toBeCloseTo(0.4, 9);
    expect(spread?.numbers.spreadPct).toBeCloseTo((0.4 / 24.8) * 100, 9);
    expect(spread?.numbers.lowCylinder).toBe(2);
    expect(spread?.message).toContain("0.4 cc");
    expect(evaluateEngineSignals(build(24.7))).toEqual([]);
  });

  it("judges squish side to side above 0.08 mm (watch) and 0.15 mm (act)", () => {
    const sides = (b: number): Signal[] =>
      evaluateEngineSignals({
        engineId: "A-1",
        engineName: "A-1",
        cylinderCount: 1,
        readings: [{ elevationM: 366, cylinders: [{ cylinder: 1, squishMm: [1.2, b] }] }],
      });
    expect(sides(1.28)).toEqual([]);
    expect(find(sides(1.3), "squish-sides")?.severity).toBe("watch");
    expect(find(sides(1.36), "squish-sides")?.severity).toBe("act");
  });

  it("judges cranking spread as a share of the highest cylinder", () => {
    const spread = (second: number): Signal | undefined =>
      find(
        evaluateEngineSignals({
          engineId: "A-1",
          engineName: "A-1",
          cylinderCount: 2,
          readings: [{ elevationM: 975, cylinders: [{ cylinder: 1, crankingKpa: psi(150) }, { cylinder: 2, crankingKpa: psi(second) }] }],
        }),
        "spread",
        "cranking",
      );
    expect(spread(143)).toBeUndefined(); // 4.7 %
    expect(spread(141)?.severity).toBe("watch"); // 6 %
    expect(spread(134)?.severity).toBe("act"); // 10.7 %
  });

  it("watches chamber readings that never agreed and leaves them out of the spread", () => {
    const input: EngineSignalInput = {
      engineId: "A-3",
      engineName: "A-3",
      cylinderCount: 2,
      baseline: {
        elevationM: 366,
        cylinders: [
          { cylinder: 1, chamberCc: 23.6 },
          { cylinder: 2, chamberCc: null, chamberUnconfirmed: true, chamberReadingsCc: [22.9, 23.5] },
        ],
      },
    };
    const signals = evaluateEngineSignals(input);
    expect(signals).toHaveLength(1);
    expect(signals[0]).toMatchObject({ kind: "unconfirmed", severity: "watch", cylinder: 2, key: "A-3|unconfirmed|2|chamber" });
    expect(signals[0].numbers.disagreementCc).toBeCloseTo(0.6, 9);
    expect(signals[0].message).toContain("22.9, 23.5 cc");
    const confirmed = { ...input, readings: [{ elevationM: 366, cylinders: [{ cylinder: 2, chamberCc: 23.6 }] }] };
    expect(evaluateEngineSignals(confirmed)).toEqual([]);
  });
});

describe("reconcileSignals", () => {
  const signal = (key: string, severity: "watch" | "act" = "watch"): Signal => ({
    key,
    kind: "drift",
    severity,
    engineId: "A-2",
    numbers: {},
    message: key,
  });

  it("opens new conditions, leaves persisting ones and auto-resolves cleared ones", () => {
    const r = reconcileSignals([{ key: "a" }, { key: "b" }], [signal("b"), signal("c")]);
    expect(r.toOpen.map((s) => s.key)).toEqual(["c"]);
    expect(r.unchanged).toEqual(["b"]);
    expect(r.toAutoResolve).toEqual(["a"]);
    expect(r.escalated).toEqual([]);
  });

  it("opens a condition again when it clears and returns", () => {
    const first = reconcileSignals([], [signal("a")]);
    expect(first.toOpen.map((s) => s.key)).toEqual(["a"]);
    const cleared = reconcileSignals([{ key: "a" }], []);
    expect(cleared.toAutoResolve).toEqual(["a"]);
    const back = reconcileSignals([], [signal("a")]);
    expect(back.toOpen.map((s) => s.key)).toEqual(["a"]);
  });

  it("collapses duplicate keys to the worst and lists escalations", () => {
    const r = reconcileSignals([{ key: "a", severity: "watch" }, { key: "a" }], [signal("a"), signal("a", "act")]);
    expect(r.unchanged).toEqual(["a"]);
    expect(r.escalated.map((s) => s.severity)).toEqual(["act"]);
    expect(reconcileSignals([], [signal("x"), signal("x")]).toOpen).toHaveLength(1);
    expectFieldError(() => reconcileSignals([{ key: "" }], []), "open[0].key");
  });

  it("auto-resolves A-2's drift after the top end renews the baseline", () => {
    const before = evaluateEngineSignals(a2([a2After4h, a2After55h]));
    const fresh: ReadingSet = {
      elevationM: 366,
      cylinders: [
        { cylinder: 1, chamberCc: 23.6, squishMm: [1.2, 1.21] },
        { cylinder: 2, chamberCc: 23.6, squishMm: [1.21, 1.2] },
      ],
    };
    const after = evaluateEngineSignals({ ...a2([]), baseline: fresh });
    const r = reconcileSignals(before, after);
    expect(after).toEqual([]);
    expect(r.toAutoResolve.sort()).toEqual(before.map((s) => s.key).sort());
  });
});

describe("bad input", () => {
  it("throws DomainInputError naming the field", () => {
    expectFieldError(() => evaluateEngineSignals({ ...b2(1), engineId: "" }), "engineId");
    expectFieldError(() => evaluateEngineSignals({ ...b2(1), cylinderCount: 0 }), "cylinderCount");
    expectFieldError(
      () => evaluateEngineSignals({ ...b2(1), readings: [{ elevationM: 9500, cylinders: [] }] }),
      "readings[0].elevationM",
    );
    expectFieldError(
      () => evaluateEngineSignals({ ...a2([]), baseline: { elevationM: 366, cylinders: [{ cylinder: 1, squishMm: [1.2, Number.NaN] }] } }),
      "baseline.cylinders[0].squishMm[1]",
    );
    expectFieldError(
      () => evaluateEngineSignals({ ...a2([]), readings: [{ elevationM: 366, cylinders: [{ cylinder: 3, chamberCc: 23 }] }] }),
      "readings[0].cylinders[0].cylinder",
    );
    expectFieldError(
      () => evaluateEngineSignals({ ...b2(1), readings: [{ elevationM: 366, cylinders: [{ cylinder: 1, leakdownPct: 120 }] }] }),
      "readings[0].cylinders[0].leakdownPct",
    );
    expectFieldError(
      () => evaluateEngineSignals({ engineId: "A-1", engineName: "A-1", cylinderCount: 1, usage: [{ id: "t", label: "top end", scope: "engine", span: "top-end", used: 1, limit: 0, unit: "h" }] }),
      "usage[0].limit",
    );
    expectFieldError(() => evaluateEngineSignals(b2(1), { leakdown: { actPoints: Number.NaN } }), "thresholds.leakdown.actPoints");
  });
});
