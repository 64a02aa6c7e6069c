import type { Session, User } from "lucia";
import { can, type Permission, type Role } from "../../lib/permissions.ts";
import { forbidden, unauthorized } from "../errors.ts";

export interface ActiveMembership {
  organisationId: number;
  organisationName: string;
  organisationSlug: string;
  role: Role;
  timeZone: string;
  usageUnit: "hours" | "kilometres" | "laps" | "litres";
  unitSystem: "metric" | "imperial";
}

export interface AuthLocals {
  user: User | null;
  session: Session | null;
  membership: ActiveMembership | null;
  memberships: ActiveMembership[];
}

export function requireUser(locals: AuthLocals): User {
  if (!locals.user) throw unauthorized();
  return locals.user;
}

/** The one permission check of the server: throws 401 without a session, 403 without the right. */
export function requirePermission(locals: AuthLocals, permission: Permission): ActiveMembership {
  requireUser(locals);
  if (!locals.membership) throw forbidden("You are not a member of an organisation yet.");
  if (!can(locals.membership, permission)) throw forbidden();
  return locals.membership;
}
