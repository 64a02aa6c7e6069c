import type { Knex } from "knex";
import { hashPassword } from "../../src/server/auth/passwords.ts";
import { newId } from "../../src/server/tokens.ts";
import type { Role } from "../../src/lib/permissions.ts";

/** Builders shared by the tests and the demo seed. */
export interface OrganisationAttrs {
  name: string;
  slug: string;
  timeZone?: string;
  usageUnit?: "hours" | "kilometres" | "laps" | "litres";
  unitSystem?: "metric" | "imperial";
  shopElevationM?: number | null;
}

export async function createOrganisation(k: Knex, a: OrganisationAttrs): Promise<number> {
  const [id] = await k("organisations").insert({
    name: a.name,
    slug: a.slug,
    time_zone: a.timeZone ?? "UTC",
    usage_unit: a.usageUnit ?? "hours",
    unit_system: a.unitSystem ?? "metric",
    shop_elevation_m: a.shopElevationM ?? null,
  });
  return Number(id);
}

export async function createUser(
  k: Knex,
  a: { email: string; name: string; password?: string | null; passwordHash?: string },
): Promise<string> {
  const id = newId();
  const hash = a.passwordHash ?? (a.password === null ? null : await hashPassword(a.password ?? "correct-horse-battery"));
  await k("users").insert({ id, email: a.email.toLowerCase(), name: a.name, password_hash: hash });
  return id;
}

export async function addMember(k: Knex, organisationId: number, userId: string, role: Role): Promise<void> {
  await k("memberships").insert({ organisation_id: organisationId, user_id: userId, role });
}

let counter = 0;
export function uniqueSuffix(): string {
  counter += 1;
  return `${Date.now().toString(36)}${process.pid.toString(36)}${counter}`;
}
