/**
 * Who may do what, in one table. The server checks with requirePermission(); the UI hides
 * controls with the same can(). No page or handler compares role names itself.
 */
export const ROLES = ["owner", "manager", "crew_chief", "mechanic", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  owner: "Owner",
  manager: "Team manager",
  crew_chief: "Crew chief",
  mechanic: "Mechanic",
  viewer: "Viewer",
};

const ALL: readonly Role[] = ROLES;
const CREW: readonly Role[] = ["owner", "manager", "crew_chief", "mechanic"];
const LEADS: readonly Role[] = ["owner", "manager", "crew_chief"];
const PLANNERS: readonly Role[] = ["owner", "manager"];
const OWNER: readonly Role[] = ["owner"];

export const PERMISSIONS = {
  "org:read": ALL,
  "calc:use": ALL,
  "crew:read": ALL,
  "crew:manage": OWNER,
  "audit:read": OWNER,
  "settings:manage": OWNER,
  "engine:read": ALL,
  "engine:update": PLANNERS,
  "chassis:update": PLANNERS,
  "part:update": ["owner", "manager", "mechanic"],
  "usage:log": CREW,
  "reading:create": CREW,
  "reading:baseline": LEADS,
  "export:read": CREW,
  "season:read": ALL,
  "season:plan": PLANNERS,
  "job:work": ["owner", "manager", "mechanic"],
  "fuel:decide": LEADS,
  "signal:read": CREW,
  "signal:manage": LEADS,
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export interface MembershipLike {
  role: Role;
}

export function can(membership: MembershipLike | null | undefined, permission: Permission): boolean {
  if (!membership) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(membership.role);
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
