import type { Knex } from "knex";
import { createReadingSet } from "../tests/factories/motors.ts";

/**
 * Readings taken in the last days before "today" (2026-12-01) that the crew has not acted on yet,
 * so the demo opens with live signals (all invented):
 *  - A-1 after the home test: its crank is at 15.5 of 24 h and the squish on cylinder 1 has opened
 *    up by about 0.06 mm on both sides: the first sign of bottom-end wear (watch).
 *  - B-3 at the end of the tour season: leak-down on its one cylinder up 6 points and cranking
 *    down about 11 % from its baseline (watch): a valve-seat story in the making.
 * Created once: a set already taken on that day for that engine is left alone.
 */
interface Shift {
  engine: string;
  slug: string;
  takenOn: string;
  note: string;
  squishMm?: number;
  leakdownPoints?: number;
  crankingFactor?: number;
  cylinders?: number[];
}

const SHIFTS: Shift[] = [
  { engine: "A-1", slug: "kestrel-hollow", takenOn: "2026-11-28", note: "Checked again after the home test, cold, same solder as the baseline: cylinder 1 squish has opened up.", squishMm: 0.06, cylinders: [1] },
  { engine: "B-3", slug: "larchwind-trail", takenOn: "2026-10-30", note: "End-of-season check at the shop: leak-down heard at the exhaust.", leakdownPoints: 6, crankingFactor: 0.89 },
];

const n = (v: unknown): number | null => (v == null ? null : Number(v));

export async function seed(knex: Knex): Promise<void> {
  for (const s of SHIFTS) {
    await knex.transaction(async (trx) => {
      const org = await trx("organisations").where({ slug: s.slug }).first("id");
      if (!org) return;
      const engine = await trx("engines").where({ organisation_id: org.id, name: s.engine }).first("id");
      if (!engine) return;
      if (await trx("reading_sets").where({ engine_id: engine.id, taken_on: s.takenOn }).first("id")) return;
      const baseline = await trx("reading_sets").where({ engine_id: engine.id, is_baseline: true }).whereNull("archived_at").orderBy("taken_on", "desc").first();
      if (!baseline) return;
      const cylinders = await trx("cylinder_readings").where({ reading_set_id: baseline.id }).orderBy("cylinder_no");
      const chief = await trx("memberships as m").join("users as u", "u.id", "m.user_id").where({ "m.organisation_id": org.id }).whereIn("m.role", ["crew_chief", "owner"]).orderByRaw("FIELD(m.role, 'crew_chief', 'owner')").first("u.id");
      const hit = (c: number): boolean => !s.cylinders || s.cylinders.includes(c);
      await createReadingSet(trx, Number(org.id), {
        engineId: Number(engine.id),
        takenOn: s.takenOn,
        elevationM: Number(baseline.elevation_m),
        airTempC: n(baseline.air_temp_c),
        setKind: "between_events",
        methodNotes: s.note,
        by: chief?.id ?? null,
        cylinders: cylinders.map((c) => {
          const shift = hit(Number(c.cylinder_no));
          const a = n(c.squish_a_mm);
          const b = n(c.squish_b_mm);
          const cranking = n(c.cranking_kpa);
          const leak = n(c.leakdown_pct);
          const round = (v: number, d: number): number => Math.round(v * 10 ** d) / 10 ** d;
          return {
            cylinderNo: Number(c.cylinder_no),
            chamberReadingsCc: (typeof c.chamber_readings_cc === "string" ? JSON.parse(c.chamber_readings_cc) : c.chamber_readings_cc) as number[],
            flatPlateCc: n(c.flat_plate_cc),
            squishAMm: a == null ? null : round(a + (shift ? s.squishMm ?? 0 : 0), 3),
            squishBMm: b == null ? null : round(b + (shift ? (s.squishMm ?? 0) - 0.01 : 0), 3),
            crankingKpa: cranking == null ? null : round(cranking * (shift ? s.crankingFactor ?? 1 : 1), 1),
            leakdownPct: leak == null ? null : round(leak + (shift ? s.leakdownPoints ?? 0 : 0), 1),
          };
        }),
      });
    });
  }
}
