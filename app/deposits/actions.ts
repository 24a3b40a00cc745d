"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { decisionText } from "@/lib/curation/transition-request";
import { protectedCall } from "@/lib/auth/action";
import { REPLY_MAX } from "@/lib/curation/capabilities";
import type { Transition } from "@/lib/curation/lifecycle";
import { depositNewDraft, getVersionForOrThrow, startNextVersion, transitionVersion, updateDraftFromEditor } from "@/lib/datasets/deposits";
import { STALE_SAVE_MESSAGE } from "@/lib/datasets/queries";
import { inviteCoEditor, revokeInvitation } from "@/lib/datasets/invitations";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { AppError, type FieldError } from "@/lib/errors";
import { idFor, MAX_ID } from "@/lib/ids";

/** The draft as a co-editor saved it, returned with a save that lost the lock so the editor can offer a merge. */
export interface LatestDraft {
  lockVersion: number;
  document: Record<string, unknown>;
  problems: FieldError[];
}

/**
 * Result of an editor action: either the saved state (with what still keeps the draft from being
 * submitted: `problems`, empty when it is ready) or every problem with its JSON pointer.
 */
export type EditorResult =
  | { ok: true; versionId: number; lockVersion: number; state: string; problems?: FieldError[] }
  | { ok: false; status: number; message: string; errors: FieldError[]; latest?: LatestDraft };

function failure(err: unknown): EditorResult {
  if (err instanceof AppError) return { ok: false, status: err.status, message: err.message, errors: err.errors };
  // Next's redirect()/notFound() work by throwing: let them through.
  if (err && typeof err === "object" && "digest" in err) throw err;
  console.error("[deposits] action failed", err);
  return { ok: false, status: 500, message: "Something went wrong on our side; it has been logged. Nothing was stored.", errors: [] };
}

const versionIdSchema = idFor("dataset version");
// The editor sends the document as a Blob: React decodes a string argument only up to 1 000 000
// characters, while a Blob travels as a file part of the multipart body, outside that limit (and
// outside the front server's nesting scan, lib/auth/action-body-guard.ts). Text is still accepted.
const documentJson = z.union([z.string().max(MAX_DOCUMENT_BYTES, "The document is larger than 25 MB"), z.instanceof(Blob)]);

/** The document's text; a Blob over MAX_DOCUMENT_BYTES is refused (413) before it is read. */
async function documentText(doc: string | Blob): Promise<string> {
  if (typeof doc === "string") return doc;
  if (doc.size > MAX_DOCUMENT_BYTES)
    throw new AppError("payload_too_large", `The document is ${(doc.size / 1024 / 1024).toFixed(1)} MB; the limit is 25 MB.`);
  return doc.text();
}
const lockVersion = z.number().int().min(0).max(MAX_ID);
const transitionSchema = z.enum(["submit", "withdraw", "start_review", "return", "accept", "decline", "retract"]);
// The same bound as the transitions endpoint; the minimum is the lifecycle's (a reason is needed only for decisions).
const reasonSchema = decisionText(z.string().max(5000, "Keep the reason under 5000 characters")).optional();
// A hard cap on what is read; the rule and its wording are checkReplyOrThrow's (lib/curation/capabilities.ts).
const replySchema = decisionText(z.string().max(2 * REPLY_MAX, `Keep the reply under ${REPLY_MAX} characters`)).optional();

const createDraft = protectedCall(z.object({ documentJson }).strict(), { permission: "dataset.deposit" }, async (input, user) => {
  // The text goes to an analysis worker, which parses and validates it off the request thread.
  // No revalidatePath here: it would re-render the page in the action's response, and once the
  // editor has moved its address to the new draft that page is another route, whose editor would
  // replace this one and drop whatever was typed since the save began.
  return depositNewDraft({ actor: user, text: await documentText(input.documentJson) });
});

const saveDraft = protectedCall(
  z.object({ versionId: versionIdSchema, lockVersion, documentJson }).strict(),
  { permission: "dataset.deposit" },
  async (input, user) => {
    try {
      const v = await updateDraftFromEditor({
        actor: user,
        versionId: input.versionId,
        expectedLockVersion: input.lockVersion,
        text: await documentText(input.documentJson),
      });
      // The editor refreshes its page itself (see createDraft on why not revalidatePath).
      return { saved: v };
    } catch (err) {
      if (!(err instanceof AppError) || err.message !== STALE_SAVE_MESSAGE) throw err;
      // Someone saved first: their draft comes back with the refusal, for the merge.
      const { version } = await getVersionForOrThrow({ versionId: input.versionId, actor: user, action: "edit" });
      const latest: LatestDraft = {
        lockVersion: version.lockVersion,
        document: version.draftDocument ?? version.payload,
        problems: version.draftProblems ?? [],
      };
      return { conflict: { error: err, latest } };
    }
  },
);

const transitionRun = protectedCall(
  z.object({ versionId: versionIdSchema, transition: transitionSchema, reason: reasonSchema, reply: replySchema }).strict(),
  { permission: "dataset.deposit" },
  async (input, user) => {
    // Role, dataset role and state are re-read inside the transaction (lib/curation/transitions.ts).
    const out = await transitionVersion({
      actor: user,
      versionId: input.versionId,
      transition: input.transition,
      reason: input.reason,
      reply: input.reply,
    });
    revalidatePath(`/deposits/${input.versionId}`);
    revalidatePath("/review");
    return out;
  },
);

const invite = protectedCall(
  z
    .object({
      versionId: versionIdSchema,
      email: z.string().trim().toLowerCase().max(320).email("Enter an e-mail address"),
      role: z.enum(["editor", "viewer"]),
    })
    .strict(),
  { permission: "dataset.deposit" },
  async (input, user) => {
    await inviteCoEditor({ actor: user, versionId: input.versionId, email: input.email, role: input.role });
    // The owner's list of pending invitations on this page shows the new one.
    revalidatePath(`/deposits/${input.versionId}`);
    return input.email;
  },
);

const startNext = protectedCall(
  z.object({ versionId: versionIdSchema }).strict(),
  { permission: "dataset.deposit" },
  async (input, user) => {
    const v = await startNextVersion({ actor: user, versionId: input.versionId });
    revalidatePath("/deposits");
    return v;
  },
);

/** Creates a draft dataset from the editor's document (JSON text, or a Blob holding it). */
export async function createDraftAction(documentJson: string | Blob): Promise<EditorResult> {
  try {
    const v = await createDraft({ documentJson });
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state, problems: v.draftProblems ?? [] };
  } catch (err) {
    return failure(err);
  }
}

/** Saves the editor's document over a draft, if nobody saved since `lockVersion`. */
export async function saveDraftAction(versionId: number, lockVersion: number, documentJson: string | Blob): Promise<EditorResult> {
  try {
    const out = await saveDraft({ versionId, lockVersion, documentJson });
    if (out.conflict) return { ...(failure(out.conflict.error) as Extract<EditorResult, { ok: false }>), latest: out.conflict.latest };
    const v = out.saved!;
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state, problems: v.draftProblems ?? [] };
  } catch (err) {
    return failure(err);
  }
}

/** Moves a version along its lifecycle. */
export async function transitionAction(versionId: number, transition: Transition, reason?: string, reply?: string): Promise<EditorResult> {
  try {
    const out = await transitionRun({ versionId, transition, reason, reply });
    return { ok: true, versionId: out.versionId, lockVersion: 0, state: out.to };
  } catch (err) {
    return failure(err);
  }
}

/** The owner invites a co-editor by e-mail (the link is valid for 7 days). */
export async function inviteAction(
  versionId: number,
  email: string,
  role: "editor" | "viewer",
): Promise<{ ok: boolean; status: number; message: string }> {
  try {
    const address = await invite({ versionId, email, role });
    return { ok: true, status: 200, message: `Invitation sent to ${address}.` };
  } catch (err) {
    const r = failure(err);
    return { ok: false, status: r.ok ? 500 : r.status, message: r.ok ? "" : r.message };
  }
}

const revoke = protectedCall(
  z.object({ invitationId: idFor("invitation") }).strict(),
  { permission: "dataset.deposit" },
  async (input, user) => {
    await revokeInvitation({ actor: user, invitationId: input.invitationId });
  },
);

/** The owner revokes an invitation that was not accepted yet. */
export async function revokeInvitationAction(invitationId: number): Promise<{ ok: boolean; status: number; message: string }> {
  try {
    await revoke({ invitationId });
    return { ok: true, status: 200, message: "Invitation revoked: its link no longer works." };
  } catch (err) {
    const r = failure(err);
    return { ok: false, status: r.ok ? 500 : r.status, message: r.ok ? "" : r.message };
  }
}

/** The owner starts the next version (a draft copy of the published one). */
export async function startNextVersionAction(versionId: number): Promise<EditorResult> {
  try {
    const v = await startNext({ versionId });
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state };
  } catch (err) {
    return failure(err);
  }
}
