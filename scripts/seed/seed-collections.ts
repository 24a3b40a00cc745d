import "server-only";
import { createCollection, listMyCollections, publishCollection } from "@/lib/collections/queries";
import { listMyVersions } from "@/lib/datasets/queries";
import { getUserByEmail } from "@/lib/users/queries";

/** The demo's one published collection (invented, like every demo title and number). */
const COLLECTION_TITLE = "Invented demo: rate data behind a small methane oxidation mechanism";

/**
 * One published collection over the newest published versions of three of a demo researcher's
 * datasets, each with a note. Once: a second run finds it and adds nothing.
 */
export async function seedDemoCollection(): Promise<boolean> {
  const owner = await getUserByEmail({ email: "tanaka@demo.arrhenia.invalid" });
  if (!owner) throw new Error("demo people are missing; seed the people first");
  if ((await listMyCollections({ ownerId: owner.id })).some((c) => c.title === COLLECTION_TITLE)) return false;
  const published = (await listMyVersions({ userId: owner.id })).filter((v) => v.state === "published");
  if (published.length === 0) return false;
  const notes = ["used for R1", "used for R4", "checked against R7"];
  const { id } = await createCollection({
    ownerId: owner.id,
    title: COLLECTION_TITLE,
    description: "The published versions an invented mechanism takes its rate expressions from, collected for citation in one line.",
    members: published.slice(0, 3).map((v, i) => ({ versionId: v.id, note: notes[i] })),
  });
  await publishCollection({ collectionId: id, actorId: owner.id });
  return true;
}
