import "server-only";
import { notFound, redirect } from "next/navigation";
import { can, type Permission } from "./permissions";
import { getCurrentUser } from "./session";

/**
 * For pages: sends signed-out visitors to sign in and answers 404 to roles without the
 * permission (the page's actions check again on their own).
 */
export async function requirePagePermission(permission: Permission, path: string) {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  if (!can(user.role, permission)) notFound();
  return user;
}
