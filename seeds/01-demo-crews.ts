import type { Knex } from "knex";
import { addMember, createOrganisation, createUser } from "../tests/factories/people.ts";
import { hashPassword } from "../src/server/auth/passwords.ts";
import type { Role } from "../src/lib/permissions.ts";

/**
 * The invented demo crews. Everything here is fiction. Runs on every `npm start`, so it only
 * creates what is absent and never touches data a person entered.
 */
export const DEMO_PASSWORD = "ringland-demo";

const PEOPLE: { email: string; name: string }[] = [
  { email: "owner@ringland.example", name: "Ilse Brandvold" },
  { email: "manager@ringland.example", name: "Rafe Gunnarson" },
  { email: "chief@ringland.example", name: "Teo Marchetti" },
  { email: "mechanic@ringland.example", name: "Jonah Pike" },
  { email: "wren@ringland.example", name: "Wren Adeyemi" },
  { email: "viewer@ringland.example", name: "Kaja Lindqvist" },
  { email: "beck@ringland.example", name: "Beck Tamura" },
  { email: "odd@ringland.example", name: "Odd Sveen" },
  { email: "nell@larchwind.example", name: "Nell Ostrowski" },
  { email: "sami@larchwind.example", name: "Sami Haddad" },
];

const ORGS = [
  {
    slug: "kestrel-hollow",
    attrs: { name: "Kestrel Hollow Racing", timeZone: "America/Denver", usageUnit: "hours" as const, unitSystem: "imperial" as const, shopElevationM: 366 },
    members: [
      ["owner@ringland.example", "owner"],
      ["manager@ringland.example", "manager"],
      ["chief@ringland.example", "crew_chief"],
      ["mechanic@ringland.example", "mechanic"],
      ["wren@ringland.example", "mechanic"],
      ["viewer@ringland.example", "viewer"],
      ["beck@ringland.example", "viewer"],
      ["odd@ringland.example", "viewer"],
    ] as [string, Role][],
  },
  {
    slug: "larchwind-trail",
    attrs: { name: "Larchwind Trail Tours", timeZone: "America/Denver", usageUnit: "hours" as const, unitSystem: "imperial" as const, shopElevationM: 2408 },
    members: [
      ["nell@larchwind.example", "owner"],
      ["sami@larchwind.example", "mechanic"],
      // The team's engine builder also builds for the tour fleet: one person, two organisations.
      ["manager@ringland.example", "mechanic"],
    ] as [string, Role][],
  },
];

export async function seed(knex: Knex): Promise<void> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await knex.transaction(async (trx) => {
    const ids = new Map<string, string>();
    for (const p of PEOPLE) {
      const existing = await trx("users").where({ email: p.email }).first("id");
      ids.set(p.email, existing?.id ?? (await createUser(trx, { ...p, passwordHash })));
    }
    for (const org of ORGS) {
      if (await trx("organisations").where({ slug: org.slug }).first("id")) continue;
      const orgId = await createOrganisation(trx, { slug: org.slug, ...org.attrs });
      for (const [email, role] of org.members) await addMember(trx, orgId, ids.get(email)!, role);
    }
  });
}
