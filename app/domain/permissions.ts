import type { ApiTokenScope, Role } from "./vocabulary";

/**
 * What each role may do, as typed strings. Checked on the server for every loader and action
 * (permissions.server.ts) and mirrored here so the navigation shows each role only what it may use.
 */
export type Permission =
  | "programme:read"
  | "programme:manage"
  | "case:read"
  | "case:create"
  | "case:edit"
  | "step:check"
  | "report:read"
  | "report:release"
  | "audit:read"
  | "org:admin";

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  engineer: ["programme:read", "case:read", "case:create", "case:edit", "report:read"],
  checker: ["programme:read", "case:read", "step:check", "report:read"],
  quality: ["programme:read", "case:read", "report:read", "report:release", "audit:read"],
  admin: ["programme:read", "programme:manage", "case:read", "audit:read", "org:admin"],
};

/** Permissions that change records: an API token needs the read-write scope for them. */
const WRITE_PERMISSIONS: readonly Permission[] = ["programme:manage", "case:create", "case:edit", "step:check", "report:release", "org:admin"];

/** The token scope a permission needs: reading, or also changing records. */
export function scopeFor(permission: Permission): ApiTokenScope {
  return WRITE_PERMISSIONS.includes(permission) ? "read-write" : "read";
}

export const API_TOKEN_SCOPE_LABELS: Record<ApiTokenScope, string> = {
  read: "Read only: list, read and export cases, results and reports; analyse case files",
  "read-write": "Read and write: also import cases",
};

export const ROLE_LABELS: Record<Role, string> = {
  engineer: "Loads engineer",
  checker: "Checker",
  quality: "Quality",
  admin: "Administrator",
};

export function hasPermission(roles: readonly Role[], permission: Permission): boolean {
  return roles.some((role) => ROLE_PERMISSIONS[role].includes(permission));
}

/** The page each person lands on after sign-in, by the first of their roles in this order. */
export function landingPath(roles: readonly Role[]): string {
  if (roles.includes("engineer")) return "/cases";
  if (roles.includes("checker")) return "/checks";
  if (roles.includes("quality")) return "/reports";
  if (roles.includes("admin")) return "/admin";
  return "/account";
}
