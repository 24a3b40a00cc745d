import "server-only";
import { forbidden, redirect } from "next/navigation";
import { can, permissions, type Permission } from "./permissions";
import { getCurrentUser } from "./session";

/** The parts of the site a role may not open, with the permission each needs (for the 403 page). */
export const restrictedAreas: readonly { area: string; path: string; permission: Permission }[] = [
  { area: "Reviewing submissions", path: "/review", permission: "dataset.review" },
  { area: "People, mail and jobs", path: "/admin", permission: "user.manage" },
];

/** The roles a permission is given to, in words: "curator or admin". */
export function rolesAllowedText(permission: Permission): string {
  const roles = permissions[permission] as readonly string[];
  return roles.length === 1 ? roles[0] : `${roles.slice(0, -1).join(", ")} or ${roles[roles.length - 1]}`;
}

/**
 * For pages: sends signed-out visitors to sign in and answers 403 ("You do not have access",
 * app/forbidden.tsx) to roles without the permission (the page's actions check again on their own).
 */
export async function requirePagePermission(permission: Permission, path: string) {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  if (!can(user.role, permission)) forbidden();
  return user;
}
