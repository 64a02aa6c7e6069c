import type { Knex } from "knex";
import { seedKestrel } from "./demo-season/kestrel.ts";
import { seedLarchwind } from "./demo-season/larchwind.ts";

/**
 * The invented demo season of engines, chassis, parts, usage and readings (DEMO.md; today in
 * the product is 2026-12-01). Runs after 01-demo-crews.ts on every start: it never wipes, and
 * fills an organisation only while that organisation has no engines at all.
 */
async function userIds(knex: Knex, emails: Record<string, string>): Promise<Record<string, string | null>> {
  const out: Record<string, string | null> = {};
  for (const [role, email] of Object.entries(emails)) {
    out[role] = (await knex("users").where({ email }).first("id"))?.id ?? null;
  }
  return out;
}

async function fillIfEmpty(knex: Knex, slug: string, fill: (trx: Knex, orgId: number) => Promise<void>): Promise<void> {
  await knex.transaction(async (trx) => {
    const org = await trx("organisations").where({ slug }).forUpdate().first("id");
    if (!org) return;
    const engines = await trx("engines").where({ organisation_id: org.id }).count<{ n: number }[]>({ n: "*" }).first();
    if (Number(engines?.n ?? 0) > 0) return;
    await fill(trx, Number(org.id));
  });
}

export async function seed(knex: Knex): Promise<void> {
  const kestrelPeople = await userIds(knex, {
    builder: "manager@ringland.example",
    chief: "chief@ringland.example",
    mechanic: "mechanic@ringland.example",
    mechanic2: "wren@ringland.example",
  });
  await fillIfEmpty(knex, "kestrel-hollow", (trx, orgId) => seedKestrel(trx, orgId, kestrelPeople));
  const larchwindPeople = await userIds(knex, {
    builder: "manager@ringland.example",
    chief: "nell@larchwind.example",
    mechanic: "sami@larchwind.example",
  });
  await fillIfEmpty(knex, "larchwind-trail", (trx, orgId) => seedLarchwind(trx, orgId, larchwindPeople));
}
