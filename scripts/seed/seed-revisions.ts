import "server-only";
import { applyTransition } from "@/lib/curation/transitions";
import { startNextVersion, updateDraft } from "@/lib/datasets/deposits";
import { listMyVersions } from "@/lib/datasets/queries";
import { getUserByEmail } from "@/lib/users/queries";

/** The demo dataset that gets a second published version (invented, like every demo number). */
const REVISED_TITLE = "hydroxyl + methane → water + methyl: measured rate constants, 220–420 K";

/**
 * Gives one published demo dataset a second published version, so its first version shows that
 * a newer one exists: the highest-temperature rate constant corrected (a transcription slip in
 * version 1). Once: a dataset whose newest version is already past version 1 is left alone.
 */
export async function seedDemoRevision(): Promise<boolean> {
  const [owner, curator] = await Promise.all([
    getUserByEmail({ email: "tanaka@demo.arrhenia.invalid" }),
    getUserByEmail({ email: "curator.mensah@demo.arrhenia.invalid" }),
  ]);
  if (!owner || !curator) throw new Error("demo people are missing; seed the people first");
  const newest = (await listMyVersions({ userId: owner.id })).find((v) => v.title === REVISED_TITLE);
  if (!newest || newest.number !== 1 || newest.state !== "published") return false;
  const draft = await startNextVersion({ actor: owner, versionId: newest.id });
  const doc = structuredClone(draft.payload) as { description: string; points: { k: number }[] };
  const last = doc.points[doc.points.length - 1];
  last.k = Number((last.k * 1.12).toPrecision(3));
  doc.description += "\n\nVersion 2 corrects the rate constant at the highest temperature, mistyped in version 1.";
  await updateDraft({ actor: owner, versionId: draft.id, expectedLockVersion: draft.lockVersion, document: doc });
  for (const [transition, actor, reason] of [
    ["submit", owner, undefined],
    ["start_review", curator, undefined],
    ["accept", curator, "The correction is documented; fits and checks are consistent."],
  ] as const) {
    await applyTransition({ versionId: draft.id, actorId: actor.id, transition, reason });
  }
  return true;
}
