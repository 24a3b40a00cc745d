"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { protectedAction } from "@/lib/auth/action";
import {
  addCollectionMembers,
  createCollection,
  publishCollection,
  removeCollectionMember,
  setCollectionMemberNote,
  startCollectionRevision,
  updateCollectionDraft,
} from "@/lib/collections/queries";
import {
  addToCollectionFormSchema,
  collectionFormSchema,
  collectionMemberFormSchema,
  collectionMemberNoteFormSchema,
  editCollectionFormSchema,
  newCollectionFormSchema,
} from "@/lib/collections/schemas";
import { collectionPath } from "@/lib/identifiers/paths";

/** A new collection from a form (the "My collections" page, or the reviewed list of a mechanism check): opens its page. */
export const createCollectionAction = protectedAction(newCollectionFormSchema, { permission: "collection.manage" }, async (input, user) => {
  const { id } = await createCollection({
    ownerId: user.id,
    title: input.title,
    description: input.description,
    members: input.versionIds.map((versionId) => ({ versionId })),
  });
  revalidatePath("/collections");
  redirect(collectionPath(id));
});

/** Adds versions to one of the person's draft collections, from a dataset, reaction or search page. */
export const addToCollectionAction = protectedAction(
  addToCollectionFormSchema,
  { permission: "collection.manage" },
  async (input, user) => {
    // A blank note box means no note was typed: a version already in the collection keeps the note it has.
    const { memberCount, added } = await addCollectionMembers({
      collectionId: input.collectionId,
      actorId: user.id,
      members: input.versionIds.map((versionId) => ({ versionId, ...(input.note ? { note: input.note } : {}) })),
    });
    revalidatePath(collectionPath(input.collectionId));
    const already = input.versionIds.length - added;
    const versions = (n: number) => `${n} ${n === 1 ? "version" : "versions"}`;
    const alreadyWords =
      already === 0
        ? ""
        : ` ${already === input.versionIds.length ? (already === 1 ? "It was" : "They were") : `${versions(already)} ${already === 1 ? "was" : "were"}`} already in it${input.note ? " (note replaced)" : " (note kept)"}.`;
    return {
      status: "ok",
      message: `${added ? `Added ${versions(added)}.` : "Nothing new added."}${alreadyWords} The collection now holds ${versions(memberCount)}.`,
    };
  },
);

export const editCollectionAction = protectedAction(editCollectionFormSchema, { permission: "collection.manage" }, async (input, user) => {
  await updateCollectionDraft({ collectionId: input.collectionId, actorId: user.id, title: input.title, description: input.description });
  revalidatePath(collectionPath(input.collectionId));
  return { status: "ok", message: "Saved." };
});

export const memberNoteAction = protectedAction(
  collectionMemberNoteFormSchema,
  { permission: "collection.manage" },
  async (input, user) => {
    await setCollectionMemberNote({ collectionId: input.collectionId, actorId: user.id, versionId: input.versionId, note: input.note });
    revalidatePath(collectionPath(input.collectionId));
    return { status: "ok", message: input.note ? "Note saved." : "Note removed." };
  },
);

export const removeMemberAction = protectedAction(collectionMemberFormSchema, { permission: "collection.manage" }, async (input, user) => {
  await removeCollectionMember({ collectionId: input.collectionId, actorId: user.id, versionId: input.versionId });
  revalidatePath(collectionPath(input.collectionId));
  return { status: "ok", message: "Removed." };
});

export const publishCollectionAction = protectedAction(collectionFormSchema, { permission: "collection.manage" }, async (input, user) => {
  const { versionIdentifier } = await publishCollection({ collectionId: input.collectionId, actorId: user.id });
  revalidatePath(collectionPath(input.collectionId));
  revalidatePath("/collections");
  return { status: "ok", message: `Published as ${versionIdentifier}.` };
});

export const reviseCollectionAction = protectedAction(collectionFormSchema, { permission: "collection.manage" }, async (input, user) => {
  const { leftOut } = await startCollectionRevision({ collectionId: input.collectionId, actorId: user.id });
  revalidatePath(collectionPath(input.collectionId));
  return {
    status: "ok",
    message: leftOut.length
      ? `A new draft; left out as retracted: ${leftOut.map((l) => `version ${l.versionId}`).join(", ")}.`
      : "A new draft, copied from the published version.",
  };
});
