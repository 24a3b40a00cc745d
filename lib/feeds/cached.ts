import "server-only";
import { cachedPublic, classTag, reactionTag } from "@/lib/public-cache";
import { listFeedVersions } from "./queries";

/** A feed's versions, cached under the reaction's or the class's tag, which publication and retraction invalidate. */
export const listFeedVersionsCached = cachedPublic(listFeedVersions, "feed-versions", (where) => [
  "reactionId" in where ? reactionTag(where.reactionId) : classTag(where.classId),
]);
