import "server-only";
import { getServerSession } from "next-auth";
import { headers } from "next/headers";
import { mayCarrySession } from "./session-cookie";
import { getUserForSession, type UserDto } from "@/lib/users/queries";

/**
 * The signed-in person, re-read from the database: a deactivated account, a changed role or an
 * ended session (sign-out, new password, demotion bump the session generation) takes effect at
 * once rather than when the JWT expires.
 */
export async function getCurrentUser(): Promise<UserDto | null> {
  // No session cookie, nobody signed in: next-auth is not asked (most public page views).
  if (!mayCarrySession((await headers()).get("cookie"))) return null;
  // Loaded at the first session: the front server (lib/http/front-routes.ts) imports this module
  // through withApi but answers only endpoints that never ask who calls, and never loads the providers.
  const { authOptions } = await import("./options");
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (!id) return null;
  const found = await getUserForSession({ id });
  if (!found || found.deactivatedAt || found.sessionGeneration !== session.user.sessionGeneration) return null;
  const user: UserDto & { sessionGeneration?: number } = { ...found };
  delete user.sessionGeneration;
  return user;
}
