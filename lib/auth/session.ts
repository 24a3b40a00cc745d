import "server-only";
import { getServerSession } from "next-auth";
import { getUserById, type UserDto } from "@/lib/users/queries";
import { authOptions } from "./options";

/**
 * The signed-in person, re-read from the database: a deactivated account or a changed role takes
 * effect at once rather than when the JWT expires.
 */
export async function getCurrentUser(): Promise<UserDto | null> {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (!id) return null;
  const user = await getUserById({ id });
  if (!user || user.deactivatedAt) return null;
  return user;
}
