import type { Permission } from "./permissions.ts";

/** Ringland's sections, in navigation order. Only sections that work are listed. */
export interface Section {
  name: string;
  href: string;
  permission: Permission;
}

export const SECTIONS: Section[] = [
  { name: "Overview", href: "/", permission: "org:read" },
  { name: "Motors", href: "/motors", permission: "engine:read" },
  { name: "Season", href: "/season", permission: "season:read" },
  { name: "Bench", href: "/bench", permission: "season:read" },
  { name: "Signals", href: "/signals", permission: "signal:read" },
  { name: "Workbench", href: "/workbench", permission: "calc:use" },
  { name: "Crew", href: "/crew", permission: "crew:read" },
  { name: "Settings", href: "/settings", permission: "settings:manage" },
];
