import "server-only";
import { applyTransition } from "@/lib/curation/transitions";
import { startNextVersion, updateDraft } from "@/lib/datasets/deposits";
import { listMyVersions } from "@/lib/datasets/queries";
import { getUserByEmail } from "@/lib/users/queries";

/** The demo dataset that gets a second published version (invented, like every demo number). */
const REVISED_TITLE = "hydroxyl + methane → water + methyl: measured rate constants, 220–420 K";

/**
 * Gives one published demo dataset a second published version, so its first version shows that
 * a newer one exists: the same numbers with each point's pressure stated and a note on the first.
 * Once: a dataset whose newest version is already past version 1 is left alone.
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
  // The numbers stay; version 2 states each point's pressure and how the first point was read, so the fit is unchanged.
  const doc = structuredClone(draft.payload) as {
    description: string;
    conditions?: { pressure?: { value?: number } };
    points: { pressure?: number; note?: string }[];
  };
  const pressure = doc.conditions?.pressure?.value ?? 100;
  for (const p of doc.points) p.pressure = pressure;
  doc.points[0].note = "Read again from the laboratory notebook for version 2.";
  doc.description += "\n\nVersion 2 states the pressure of each point, as the curator asked, and how the first point was read.";
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
