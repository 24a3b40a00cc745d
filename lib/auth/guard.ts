import type { Role } from "@/db/users";
import { AppError } from "@/lib/errors";
import { can, type Permission } from "./permissions";

export interface Actor {
  id: number;
  role: Role;
}

export interface GuardRule {
  permission?: Permission;
  /** When set, the actor must own the record (or hold `overridePermission`). */
  ownerId?: number | null;
  overridePermission?: Permission;
}

/**
 * The decision every entry point makes, in order: signed in → role allows the action → owns the
 * record. Throws 401 / 403 AppErrors; returns the actor when allowed.
 */
export function assertAllowed(actor: Actor | null, rule: GuardRule): Actor {
  if (!actor) throw new AppError("unauthenticated", "Sign in to do this");
  if (rule.permission && !can(actor.role, rule.permission)) {
    throw new AppError("forbidden", "Your role does not allow this");
  }
  if (rule.ownerId !== undefined && rule.ownerId !== actor.id) {
    if (!(rule.overridePermission && can(actor.role, rule.overridePermission))) {
      throw new AppError("forbidden", "Only the owner may do this");
    }
  }
  return actor;
}
