export const ROLES = ["admin", "engineer", "consultant", "manager"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Administrator",
  engineer: "Utility engineer",
  consultant: "Consultant",
  manager: "Manager",
};
