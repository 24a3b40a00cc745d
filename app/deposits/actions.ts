"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getCurrentUser } from "@/lib/auth/session";
import { assertAllowed } from "@/lib/auth/guard";
import type { Transition } from "@/lib/curation/lifecycle";
import { depositNewDataset, startNextVersion, transitionVersion, updateDraft } from "@/lib/datasets/deposits";
import { inviteCoEditor } from "@/lib/datasets/invitations";
import { parseDepositJson } from "@/lib/deposits";
import { AppError, type FieldError } from "@/lib/errors";

/** Result of an editor action: either the saved state or every problem with its JSON pointer. */
export type EditorResult =
  | { ok: true; versionId: number; lockVersion: number; state: string }
  | { ok: false; status: number; message: string; errors: FieldError[] };

function failure(err: unknown): EditorResult {
  if (err instanceof AppError) return { ok: false, status: err.status, message: err.message, errors: err.errors };
  if (err instanceof z.ZodError) return { ok: false, status: 422, message: err.issues[0]?.message ?? "Invalid input", errors: [] };
  console.error("[deposits] action failed", err);
  return { ok: false, status: 500, message: "Something went wrong on our side; it has been logged. Nothing was stored.", errors: [] };
}

async function actorOrThrow() {
  const user = await getCurrentUser();
  return { ...assertAllowed(user, { permission: "dataset.deposit" }), user: user! };
}

/** Creates a draft dataset from the editor's document (JSON text). */
export async function createDraftAction(documentJson: string): Promise<EditorResult> {
  try {
    const { user } = await actorOrThrow();
    const parsed = parseDepositJson(documentJson);
    if (!parsed.ok) throw new AppError("validation_failed", parsed.errors[0].message, parsed.errors);
    const v = await depositNewDataset({ actor: user, document: parsed.value });
    revalidatePath("/deposits");
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state };
  } catch (err) {
    return failure(err);
  }
}

/** Saves the editor's document over a draft, if nobody saved since `lockVersion`. */
export async function saveDraftAction(versionId: number, lockVersion: number, documentJson: string): Promise<EditorResult> {
  try {
    const { user } = await actorOrThrow();
    z.number().int().positive().parse(versionId);
    const parsed = parseDepositJson(documentJson);
    if (!parsed.ok) throw new AppError("validation_failed", parsed.errors[0].message, parsed.errors);
    const v = await updateDraft({ actor: user, versionId, expectedLockVersion: lockVersion, document: parsed.value });
    revalidatePath(`/deposits/${versionId}`);
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state };
  } catch (err) {
    return failure(err);
  }
}

const transitionSchema = z.enum(["submit", "withdraw", "start_review", "request_changes", "accept", "decline", "retract"]);

/** Moves a version along its lifecycle; role and membership are checked in the transaction. */
export async function transitionAction(versionId: number, transition: Transition, reason?: string): Promise<EditorResult> {
  try {
    const { user } = await actorOrThrow();
    const t = transitionSchema.parse(transition);
    const out = await transitionVersion({ actor: user, versionId, transition: t, reason });
    revalidatePath(`/deposits/${versionId}`);
    revalidatePath("/review");
    return { ok: true, versionId, lockVersion: 0, state: out.to };
  } catch (err) {
    return failure(err);
  }
}

const inviteSchema = z.object({ email: z.string().trim().toLowerCase().email("Enter an e-mail address"), role: z.enum(["editor", "viewer"]) });

/** The owner invites a co-editor by e-mail (the link is valid for 7 days). */
export async function inviteAction(versionId: number, email: string, role: "editor" | "viewer"): Promise<{ ok: boolean; message: string }> {
  try {
    const { user } = await actorOrThrow();
    const input = inviteSchema.parse({ email, role });
    await inviteCoEditor({ actor: user, versionId, ...input });
    return { ok: true, message: `Invitation sent to ${input.email}.` };
  } catch (err) {
    const r = failure(err);
    return { ok: false, message: r.ok ? "" : r.message };
  }
}

/** The owner starts the next version (a draft copy of the published one). */
export async function startNextVersionAction(versionId: number): Promise<EditorResult> {
  try {
    const { user } = await actorOrThrow();
    const v = await startNextVersion({ actor: user, versionId });
    revalidatePath("/deposits");
    return { ok: true, versionId: v.id, lockVersion: v.lockVersion, state: v.state };
  } catch (err) {
    return failure(err);
  }
}
