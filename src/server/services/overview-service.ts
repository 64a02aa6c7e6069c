import { db } from "../../db/client.ts";

export interface OverviewFact {
  label: string;
  value: string;
}

const UNIT_LABEL = { hours: "hours", kilometres: "kilometres", laps: "laps", litres: "litres of fuel" } as const;

/** What the Overview can honestly say about an organisation from what it holds. */
export async function loadOverview(organisationId: number): Promise<{ facts: OverviewFact[] }> {
  const org = await db()("organisations").where({ id: organisationId }).first();
  const members = await db()("memberships").where({ organisation_id: organisationId }).count<{ n: number }[]>({ n: "*" }).first();
  const facts: OverviewFact[] = [
    { label: "Crew members", value: String(members?.n ?? 0) },
    { label: "Usage counted in", value: UNIT_LABEL[org.usage_unit as keyof typeof UNIT_LABEL] },
    { label: "Shop elevation", value: org.shop_elevation_m == null ? "not set" : `${org.shop_elevation_m} m` },
    { label: "Time zone", value: org.time_zone },
  ];
  return { facts };
}
