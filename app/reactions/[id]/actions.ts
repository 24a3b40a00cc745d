"use server";

import { revalidatePath } from "next/cache";
import { protectedAction } from "@/lib/auth/action";
import { invalidatePublicCache } from "@/lib/public-cache";
import { excludeFromConsensus, includeInConsensus } from "@/lib/reactions/exclusions";
import { excludeFromConsensusSchema, includeInConsensusSchema } from "@/lib/reactions/schemas";

// The permission table admits curators and admins; versionCapabilities then decides for the one
// version (published, and not co-edited by the curator).

export const excludeFromConsensusAction = protectedAction(
  excludeFromConsensusSchema,
  { permission: "dataset.review" },
  async ({ versionId, reason }, user) => {
    const { invalidation, changed } = await excludeFromConsensus({ actor: user, versionId, reason });
    if (invalidation) await invalidatePublicCache(invalidation.tags, { owed: invalidation.owed });
    revalidatePath("/reactions/[id]", "page");
    return { status: "ok", message: changed ? "Reason changed." : "Left out of the consensus." };
  },
);

export const includeInConsensusAction = protectedAction(
  includeInConsensusSchema,
  { permission: "dataset.review" },
  async ({ versionId }, user) => {
    const { invalidation } = await includeInConsensus({ actor: user, versionId });
    if (invalidation) await invalidatePublicCache(invalidation.tags, { owed: invalidation.owed });
    revalidatePath("/reactions/[id]", "page");
    return { status: "ok", message: "Included in the consensus again." };
  },
);
