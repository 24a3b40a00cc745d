import "server-only";
import { secretsEqual } from "@/lib/auth/secrets";
import { AppError } from "@/lib/errors";
import type { UserDto } from "@/lib/users/queries";
import { getMechanismCheck } from "./queries";

/**
 * A check its reader may open: the owner, or anyone holding the share token the owner made.
 * Everyone else gets the same 404 as for a check that does not exist.
 */
export async function readableMechanismCheckOrThrow({ id, user, share }: { id: number; user: UserDto | null; share: string | null }) {
  const check = await getMechanismCheck({ id });
  const allowed =
    check && (check.ownerId === user?.id || (check.shareToken !== null && share !== null && secretsEqual(share, check.shareToken)));
  if (!check || !allowed) throw new AppError("not_found", "No such mechanism check");
  return check;
}
