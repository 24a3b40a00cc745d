import type { Role } from "@/db/users";

/**
 * The one permission table: every action a person can take → the site-wide roles allowed it.
 * The UI hides what this denies; route handlers and server actions enforce it.
 */
export const permissions = {
  "account.update": ["researcher", "curator", "admin"],
  "token.manage": ["researcher", "curator", "admin"],
  "watch.manage": ["researcher", "curator", "admin"],
  "dataset.deposit": ["researcher", "curator", "admin"],
  "dataset.review": ["curator", "admin"],
  "mechanism.check": ["researcher", "curator", "admin"],
  "collection.manage": ["researcher", "curator", "admin"],
  "user.list": ["admin"],
  "user.manage": ["admin"],
  "mail.read": ["admin"],
  "job.read": ["admin"],
  "job.manage": ["admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof permissions;

export const roles: readonly Role[] = ["researcher", "curator", "admin"];

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  return (permissions[permission] as readonly Role[]).includes(role);
}

/** Permissions whose holders are re-read from the database before a mutation (a JWT role may be stale). */
export function isPrivileged(permission: Permission): boolean {
  return !(permissions[permission] as readonly Role[]).includes("researcher");
}
