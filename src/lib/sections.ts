import type { Permission } from "./permissions.ts";

/** Ringland's sections, in navigation order. Only sections that work are listed. */
export interface Section {
  name: string;
  href: string;
  permission: Permission;
}

export const SECTIONS: Section[] = [
  { name: "Overview", href: "/", permission: "org:read" },
  { name: "Crew", href: "/crew", permission: "crew:read" },
  { name: "Settings", href: "/settings", permission: "settings:manage" },
];
