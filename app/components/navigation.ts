import type { Role } from "../../shared/roles";

export interface NavItem {
  to: string;
  label: string;
  roles: Role[] | "all";
}

// Only sections that exist appear here; later features add their entries.
export const NAV_ITEMS: NavItem[] = [
  { to: "/", label: "Home", roles: "all" },
  { to: "/circuits", label: "Circuits", roles: "all" },
  { to: "/devices", label: "Device profiles", roles: "all" },
  { to: "/portfolio", label: "Portfolio", roles: "all" },
  { to: "/optimise", label: "Optimiser", roles: ["admin", "engineer"] },
  { to: "/rules", label: "Rule book", roles: "all" },
  { to: "/admin/users", label: "People", roles: ["admin"] },
  { to: "/admin/policy", label: "Policy", roles: ["admin"] },
  { to: "/admin/api-keys", label: "API keys", roles: ["admin"] },
  { to: "/admin/webhooks", label: "Webhooks", roles: ["admin"] },
  { to: "/admin/audit", label: "Audit log", roles: ["admin"] },
];

export function navFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((i) => i.roles === "all" || i.roles.includes(role));
}
