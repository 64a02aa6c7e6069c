import { testDb } from "../support/db.ts";
import { signedIn, type ApiClient } from "../support/api.ts";
import { SEASON_PASSWORD, createSeasonTeam, shiftDay, todayUtc } from "../factories/season.ts";
import { createChassis, createPart, createRacingClass, createReadingSet, logUsage } from "../factories/motors.ts";

// A throw-away organisation with a record of every kind, and one valid body per write route that
// takes one. The edge sweep changes these bodies a field at a time; whatever it writes stays here.

export interface Team {
  orgId: number;
  owner: ApiClient;
  ids: Record<string, string>;
}

export async function createTeam(): Promise<Team> {
  const k = testDb();
  const t = await createSeasonTeam(k);
  const owner = await signedIn(t.emails.owner, SEASON_PASSWORD);
  const today = todayUtc();
  const e3 = t.engines.e3;
  const free = await createChassis(k, t.orgId, { number: "99", meterKind: "hours" });
  const cls = await createRacingClass(k, t.orgId, { name: "Edge class", minSquishMm: 1 });
  const part = await createPart(k, t.orgId, { serial: "EDGE-P1", kind: "piston", engineId: e3, cylinderNo: 1, installedOn: shiftDay(today, -10), usageLimit: 10 });
  const usage = await logUsage(k, t.orgId, { engineId: e3, occurredOn: shiftDay(today, -2), amount: 0.5 });
  const set = await createReadingSet(k, t.orgId, { engineId: e3, takenOn: shiftDay(today, -2), elevationM: 366, cylinders: [{ cylinderNo: 1, leakdownPct: 5 }] });
  const service = await k("services").where({ organisation_id: t.orgId, engine_id: e3 }).first("id");
  const viewer = await k("users").where({ email: t.emails.viewer }).first("id");
  const ev = await owner.post("/api/v1/events", {
    name: "Edge weekend",
    startsOn: shiftDay(today, 20),
    endsOn: shiftDay(today, 21),
    elevationM: 1800,
    kind: "race",
    entries: [{ chassisId: t.chassis.c7, expectedUsage: 2 }],
  });
  const entry = await k("event_entries").where({ event_id: ev.body.event?.id ?? 0 }).first("id");
  await owner.post("/api/v1/jobs", { engineId: t.engines.e2, kind: "inspection", startsOn: shiftDay(today, 5) });
  await owner.post("/api/v1/crew/invitations", { email: `edge-${t.orgId}@test.example`, role: "viewer" });
  const job = await k("jobs").where({ organisation_id: t.orgId }).orderBy("id").first("id");
  const invitation = await k("invitations").where({ organisation_id: t.orgId }).orderBy("id").first("id");
  const ids: Record<string, string> = {
    e1: String(t.engines.e1),
    e2: String(t.engines.e2),
    e3: String(e3),
    c7: String(t.chassis.c7),
    c11: String(t.chassis.c11),
    free: String(free),
    cls: String(cls),
    part: String(part),
    usage: String(usage),
    set: String(set),
    service: String(service?.id ?? 999999999),
    viewer: String(viewer?.id ?? "nobody"),
    event: String(ev.body.event?.id ?? 999999999),
    entry: String(entry?.id ?? 999999999),
    job: String(job?.id ?? 999999999),
    invitation: String(invitation?.id ?? 999999999),
  };
  return { orgId: t.orgId, owner, ids };
}

/** The route's path with the team's records in it. */
export function teamPath(path: string, ids: Record<string, string>): string {
  const first: [string, string][] = [
    ["/engines/[id]", ids.e3], ["/chassis/[id]/install", ids.free], ["/chassis/[id]", ids.c7], ["/parts/[id]", ids.part],
    ["/usage/[id]", ids.usage], ["/reading-sets/[id]", ids.set], ["/racing-classes/[id]", ids.cls], ["/events/[id]", ids.event],
    ["/jobs/[id]", ids.job], ["/crew/invitations/[id]", ids.invitation],
  ];
  let p = path;
  for (const [prefix, id] of first) if (p.includes(prefix)) p = p.replace("[id]", id);
  return p
    .replace("[serviceId]", ids.service)
    .replace("[entryId]", ids.entry)
    .replace("[userId]", ids.viewer)
    .replace(/\[[^\]]+\]/g, "999999999");
}

/** A valid body for each write route that takes one, keyed "METHOD path" as in the route table. */
export function templates(orgId: number, ids: Record<string, string>): Record<string, unknown> {
  const today = todayUtc();
  const e3 = Number(ids.e3);
  const cylinder = { cylinderNo: 1, chamberReadingsCc: [21.4, 21.5], flatPlateCc: 24.1, squishAMm: 1.1, squishBMm: 1.2, crankingKpa: 1000, leakdownPct: 5, notes: "crown clean" };
  const readingSet = { engineId: e3, takenOn: shiftDay(today, -1), elevationM: 1500, airTempC: 12, setKind: "teardown", methodNotes: "burette", cylinders: [cylinder] };
  const compression = { boreMm: 72, strokeMm: 73.8, chamberCc: 21.5, cylinders: 2, rodMm: 130, exhaustOpensDegAtdc: 82, flatPlateCc: 24, targetRatio: 13 };
  const csv = `engine,date,amount\nE3,${shiftDay(today, -3)},1.5\n`;
  return {
    "POST /api/v1/engines": { name: "Edge twin", serial: "EDGE-1", cycle: "two_stroke", cylinders: 2, boreMm: 72, strokeMm: 73.8, rodMm: 130, exhaustOpensDegAtdc: 82, targetRatio: 12.5, targetSquishMm: 1.2, buildMinOctane: 91, builtForMinElevationM: 0, builtForMaxElevationM: 2500, topEndLimit: 8, bottomEndLimit: 24, planFraction: 0.8, notes: "edge" },
    "PATCH /api/v1/engines/[id]": { name: "E3", boreMm: 72.02, targetSquishMm: 1.3, notes: "bored", status: "spare" },
    "POST /api/v1/engines/[id]/services": { kind: "top_end", doneOn: shiftDay(today, -1), notes: "rings" },
    "PATCH /api/v1/engines/[id]/thresholds": { thresholds: null },
    "POST /api/v1/racing-classes": { name: "Edge stock", minSquishMm: 1.0, minChamberCc: 20, minFlatPlateCc: 22, maxDisplacementCc: 600, notes: "x" },
    "PATCH /api/v1/racing-classes/[id]": { name: "Edge class", minSquishMm: 1.1 },
    "POST /api/v1/chassis": { number: "77", kind: "sled", meterKind: "hours", notes: "x" },
    "PATCH /api/v1/chassis/[id]": { notes: "x", meterKind: "none" },
    "POST /api/v1/chassis/[id]/install": { engineId: e3, installedAt: today, meterAtInstall: 10, notes: "x" },
    "POST /api/v1/chassis/[id]/remove": { removedAt: today, status: "bench", notes: "x" },
    "POST /api/v1/parts": { serial: "EDGE-P2", kind: "rings", engineId: e3, cylinderNo: 1, usageLimit: 10, initialUsage: 0, maxTotalCutMm: 0.5, installedOn: shiftDay(today, -2), notes: "x" },
    "PATCH /api/v1/parts/[id]": { serial: "EDGE-P1", usageLimit: 12, notes: "x" },
    "POST /api/v1/parts/[id]/events": { kind: "cut", amountMm: 0.05, doneOn: shiftDay(today, -1), notes: "x" },
    "POST /api/v1/parts/[id]/move": { toEngineId: e3, cylinderNo: 2, movedOn: shiftDay(today, -1), notes: "x" },
    "POST /api/v1/usage": { engineId: e3, occurredOn: shiftDay(today, -1), amount: 0.5, sessionLabel: "S1", eventLabel: "Edge", notes: "x" },
    "PATCH /api/v1/usage/[id]": { archived: false },
    "POST /api/v1/usage/import/preview": { csv, mapping: { engine: "engine", date: "date", amount: "amount" }, dateFormat: "iso", skipBadRows: false },
    "POST /api/v1/usage/import/commit": { csv, mapping: { engine: "engine", date: "date", amount: "amount" }, dateFormat: "iso", skipBadRows: true },
    "POST /api/v1/reading-sets": readingSet,
    "POST /api/v1/reading-sets/preview": readingSet,
    "PATCH /api/v1/reading-sets/[id]": { archived: false },
    "POST /api/v1/reading-sets/[id]/baseline": { isBaseline: true },
    "PATCH /api/v1/uploads/[id]": { archived: false },
    "POST /api/v1/events": { name: "Edge race", venue: "Hill", startsOn: shiftDay(today, 30), endsOn: shiftDay(today, 31), elevationM: 2000, expectedAirTempC: -5, kind: "race", important: true, notes: "x", entries: [{ chassisId: Number(ids.c11), expectedUsage: 2.5 }] },
    "PATCH /api/v1/events/[id]": { name: "Edge weekend", elevationM: 1900 },
    "PATCH /api/v1/events/[id]/entries/[entryId]": { engineId: Number(ids.e1) },
    "POST /api/v1/events/[id]/entries/[entryId]": { fuelRun: "VP 110" },
    "POST /api/v1/jobs": { engineId: e3, kind: "top_end", startsOn: shiftDay(today, 3), pinned: true },
    "PATCH /api/v1/jobs/[id]": { state: "in_progress", labourHoursActual: 2, notes: "x", checklist: [{ item: "rings", done: true }] },
    "POST /api/v1/jobs/[id]": { startsOn: shiftDay(today, 4) },
    "PATCH /api/v1/shop": { hoursPerWeekday: [8, 8, 8, 8, 8, 0, 0], travelDaysBeforeEvent: 1, topEndHours: 4, bottomEndHours: 12, inspectionHours: 1, partsLeadDays: 3 },
    "POST /api/v1/shop": { day: shiftDay(today, 15), reason: "holiday" },
    "POST /api/v1/plan": { accept: false },
    "PATCH /api/v1/settings": {
      general: { name: "Edge team", timeZone: "UTC", usageUnit: "hours", unitSystem: "metric", shopElevationM: 366, chamberToleranceCc: 0.2 },
      signals: { schedule: "0 6 * * *" },
      fuelTable: { label: "ours", rows: [{ upToCrankingKpa: 1000, grade: "91", octaneAki: 91 }] },
    },
    "PATCH /api/v1/me/preferences": { unitSystem: "metric", unitChoices: { length: "mm", pressure: "kPa" } },
    "POST /api/v1/crew/invitations": { email: `edge2-${orgId}@test.example`, role: "viewer" },
    "PATCH /api/v1/crew/members/[userId]": { role: "viewer" },
    "POST /api/v1/signals/[id]": { action: "resolve", note: "checked" },
    "POST /api/v1/calc/compression": compression,
    "POST /api/v1/calc/fuel-check": {
      ...compression,
      elevationM: 1500,
      airTempC: 10,
      fuelTable: [{ upToCrankingKpa: 1000, grade: "91", octaneAki: 91 }, { upToCrankingKpa: 1300, grade: "110" }],
      polytropicExponent: 1.3,
      builtForMinElevationM: 0,
      buildMinOctaneAki: 91,
      fuelOctaneAki: 95,
    },
    "POST /api/v1/calc/drift": { values: [21.5, 21.4, 21.6, 21.9], target: 21.5, sigma: 0.1, lambda: 0.2, width: 3, tolerance: 0.3 },
    "POST /api/auth/switch-organisation": { organisationId: orgId },
    "POST /api/auth/sign-in": { email: "nobody-edge@test.example", password: "not-the-password" },
    "POST /api/auth/reset-request": { email: "nobody-edge@test.example" },
    "POST /api/auth/reset": { token: "t".repeat(40), password: "a-long-new-password" },
    "POST /api/auth/accept-invitation": { token: "t".repeat(40), name: "Edge", password: "a-long-new-password" },
    "POST /api/auth/sign-out": { everywhere: false },
  };
}
