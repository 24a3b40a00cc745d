import { z } from "zod";
import { citationQuerySchema } from "@/lib/citation/request";
import { versionParametersQuerySchema } from "@/lib/exports/requests";
import { idFor, parseIdOrNull } from "@/lib/ids";
import { describeCharacter, forbiddenCharacter } from "@/lib/text/clean";

/** Limits of a collection's text and size. */
export const COLLECTION_LIMITS = { title: 300, description: 5000, note: 500, members: 2000, membersPerRequest: 500 } as const;

/** No character every export could not carry as written (lib/text/clean.ts), named with its place. */
const cleanText = (what: string, lines: boolean) => (v: string, ctx: z.RefinementCtx) => {
  const bad = forbiddenCharacter(v, { lines });
  if (bad)
    ctx.addIssue({ code: "custom", message: `${what} holds ${describeCharacter(bad.character)} at character ${bad.index + 1}; remove it` });
};
const title = z
  .string("the title must be text")
  .trim()
  .min(3, "the title needs at least 3 characters")
  .max(COLLECTION_LIMITS.title, `the title is at most ${COLLECTION_LIMITS.title} characters`)
  .superRefine(cleanText("the title", false))
  .refine((v) => v.length < 3 || /[\p{L}\p{N}]/u.test(v), "the title needs at least one letter or digit");
const description = z
  .string("the description must be text")
  .trim()
  .max(COLLECTION_LIMITS.description, `the description is at most ${COLLECTION_LIMITS.description} characters`)
  .superRefine(cleanText("the description", true));
const note = z
  .string("the note must be text")
  .trim()
  .max(COLLECTION_LIMITS.note, `a note is at most ${COLLECTION_LIMITS.note} characters`)
  .superRefine(cleanText("the note", false))
  .transform((v) => v || null);

/** One member to add: a dataset version by its id (GET /api/v1/versions/:id), with an optional note ("used for R12"). */
export const memberInputSchema = z.strictObject({ versionId: idFor("version"), note: note.optional() });
export type MemberInput = z.infer<typeof memberInputSchema>;

const members = z
  .array(memberInputSchema, "members must be a list of {versionId, note?}")
  .max(COLLECTION_LIMITS.membersPerRequest, `at most ${COLLECTION_LIMITS.membersPerRequest} members a request`);

/** POST /api/v1/collections: a new collection, a draft of its first version. */
export const createCollectionSchema = z.strictObject({ title, description: description.default(""), members: members.default([]) });

/** PATCH /api/v1/collections/:id: the draft's title and description. */
export const patchCollectionSchema = z
  .strictObject({ title: title.optional(), description: description.optional() })
  .refine((v) => v.title !== undefined || v.description !== undefined, { message: "give a title, a description or both" });

/** POST /api/v1/collections/:id/members. */
export const addMembersSchema = z.strictObject({ members: members.min(1, "give at least one member") });

/** Version ids as a form carries them: one field, separated by commas or spaces ("12, 15 31"). */
const versionIdsField = z
  .string()
  .max(20_000)
  .transform((text, ctx) => {
    const ids: number[] = [];
    for (const part of text.split(/[\s,]+/).filter(Boolean)) {
      const id = parseIdOrNull(part);
      if (id === null) {
        ctx.addIssue({ code: "custom", message: `“${part.slice(0, 40)}” is not a version id` });
        return z.NEVER;
      }
      if (!ids.includes(id)) ids.push(id);
    }
    return ids;
  });

/** The owner's forms post the same shapes as strings (FormData). */
export const newCollectionFormSchema = z.object({ title, description: description.default(""), versionIds: versionIdsField.default([]) });
export const addToCollectionFormSchema = z.object({
  collectionId: idFor("collection"),
  versionIds: versionIdsField.refine((ids) => ids.length > 0, "choose at least one version"),
  note: note.optional(),
});
export const editCollectionFormSchema = z.object({ collectionId: idFor("collection"), title, description: description.default("") });
export const collectionMemberFormSchema = z.object({ collectionId: idFor("collection"), versionId: idFor("version") });
export const collectionMemberNoteFormSchema = collectionMemberFormSchema.extend({ note: note.default("") });
export const collectionFormSchema = z.object({ collectionId: idFor("collection") });

/** GET /api/v1/collections/:id/versions/:n/citation: the format, the style of `text`, and `members=1` for every member's citation after the collection's. */
export const collectionCitationQuerySchema = citationQuerySchema
  .omit({ version: true })
  .extend({
    members: z
      .enum(["1", "0", "true", "false"], { error: "members must be 1 or 0 (true or false)" })
      .transform((v) => v === "1" || v === "true")
      .default(false),
  })
  .strict();

/** GET /api/v1/collections/:id/versions/:n/parameters: every member's preferred fit, A in cm–mol units, Ea in `energy`. */
export const collectionParametersQuerySchema = versionParametersQuerySchema.omit({ k: true, fit: true }).strict();

/** GET /api/v1/collections: the page of published collections. */
export const collectionListQuerySchema = z
  .object({
    limit: z.coerce.number("limit must be a number").int().min(1, "limit is at least 1").max(100, "limit is at most 100").default(50),
    offset: z.coerce.number("offset must be a number").int().min(0, "offset is at least 0").max(1_000_000).default(0),
  })
  .strict();
