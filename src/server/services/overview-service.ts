import { db } from "../../db/client.ts";

export interface OverviewFact {
  label: string;
  value: string;
  href?: string;
}

const UNIT_SHORT = { hours: "h", kilometres: "km", laps: "laps", litres: "L" } as const;

/** What the Overview can honestly say about an organisation from what it holds. */
export async function loadOverview(organisationId: number): Promise<{ facts: OverviewFact[] }> {
  const k = db();
  const [org, engines, usage, members] = await Promise.all([
    k("organisations").where({ id: organisationId }).first("usage_unit", "shop_elevation_m"),
    k("engines").where({ organisation_id: organisationId }).whereNull("archived_at").groupBy("status").select("status").count<{ status: string; n: number }[]>({ n: "*" }),
    k("usage_entries")
      .where({ organisation_id: organisationId })
      .whereNull("archived_at")
      .andWhere("occurred_on", ">=", k.raw("DATE_SUB(CURDATE(), INTERVAL 30 DAY)"))
      .sum<{ total: number | null }[]>({ total: "amount" })
      .first(),
    k("memberships").where({ organisation_id: organisationId }).count<{ n: number }[]>({ n: "*" }).first(),
  ]);
  const byStatus = Object.fromEntries(engines.map((e) => [e.status, Number(e.n)]));
  const total = Object.values(byStatus).reduce((a, b) => a + b, 0);
  const unit = UNIT_SHORT[org.usage_unit as keyof typeof UNIT_SHORT] ?? "";
  const facts: OverviewFact[] = [
    { label: "Engines", value: String(total), href: "/motors" },
    { label: "Running · on the bench · spare", value: `${byStatus.running ?? 0} · ${byStatus.bench ?? 0} · ${byStatus.spare ?? 0}` },
    { label: "Usage, last 30 days", value: `${Number(usage?.total ?? 0).toFixed(1)} ${unit}` },
    { label: "Crew", value: String(members?.n ?? 0), href: "/crew" },
  ];
  if (org.shop_elevation_m != null) facts.push({ label: "Shop elevation", value: `${org.shop_elevation_m} m` });
  return { facts };
}
