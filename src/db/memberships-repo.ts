import type { Knex } from "knex";
import type { ActiveMembership } from "../server/auth/guard.ts";
import { db } from "./client.ts";

interface Row {
  organisation_id: number;
  name: string;
  slug: string;
  role: ActiveMembership["role"];
  time_zone: string;
  usage_unit: ActiveMembership["usageUnit"];
  unit_system: ActiveMembership["unitSystem"];
}

export async function listMembershipsOfUser(userId: string, trx: Knex = db()): Promise<ActiveMembership[]> {
  const rows: Row[] = await trx("memberships as m")
    .join("organisations as o", "o.id", "m.organisation_id")
    .where("m.user_id", userId)
    .orderBy("o.name")
    .select("m.organisation_id", "o.name", "o.slug", "m.role", "o.time_zone", "o.usage_unit", "o.unit_system");
  return rows.map((r) => ({
    organisationId: Number(r.organisation_id),
    organisationName: r.name,
    organisationSlug: r.slug,
    role: r.role,
    timeZone: r.time_zone,
    usageUnit: r.usage_unit,
    unitSystem: r.unit_system,
  }));
}
