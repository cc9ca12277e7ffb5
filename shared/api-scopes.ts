// What an API key may do. A key carries a list of scopes; a signed-in person (and a key made
// before scopes existed, which acts with a role) has the scopes of their role.
import { z } from "zod";
import type { Role } from "./roles";

export const API_SCOPES = [
  "feasibility:run",
  "circuits:read",
  "circuits:write",
  "profiles:write",
  "devices:read",
  "devices:write",
  "studies:read",
  "studies:write",
  "reviews:write",
  "portfolio:read",
  "webhooks:manage",
] as const;
export type ApiScope = (typeof API_SCOPES)[number];

export const API_SCOPE_LABELS: Record<ApiScope, string> = {
  "feasibility:run": "Run stateless feasibility, marker layout and notice checks",
  "circuits:read": "Read circuits, crossings, load profiles, details and lighting options",
  "circuits:write": "Create and change circuits, crossings, span details and lighting options",
  "profiles:write": "Upload, append and delete load profiles",
  "devices:read": "Read device profiles",
  "devices:write": "Create and change device profiles",
  "studies:read": "Read studies and try what-ifs",
  "studies:write": "Run and save studies",
  "reviews:write": "Move reviews (as the key's role)",
  "portfolio:read": "Read the portfolio",
  "webhooks:manage": "Register and remove webhooks",
};

const READS: ApiScope[] = ["feasibility:run", "circuits:read", "devices:read", "studies:read", "portfolio:read"];

/**
 * The scopes of each role: what the role's pages allow. Where a scope covers pages of several
 * roles (circuits:write: the engineer's circuits and the consultant's span details), the route
 * also names the roles, so a role never gets more through the API than on its pages.
 */
export const ROLE_SCOPES: Record<Role, readonly ApiScope[]> = {
  admin: API_SCOPES,
  engineer: API_SCOPES.filter((s) => s !== "webhooks:manage"),
  consultant: [...READS, "circuits:write", "reviews:write"],
  manager: [...READS, "reviews:write"],
};

/** Form/JSON field: one or more known scopes, without repeats. */
export const apiScopesField = z
  .array(z.enum(API_SCOPES, { error: `A scope is one of: ${API_SCOPES.join(", ")}.` }))
  .min(1, "Choose at least one scope.")
  .transform((list) => API_SCOPES.filter((s) => list.includes(s)));

/** A stored scope list (JSON text), tolerating scopes removed since: unknown ones are dropped. */
export function parseStoredScopes(text: string | null): ApiScope[] | null {
  if (text === null) return null;
  try {
    const list = JSON.parse(text);
    return Array.isArray(list) ? API_SCOPES.filter((s) => list.includes(s)) : [];
  } catch {
    return [];
  }
}
