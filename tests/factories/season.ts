import type { Knex } from "knex";
import type { Role } from "../../src/lib/permissions.ts";
import { createChassis, createEngine, installEngine, logUsage, recordService } from "./motors.ts";
import { addMember, createOrganisation, createUser, uniqueSuffix } from "./people.ts";

/** Builders for season tests: a small team with chassis, engines worn to known hours, and a shop. */

export const SEASON_PASSWORD = "a-long-season-password";

/** A calendar day `days` from `from` (UTC), written YYYY-MM-DD. */
export function shiftDay(from: string, days: number): string {
  const d = new Date(`${from}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

export function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}

export interface SeasonTeam {
  orgId: number;
  emails: Record<Role, string>;
  chassis: { c7: number; c11: number };
  engines: { e1: number; e2: number; e3: number };
}

export interface EngineWear {
  top: number;
  bottom: number;
}

/**
 * An organisation (time zone UTC) with one person per role, chassis 7 and 11, and three twins
 * of one family: E1 in 7, E2 in 11, E3 spare. Wear is logged 30 days ago after a top end 60
 * days ago (and a bottom end before it). The shop works 6 h every day, so tests do not depend on
 * the weekday they run on.
 */
export async function createSeasonTeam(k: Knex, wear: { e1: EngineWear; e2: EngineWear; e3: EngineWear } = { e1: { top: 6, bottom: 10 }, e2: { top: 4, bottom: 6 }, e3: { top: 7.5, bottom: 12 } }): Promise<SeasonTeam> {
  const s = uniqueSuffix();
  const orgId = await createOrganisation(k, { name: `Season team ${s}`, slug: `season-${s}`, timeZone: "UTC" });
  const emails = {} as Record<Role, string>;
  for (const role of ["owner", "manager", "crew_chief", "mechanic", "viewer"] as Role[]) {
    emails[role] = `season-${role}-${s}@test.example`;
    const userId = await createUser(k, { email: emails[role], name: `${role} ${s}`, password: SEASON_PASSWORD });
    await addMember(k, orgId, userId, role);
  }
  const today = todayUtc();
  const c7 = await createChassis(k, orgId, { number: "7" });
  const c11 = await createChassis(k, orgId, { number: "11" });
  const engines: Record<string, number> = {};
  for (const [key, name, chassisId] of [["e1", "E1", c7], ["e2", "E2", c11], ["e3", "E3", null]] as const) {
    const id = await createEngine(k, orgId, { name, status: chassisId ? "running" : "spare", topEndLimit: 8, bottomEndLimit: 24 });
    engines[key] = id;
    if (chassisId) await installEngine(k, orgId, { engineId: id, chassisId, installedAt: shiftDay(today, -90) });
    const w = wear[key];
    await recordService(k, orgId, { engineId: id, kind: "bottom_end", doneOn: shiftDay(today, -120) });
    if (w.bottom > w.top) await logUsage(k, orgId, { engineId: id, occurredOn: shiftDay(today, -90), amount: w.bottom - w.top });
    await recordService(k, orgId, { engineId: id, kind: "top_end", doneOn: shiftDay(today, -60) });
    await recordService(k, orgId, { engineId: id, kind: "inspection", doneOn: shiftDay(today, -60) });
    if (w.top > 0) await logUsage(k, orgId, { engineId: id, occurredOn: shiftDay(today, -30), amount: w.top });
  }
  await k("shop_settings").insert({
    organisation_id: orgId,
    hours_per_weekday: JSON.stringify([6, 6, 6, 6, 6, 6, 6]),
    travel_days_before_event: 1,
    top_end_hours: 4,
    bottom_end_hours: 12,
    inspection_hours: 1.5,
    parts_lead_days: 3,
  });
  return { orgId, emails, chassis: { c7, c11 }, engines: { e1: engines.e1, e2: engines.e2, e3: engines.e3 } };
}
