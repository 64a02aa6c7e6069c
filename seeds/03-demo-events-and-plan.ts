import type { Knex } from "knex";
import { planRebuilds } from "../src/lib/domain/planner/index.ts";
import { loadSeasonData } from "../src/server/services/season-input.ts";
import { applyPlan } from "../src/server/services/season-plan-store.ts";

/**
 * Kestrel Hollow Racing's invented 2026–27 season (DEMO.md): thirteen events from a home test
 * on 22 Nov 2026 to Cold Fork Basin on 17–18 Apr 2027, the chassis entered with the engine
 * hours each is expected to run, the shop's hours and closed days, and a plan accepted as of
 * 1 Dec 2026. Everything is fiction. Runs after the crews and motors seeds and only creates
 * what is absent: once the season exists it is left as the team has changed it.
 */
export const SEASON_TODAY = "2026-12-01";

type Row = [name: string, venue: string, startsOn: string, endsOn: string, kind: "race" | "test", elevationM: number, airTempC: number, discipline: "cross" | "hill", usage: number];

// Air temperatures are invented expectations for each venue and month.
const EVENTS: Row[] = [
  ["Home test", "Kestrel Hollow shop track", "2026-11-22", "2026-11-22", "test", 366, -6, "cross", 1.0],
  ["Pinecrest Flats", "Pinecrest Flats", "2026-12-05", "2026-12-07", "race", 351, -10, "cross", 1.5],
  ["Harlow Lake", "Harlow Lake", "2026-12-19", "2026-12-21", "race", 451, -14, "cross", 1.5],
  ["Red Tamarack", "Red Tamarack", "2027-01-02", "2027-01-04", "race", 625, -18, "cross", 1.5],
  ["Birchmoor Fairgrounds", "Birchmoor Fairgrounds", "2027-01-16", "2027-01-18", "race", 396, -15, "cross", 1.5],
  ["Stonegate Bowl", "Stonegate Bowl", "2027-01-30", "2027-02-01", "race", 975, -12, "cross", 1.5],
  ["Copperjack Basin hillclimb", "Copperjack Basin", "2027-02-07", "2027-02-08", "race", 2103, -9, "hill", 0],
  ["Harlow Lake II", "Harlow Lake", "2027-02-13", "2027-02-15", "race", 451, -11, "cross", 1.5],
  ["Quillmore Ridge hillclimb", "Quillmore Ridge", "2027-02-27", "2027-03-01", "race", 2377, -8, "hill", 0],
  ["Birchmoor Final", "Birchmoor Fairgrounds", "2027-03-06", "2027-03-08", "race", 396, -6, "cross", 1.5],
  ["Granite Notch hillclimb", "Granite Notch", "2027-03-20", "2027-03-22", "race", 2621, -7, "hill", 0],
  ["Fenwick Summit hillclimb", "Fenwick Summit", "2027-04-03", "2027-04-05", "race", 2987, -5, "hill", 0],
  ["Cold Fork Basin hillclimb", "Cold Fork Basin", "2027-04-17", "2027-04-18", "race", 2499, -3, "hill", 0],
];

/** Hillclimb hours per engine that ran (DEMO.md: the twin 0.8 h, the triple 0.6 h). */
const HILL_USAGE: Record<string, number> = { "A-5": 0.8, "A-7": 0.6 };

// TRADE.md (from memory): about 25–35 shop hours a week in season; twin top end 3–5 h, bottom end 10–14 h.
const SHOP = { hours_per_weekday: JSON.stringify([6, 6, 6, 6, 6, 0, 0]), travel_days_before_event: 1, top_end_hours: 4, bottom_end_hours: 12, inspection_hours: 1.5, parts_lead_days: 3 };
const CLOSED: [string, string][] = [
  ["2026-12-24", "Christmas Eve"],
  ["2026-12-25", "Christmas Day"],
  ["2026-12-31", "New Year's Eve"],
  ["2027-01-01", "New Year's Day"],
];

async function findChassis(k: Knex, organisationId: number, number: string): Promise<number | null> {
  const bare = number.replace(/^#/, "");
  const row = await k("chassis").where({ organisation_id: organisationId }).whereIn("number", [`#${bare}`, bare]).whereNull("archived_at").first("id");
  return row ? Number(row.id) : null;
}

async function findEngine(k: Knex, organisationId: number, name: string): Promise<{ id: number; chassisId: number | null } | null> {
  const row = await k("engines as e")
    .leftJoin("installations as i", function () {
      this.on("i.engine_id", "=", "e.id").andOnNull("i.removed_at");
    })
    .where({ "e.organisation_id": organisationId, "e.name": name })
    .first("e.id", "i.chassis_id");
  return row ? { id: Number(row.id), chassisId: row.chassis_id === null ? null : Number(row.chassis_id) } : null;
}

export async function seed(knex: Knex): Promise<void> {
  const org = await knex("organisations").where({ slug: "kestrel-hollow" }).first("id", "usage_unit");
  if (!org) return;
  const organisationId = Number(org.id);
  if (await knex("events").where({ organisation_id: organisationId }).first("id")) return;
  const hasChassisTable = await knex.schema.hasTable("chassis");
  const cross = hasChassisTable ? [await findChassis(knex, organisationId, "#27"), await findChassis(knex, organisationId, "#114")] : [];
  const a1 = await findEngine(knex, organisationId, "A-1");
  const a2 = await findEngine(knex, organisationId, "A-2");
  // The hillclimb sleds are the ones the hillclimb engines sit in; #9 takes the triple when it is out.
  const hill: [string, number | null][] = [];
  for (const name of ["A-5", "A-7"]) {
    const engine = await findEngine(knex, organisationId, name);
    const chassisId = engine?.chassisId ?? (name === "A-7" && hasChassisTable ? await findChassis(knex, organisationId, "#9") : null);
    hill.push([name, chassisId]);
  }
  if (cross.some((c) => c === null) || hill.some(([, c]) => c === null)) {
    console.log("ringland: the demo season is entered only for the chassis the motors seed created");
  }
  await knex.transaction(async (trx) => {
    if (!(await trx("shop_settings").where({ organisation_id: organisationId }).first("organisation_id"))) {
      await trx("shop_settings").insert({ organisation_id: organisationId, ...SHOP });
    }
    for (const [day, reason] of CLOSED) {
      if (!(await trx("shop_closed_days").where({ organisation_id: organisationId, day }).first("id"))) {
        await trx("shop_closed_days").insert({ organisation_id: organisationId, day, reason });
      }
    }
    for (const [name, venue, startsOn, endsOn, kind, elevationM, airTempC, discipline, usage] of EVENTS) {
      const [eventId] = await trx("events").insert({
        organisation_id: organisationId,
        name,
        venue,
        starts_on: startsOn,
        ends_on: endsOn,
        elevation_m: elevationM,
        expected_air_temp_c: airTempC,
        kind,
        important: name === "Birchmoor Final",
      });
      const past = startsOn < SEASON_TODAY;
      if (discipline === "cross") {
        const ran = [a1, a2];
        for (const [i, chassisId] of cross.entries()) {
          if (chassisId === null) continue;
          // The home test already ran: A-1 in #27 and A-2 in #114 (DEMO.md).
          await trx("event_entries").insert({ event_id: eventId, chassis_id: chassisId, expected_usage: usage, engine_id: past ? (ran[i]?.id ?? null) : null });
        }
      } else {
        for (const [engineName, chassisId] of hill) {
          if (chassisId !== null) await trx("event_entries").insert({ event_id: eventId, chassis_id: chassisId, expected_usage: HILL_USAGE[engineName] });
        }
      }
    }
    const data = await loadSeasonData(trx, organisationId, SEASON_TODAY, org.usage_unit ?? "hours");
    if (data.input.engines.length > 0) await applyPlan(trx, organisationId, null, "seed", data, planRebuilds(data.input));
  });
}
