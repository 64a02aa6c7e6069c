import type { Knex } from "knex";
import { convertCrankingToElevation } from "../../src/lib/domain/cranking.ts";
import { kpaToPsi, psiToKpa } from "../../src/lib/domain/units.ts";
import { createPart, createRacingClass, movePart, recordPartEvent } from "../../tests/factories/motors.ts";
import { Story, cylinder, type CylinderValues } from "./story.ts";

// Kestrel Hollow Racing (DEMO.md): the 2025–26 season in full, the off-season rebuilds, and the
// 2026–27 season so far (today is 2026-12-01: only the home test of Nov 22 has run). Last
// season's dates are DEMO.md's calendar moved back 52 weeks, so weekdays match.

const SHOP_M = 366;
const WIRE = "1.5 mm solder on both sides of the pin axis; the mean of the two sides counts";

/** Nominal readings of each build, at the shop. */
const NOMINAL: Record<string, { cc: number[]; flat: number; squish: [number, number]; psi: number; leak: number }> = {
  race72: { cc: [23.6, 23.6], flat: 26.4, squish: [1.2, 1.21], psi: 146, leak: 4 },
  stock72: { cc: [25.0, 25.0], flat: 27.8, squish: [1.35, 1.35], psi: 138, leak: 5 },
  alt85: { cc: [27.5, 27.5], flat: 31.0, squish: [1.45, 1.46], psi: 152, leak: 4 },
  low85: { cc: [30.0, 30.0], flat: 33.5, squish: [1.45, 1.45], psi: 140, leak: 4 },
  triple78: { cc: [24.8, 24.7, 24.8], flat: 27.9, squish: [1.3, 1.3], psi: 149, leak: 4 },
};

/** A whole set of nominal readings; at a venue the cranking is what the gauge would read there. */
function nominal(build: string, opts: { flat?: boolean; elevationM?: number; ccShift?: number[]; squishShift?: number } = {}): ReturnType<typeof cylinder>[] {
  const n = NOMINAL[build];
  const psi = opts.elevationM === undefined ? n.psi : Math.round(kpaToPsi(convertCrankingToElevation(psiToKpa(n.psi), SHOP_M, opts.elevationM)));
  return n.cc.map((cc, i) => {
    const v: CylinderValues = {
      cc: Math.round((cc + (opts.ccShift?.[i] ?? 0)) * 10) / 10,
      squish: [n.squish[0] + (opts.squishShift ?? 0), n.squish[1] + (opts.squishShift ?? 0)].map((x) => Math.round(x * 100) / 100) as [number, number],
      psi: psi - (i % 2),
      leak: n.leak + (i === 1 ? 1 : 0),
    };
    if (opts.flat) v.flat = n.flat;
    return cylinder(i + 1, v, (i % 3) as 0 | 1 | 2);
  });
}

const cross = [
  ["2025-11-23", null, "Home test"],
  ["2025-12-06", "2025-12-08", "Pinecrest Flats"],
  ["2025-12-20", "2025-12-22", "Harlow Lake"],
  ["2026-01-03", "2026-01-05", "Red Tamarack"],
  ["2026-01-17", "2026-01-19", "Birchmoor Fairgrounds"],
  ["2026-01-31", "2026-02-02", "Stonegate Bowl"],
  ["2026-02-14", "2026-02-16", "Harlow Lake II"],
  ["2026-03-07", "2026-03-09", "Birchmoor Final"],
] as const;

async function crossWeekend(s: Story, index: number, engines: string[]): Promise<void> {
  const [first, last, venue] = cross[index];
  if (last === null) {
    for (const e of engines) {
      await s.run(e, first, 0.4, "Shake-down", venue);
      await s.run(e, first, 0.6, "Test runs", venue);
    }
    return;
  }
  const middle = new Date(Date.parse(`${first}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
  for (const e of engines) {
    await s.run(e, first, 0.4, "Practice", venue);
    await s.run(e, middle, 0.5, "Qualifying heats", venue);
    await s.run(e, last, 0.6, "Final", venue);
  }
}

async function hillclimb(s: Story, days: [string, string], venue: string, entries: [string, number][]): Promise<void> {
  for (const [e, hours] of entries) {
    const practice = Math.round(hours * 0.4 * 100) / 100;
    await s.run(e, days[0], practice, "Practice runs", venue);
    await s.run(e, days[1], Math.round((hours - practice) * 100) / 100, "Climbs", venue);
  }
}

async function readBuild(s: Story, name: string, build: string, day: string, notes: string | null = null): Promise<void> {
  await s.read(name, day, { elevationM: SHOP_M, airTempC: 14, kind: "build", baseline: true, notes }, nominal(build, { flat: true }));
}

async function readBetween(s: Story, name: string, build: string, day: string, ccShift?: number[]): Promise<void> {
  await s.read(name, day, { elevationM: SHOP_M, airTempC: 9, kind: "between_events" }, nominal(build, { ccShift }));
}

export async function seedKestrel(k: Knex, orgId: number, people: Record<string, string | null>): Promise<void> {
  const s = new Story(k, orgId, people);
  const proCross = await createRacingClass(k, orgId, { name: "Club Cross 600", maxDisplacementCc: 602, minSquishMm: 1.1, minChamberCc: 23.2, minFlatPlateCc: 26.0, squishWireNote: WIRE });
  const hill800 = await createRacingClass(k, orgId, { name: "Club Hillclimb 800", maxDisplacementCc: 800, minSquishMm: 1.3, squishWireNote: WIRE });
  const hillOpen = await createRacingClass(k, orgId, { name: "Club Hillclimb Unlimited", maxDisplacementCc: 1050, minSquishMm: 1.2, squishWireNote: WIRE });

  await s.addChassis({ number: "27", kind: "sled", meterKind: "hours", meter: 41.3, notes: "Kaja Lindqvist's cross sled" });
  await s.addChassis({ number: "114", kind: "sled", meterKind: "hours", meter: 36.8, notes: "Beck Tamura's cross sled" });
  await s.addChassis({ number: "9", kind: "sled", meterKind: "none", notes: "Odd Sveen's hillclimb sled" });
  await s.addChassis({ number: "62", kind: "sled", meterKind: "none", notes: "Hillclimb sled for the triple" });
  await s.addChassis({ number: "41", kind: "sled", meterKind: "hours", meter: 212.4, notes: "Practice sled" });
  await s.addChassis({ number: "88", kind: "sled", meterKind: "none", notes: "Spare chassis, stripped for parts" });

  const race = { cylinders: 2, boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82, targetRatio: 13.73, targetSquishMm: 1.2 };
  const raceSpec = { ...race, buildFuelNote: "Race fuel, team table row for low venues", buildMinOctane: 100, builtForMaxElevationM: 1200, racingClassId: proCross, topEndLimit: 8, bottomEndLimit: 24 };
  await s.addEngine({ name: "A-1", serial: "KH-7238-01", ...raceSpec, status: "running", notes: "Race head." });
  await s.addEngine({ name: "A-2", serial: "KH-7238-02", ...raceSpec, status: "running", notes: "Race head." });
  await s.addEngine({ name: "A-3", serial: "KH-7238-03", ...raceSpec, status: "spare", notes: "Built new in January 2026 as the spare." });
  await s.addEngine({ name: "A-4", serial: "KH-7238-04", ...race, targetRatio: 13.02, targetSquishMm: 1.35, buildFuelNote: "Premium unleaded", buildMinOctane: 91, status: "running", topEndLimit: 10, bottomEndLimit: null, notes: "Stock head, practice engine." });
  const big = { cylinders: 2, boreMm: 85, strokeMm: 70, rodMm: 140, exhaustOpensDegAtdc: 80, targetSquishMm: 1.45, racingClassId: hill800, topEndLimit: 10, bottomEndLimit: 25 };
  await s.addEngine({ name: "A-5", serial: "KH-8570-05", ...big, targetRatio: 15.44, buildFuelNote: "Unleaded 91 at altitude only", buildMinOctane: 91, builtForMinElevationM: 1800, builtForMaxElevationM: 3200, status: "running", notes: "Altitude inserts: never below 1,800 m." });
  await s.addEngine({ name: "A-6", serial: "KH-8570-06", ...big, targetRatio: 14.24, buildFuelNote: "Race fuel", buildMinOctane: 100, status: "spare", notes: "Low-altitude inserts." });
  await s.addEngine({ name: "A-7", serial: "KH-7870-07", cylinders: 3, boreMm: 78, strokeMm: 70, rodMm: 130, exhaustOpensDegAtdc: 81, targetRatio: 14.49, targetSquishMm: 1.3, buildFuelNote: "Unleaded 91 at altitude", buildMinOctane: 91, builtForMinElevationM: 1500, racingClassId: hillOpen, status: "running", topEndLimit: 8, bottomEndLimit: null, notes: "Triple for hillclimbs." });

  // Before records began: cranks and heads in place, the 2024–25 hours carried over from paper.
  const heads: Record<string, number> = {};
  for (const name of ["A-1", "A-2", "A-4", "A-5", "A-6", "A-7"]) await s.bottomEnd(name, "2024-09-20", "Recorded from the paper logbook");
  for (const name of ["A-1", "A-2", "A-4", "A-7"]) {
    heads[name] = await createPart(k, orgId, { serial: `HD-${name.replace("-", "")}`, kind: "head", description: name === "A-4" ? "Stock head" : "Race head", engineId: s.engineId(name), installedOn: "2024-09-20", maxTotalCutMm: 0.5 });
  }
  const inserts: Record<string, number[]> = { alt: [], low: [] };
  for (const [set, engine] of [["alt", "A-5"], ["low", "A-6"]] as const) {
    for (const c of [1, 2]) {
      inserts[set].push(await createPart(k, orgId, { serial: `INS-${set.toUpperCase()}-${c}`, kind: "insert", description: set === "alt" ? "Altitude chamber insert (27.5 cc installed)" : "Low-altitude chamber insert (30.0 cc installed)", engineId: s.engineId(engine), cylinderNo: c, installedOn: "2024-09-20", maxTotalCutMm: 0.4 }));
    }
  }
  for (const [name, hours] of [["A-1", 6.0], ["A-2", 11.0], ["A-4", 12.0], ["A-5", 16.4], ["A-6", 9.0], ["A-7", 4.0]] as const) {
    await s.carryOver(name, "2025-04-15", hours, "Hours of the 2024–25 season, carried over from the paper logbook");
  }

  // Pre-season 2025.
  await s.topEnd("A-4", "2025-10-01", "Cylinder 1 rebored 0.25 mm over; head face cut 0.15 mm to clean it up");
  await recordPartEvent(k, orgId, s.engines.get("A-4")!.pistons[0], { kind: "oversize", amountMm: 0.25, doneOn: "2025-10-01", notes: "Rebore after a scored cylinder", by: people.builder });
  await recordPartEvent(k, orgId, heads["A-4"], { kind: "cut", amountMm: 0.15, doneOn: "2025-10-01", notes: "Face cleaned up", by: people.builder });
  await readBuild(s, "A-4", "stock72", "2025-10-03");
  await s.topEnd("A-6", "2025-10-25");
  await readBuild(s, "A-6", "low85", "2025-10-27");
  await s.install("A-4", "41", "2025-11-08", true);
  await s.topEnd("A-1", "2025-11-10");
  await s.topEnd("A-2", "2025-11-10");
  await readBuild(s, "A-1", "race72", "2025-11-12");
  await s.read("A-2", "2025-11-12", { elevationM: SHOP_M, airTempC: 14, kind: "build", baseline: true }, [
    cylinder(1, { cc: 23.6, flat: 26.4, squish: [1.2, 1.2], psi: 146, leak: 4 }),
    cylinder(2, { cc: 23.6, flat: 26.4, squish: [1.21, 1.2], psi: 145, leak: 4 }, 1),
  ]);
  await s.install("A-1", "27", "2025-11-15");
  await s.install("A-2", "114", "2025-11-15");

  // The 2025–26 season.
  await crossWeekend(s, 0, ["A-1", "A-2"]);
  await s.run("A-4", "2025-11-29", 1.0, "Practice day", "Home track");
  await crossWeekend(s, 1, ["A-1", "A-2"]);
  await s.run("A-4", "2025-12-13", 0.9, "Practice day", "Home track");
  await crossWeekend(s, 2, ["A-1", "A-2"]);
  await readBetween(s, "A-1", "race72", "2025-12-23", [-0.1, 0]);
  // A-2, carbon on cylinder 1 (DEMO.md drift 1): watch at 4.0 h, act at 5.5 h.
  await s.read("A-2", "2025-12-23", { elevationM: SHOP_M, airTempC: 8, kind: "between_events", notes: "Cold engine, shop burette, same solder as the baseline." }, [
    cylinder(1, { cc: 23.2, squish: [1.17, 1.17], psi: 150, leak: 4 }),
    cylinder(2, { cc: 23.5, squish: [1.2, 1.2], psi: 146, leak: 4 }, 1),
  ]);
  await crossWeekend(s, 3, ["A-1", "A-2"]);
  await s.topEnd("A-3", "2026-01-05", "New build: spare engine");
  await s.bottomEnd("A-3", "2026-01-05", "New build: spare engine");
  heads["A-3"] = await createPart(k, orgId, { serial: "HD-A3", kind: "head", description: "Race head", engineId: s.engineId("A-3"), installedOn: "2026-01-05", maxTotalCutMm: 0.5 });
  await s.remove("A-2", "2026-01-06");
  await s.read("A-2", "2026-01-06", { elevationM: SHOP_M, airTempC: 8, kind: "teardown", notes: "Teardown at 5.5 h: carbon on the piston crown and squish band of cylinder 1." }, [
    cylinder(1, { cc: 23.0, flat: 26.3, squish: [1.13, 1.13], psi: 153, leak: 5, notes: "Carbon on crown and squish band" }),
    cylinder(2, { cc: 23.5, flat: 26.4, squish: [1.19, 1.2], psi: 146, leak: 4 }, 1),
  ]);
  await s.topEnd("A-2", "2026-01-07", "Done early at 5.5 h (policy 8 h): carbon on cylinder 1");
  await readBuild(s, "A-3", "race72", "2026-01-08");
  await readBuild(s, "A-2", "race72", "2026-01-09");
  await s.run("A-4", "2026-01-10", 1.1, "Practice day", "Home track");
  await s.install("A-3", "114", "2026-01-12");
  await s.run("A-5", "2026-01-17", 1.4, "Altitude test", "Copperjack Basin");
  await crossWeekend(s, 4, ["A-1", "A-3"]);
  await s.remove("A-1", "2026-01-20");
  await s.read("A-1", "2026-01-20", { elevationM: SHOP_M, airTempC: 10, kind: "teardown" }, nominal("race72", { flat: true, ccShift: [-0.2, -0.1], squishShift: -0.01 }));
  await s.topEnd("A-1", "2026-01-21");
  await readBuild(s, "A-1", "race72", "2026-01-23");
  await s.run("A-4", "2026-01-24", 0.8, "Practice day", "Home track");
  await s.run("A-5", "2026-01-24", 1.2, "Altitude test", "Copperjack Basin");
  await s.install("A-2", "27", "2026-01-26");
  await s.topEnd("A-5", "2026-01-27");
  await s.topEnd("A-7", "2026-01-27");
  // A-5's baseline, 19.0 h on the crank (DEMO.md drift 2).
  await s.read("A-5", "2026-01-29", { elevationM: SHOP_M, airTempC: 12, kind: "build", baseline: true }, [
    cylinder(1, { cc: 27.5, flat: 31.0, squish: [1.45, 1.46], psi: 152, leak: 4 }),
    cylinder(2, { cc: 27.5, flat: 31.0, squish: [1.45, 1.45], psi: 151, leak: 4 }, 1),
  ]);
  await readBuild(s, "A-7", "triple78", "2026-01-29");
  await crossWeekend(s, 5, ["A-2", "A-3"]);
  await s.install("A-5", "9", "2026-02-02");
  await s.install("A-7", "62", "2026-02-02");
  await hillclimb(s, ["2026-02-08", "2026-02-09"], "Copperjack Basin", [["A-5", 0.8], ["A-7", 0.6]]);
  const venue = (name: string, day: string, elevationM: number, airTempC: number, cyl: ReturnType<typeof cylinder>[], notes: string): Promise<number> =>
    s.read(name, day, { elevationM, airTempC, kind: "between_events", notes }, cyl);
  await venue("A-5", "2026-02-09", 2103, -12, [cylinder(1, { cc: 27.5, squish: [1.47, 1.47], psi: 121, leak: 4 }), cylinder(2, { cc: 27.5, squish: [1.46, 1.46], psi: 120, leak: 4 }, 1)], "Read in the pits at the venue, engine cold.");
  await crossWeekend(s, 6, ["A-2", "A-3"]);
  await s.remove("A-2", "2026-02-17");
  await readBetween(s, "A-2", "race72", "2026-02-17", [-0.1, 0]);
  await readBetween(s, "A-3", "race72", "2026-02-17", [0, -0.1]);
  await s.run("A-4", "2026-02-21", 1.2, "Practice day", "Home track");
  await readBetween(s, "A-4", "stock72", "2026-02-22", [-0.1, 0]);
  await hillclimb(s, ["2026-02-28", "2026-03-01"], "Quillmore Ridge", [["A-5", 0.8], ["A-7", 0.6]]);
  await venue("A-5", "2026-03-02", 2377, -9, [cylinder(1, { cc: 27.5, squish: [1.5, 1.48], psi: 114, leak: 5 }), cylinder(2, { cc: 27.5, squish: [1.48, 1.47], psi: 114, leak: 4 }, 1)], "Read in the pits at the venue, engine cold.");
  await s.read("A-7", "2026-03-02", { elevationM: 2377, airTempC: -9, kind: "between_events" }, nominal("triple78", { elevationM: 2377 }));
  await s.install("A-1", "27", "2026-03-02");
  await crossWeekend(s, 7, ["A-1", "A-3"]);
  await s.remove("A-1", "2026-03-10");
  await s.remove("A-3", "2026-03-10");
  await readBetween(s, "A-1", "race72", "2026-03-10", [0, -0.1]);
  await readBetween(s, "A-3", "race72", "2026-03-10", [-0.1, -0.1]);
  await s.run("A-4", "2026-03-14", 1.0, "Practice day", "Home track");
  await hillclimb(s, ["2026-03-21", "2026-03-22"], "Granite Notch", [["A-5", 0.8], ["A-7", 0.6]]);
  await venue("A-5", "2026-03-23", 2621, -15, [cylinder(1, { cc: 27.5, squish: [1.53, 1.5], psi: 108, leak: 5 }), cylinder(2, { cc: 27.5, squish: [1.5, 1.49], psi: 107, leak: 4 }, 1)], "Read at the venue. A knock at idle on the last climb.");
  await s.remove("A-5", "2026-03-24");
  await s.read("A-5", "2026-03-25", { elevationM: SHOP_M, airTempC: 12, kind: "teardown", notes: "Big-end play on cylinder 1: crank out at 21.4 h instead of 25 h." }, [
    cylinder(1, { cc: 27.6, flat: 31.0, squish: [1.53, 1.51], psi: 141, leak: 5 }),
    cylinder(2, { cc: 27.5, flat: 31.0, squish: [1.5, 1.49], psi: 140, leak: 4 }, 1),
  ]);
  await s.bottomEnd("A-5", "2026-03-26", "Crank rebuilt at 21.4 h: squish grew 0.08 mm on cylinder 1");
  await s.topEnd("A-5", "2026-03-26");
  for (const c of [0, 1]) {
    await movePart(k, orgId, inserts.alt[c], { toEngineId: s.engineId("A-6"), cylinderNo: c + 1, movedOn: "2026-03-27", notes: "A-6 takes the altitude inserts for Fenwick Summit", by: people.builder });
    await movePart(k, orgId, inserts.low[c], { toEngineId: s.engineId("A-5"), cylinderNo: c + 1, movedOn: "2026-03-27", by: people.builder });
  }
  await readBuild(s, "A-5", "low85", "2026-03-28", "Rebuilt bottom end; low-altitude inserts fitted meanwhile.");
  await readBuild(s, "A-6", "alt85", "2026-03-28", "Altitude inserts from A-5 for the high events.");
  await s.install("A-6", "9", "2026-03-30");
  await hillclimb(s, ["2026-04-04", "2026-04-05"], "Fenwick Summit", [["A-6", 0.8], ["A-7", 0.6]]);
  await s.read("A-6", "2026-04-06", { elevationM: 2987, airTempC: -18, kind: "between_events", notes: "Read at the venue." }, nominal("alt85", { elevationM: 2987 }));
  await hillclimb(s, ["2026-04-18", "2026-04-19"], "Cold Fork Basin", [["A-6", 0.8], ["A-7", 0.6]]);
  await s.remove("A-6", "2026-04-21");
  await s.remove("A-7", "2026-04-21");

  // The off-season.
  await s.topEnd("A-2", "2026-10-08");
  await s.bottomEnd("A-2", "2026-10-08", "Crank at 19.5 h: renewed for the new season");
  await readBuild(s, "A-2", "race72", "2026-10-10");
  await s.topEnd("A-1", "2026-10-15");
  await readBuild(s, "A-1", "race72", "2026-10-17");
  for (const c of [0, 1]) {
    await movePart(k, orgId, inserts.alt[c], { toEngineId: s.engineId("A-5"), cylinderNo: c + 1, movedOn: "2026-10-20", notes: "Altitude inserts back home", by: people.builder });
    await movePart(k, orgId, inserts.low[c], { toEngineId: s.engineId("A-6"), cylinderNo: c + 1, movedOn: "2026-10-20", by: people.builder });
  }
  await s.topEnd("A-6", "2026-10-21");
  await readBuild(s, "A-5", "alt85", "2026-10-22");
  await readBuild(s, "A-6", "low85", "2026-10-22");
  await s.topEnd("A-3", "2026-10-29");
  await readBuild(s, "A-3", "race72", "2026-10-31");
  await s.topEnd("A-7", "2026-11-06", "Full rebuild");
  await s.bottomEnd("A-7", "2026-11-06", "Full rebuild");
  await s.run("A-4", "2026-11-08", 1.2, "Practice day", "Home track");
  // A-7's build-time spread: the centre chamber 0.4 cc small, re-opened before the first event.
  await s.read("A-7", "2026-11-10", { elevationM: SHOP_M, airTempC: 15, kind: "build", notes: "Centre chamber reads 0.4 cc small: re-open it before the first event." }, [
    cylinder(1, { cc: 24.8, flat: 27.9, squish: [1.3, 1.3], psi: 149, leak: 3 }),
    cylinder(2, { cc: 24.4, flat: 27.5, squish: [1.3, 1.3], psi: 152, leak: 3 }, 1),
    cylinder(3, { cc: 24.8, flat: 27.9, squish: [1.3, 1.3], psi: 149, leak: 3 }, 2),
  ]);
  await s.read("A-7", "2026-11-14", { elevationM: SHOP_M, airTempC: 15, kind: "build", baseline: true, notes: "Centre chamber re-opened by hand; the three within 0.1 cc." }, [
    cylinder(1, { cc: 24.8, flat: 27.9, squish: [1.3, 1.3], psi: 149, leak: 3 }),
    cylinder(2, { cc: 24.7, flat: 27.8, squish: [1.3, 1.3], psi: 150, leak: 3 }, 1),
    cylinder(3, { cc: 24.8, flat: 27.9, squish: [1.3, 1.3], psi: 149, leak: 3 }, 2),
  ]);

  // The 2026–27 season so far: the home test of Nov 22, logged from the sleds' hour meters.
  await s.install("A-1", "27", "2026-11-14", true);
  await s.install("A-2", "114", "2026-11-14", true);
  await s.run("A-4", "2026-11-15", 1.2, "Practice day", "Home track");
  await readBetween(s, "A-4", "stock72", "2026-11-16", [-0.2, -0.3]);
  await s.run("A-1", "2026-11-22", 0.4, "Shake-down", "Home test");
  await s.run("A-1", "2026-11-22", 0.6, "Test runs", "Home test");
  await s.run("A-2", "2026-11-22", 0.4, "Shake-down", "Home test");
  await s.run("A-2", "2026-11-22", 0.6, "Test runs", "Home test");
  await readBetween(s, "A-1", "race72", "2026-11-24");
  await readBetween(s, "A-2", "race72", "2026-11-24", [0, -0.1]);
  await s.install("A-5", "9", "2026-11-25");
  await s.install("A-7", "62", "2026-11-25");
}
