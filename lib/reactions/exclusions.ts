import "server-only";
import { getVersionForOrThrow } from "@/lib/datasets/deposits";
import type { UserDto } from "@/lib/users/queries";
import { deleteConsensusExclusion, saveConsensusExclusion } from "./queries";

/**
 * A curator leaves a published version out of its reaction's consensus (or changes the reason).
 * Who may: versionCapabilities' `exclude_from_consensus` (404 / 403 / 409 otherwise).
 */
export async function excludeFromConsensus({ actor, versionId, reason }: { actor: UserDto; versionId: number; reason: string }) {
  await getVersionForOrThrow({ versionId, actor, action: "exclude_from_consensus" });
  return saveConsensusExclusion({ versionId, actorId: actor.id, reason });
}

/** A curator takes a version back into its reaction's consensus. */
export async function includeInConsensus({ actor, versionId }: { actor: UserDto; versionId: number }) {
  await getVersionForOrThrow({ versionId, actor, action: "exclude_from_consensus" });
  return deleteConsensusExclusion({ versionId, actorId: actor.id });
}
