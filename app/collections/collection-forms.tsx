"use client";

import Link from "next/link";
import { useActionState, useState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState, type ActionState } from "@/lib/auth/action-state";
import {
  addToCollectionAction,
  createCollectionAction,
  editCollectionAction,
  publishCollectionAction,
  memberNoteAction,
  removeMemberAction,
  reviseCollectionAction,
} from "./actions";

function FieldError({ state, name }: { state: ActionState; name: string }) {
  const message = state.fieldErrors?.[name];
  return message ? (
    <p id={`${name}-error`} className="text-sm text-error">
      {message}
    </p>
  ) : null;
}

/** A collection's title and description fields, showing what was typed when the action answers with an error. */
function TitleDescriptionFields({ state, title, description }: { state: ActionState; title: string; description: string }) {
  return (
    <>
      <div className="space-y-1">
        <label htmlFor="collection-title" className="font-medium">
          Title
        </label>
        <input
          id="collection-title"
          name="title"
          required
          maxLength={300}
          defaultValue={state.values?.title ?? title}
          className="field-input w-full"
          aria-describedby={state.fieldErrors?.title ? "title-error" : undefined}
        />
        <FieldError state={state} name="title" />
      </div>
      <div className="space-y-1">
        <label htmlFor="collection-description" className="font-medium">
          Description <span className="text-muted">(optional)</span>
        </label>
        <textarea
          id="collection-description"
          name="description"
          rows={3}
          maxLength={5000}
          defaultValue={state.values?.description ?? description}
          className="field-input w-full"
        />
      </div>
    </>
  );
}

/** One version a new collection may start with, as the review list shows it. */
export interface OfferedVersion {
  versionId: number;
  label: string;
  detail: string;
}

/**
 * A new collection: title, description, and (when versions are offered: a mechanism check's "use
 * these", or a page's choice) the list to review, every version ticked until its owner unticks it.
 */
export function NewCollectionForm({ offered = [], defaultTitle = "" }: { offered?: OfferedVersion[]; defaultTitle?: string }) {
  const [state, action] = useActionState(createCollectionAction, idleState);
  const [chosen, setChosen] = useState<Set<number>>(() => new Set(offered.map((o) => o.versionId)));
  const toggle = (id: number) =>
    setChosen((old) => {
      const next = new Set(old);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  return (
    <form action={action} className="space-y-4">
      <TitleDescriptionFields state={state} title={defaultTitle} description="" />
      {offered.length > 0 && (
        <fieldset className="space-y-2">
          <legend className="font-medium">
            Versions to add ({chosen.size} of {offered.length} chosen)
          </legend>
          <ul className="space-y-1">
            {offered.map((o) => (
              <li key={o.versionId}>
                <label className="flex items-start gap-2 text-sm">
                  <input type="checkbox" checked={chosen.has(o.versionId)} onChange={() => toggle(o.versionId)} className="mt-1" />
                  <span>
                    {o.label} <span className="text-muted">— {o.detail}</span>
                  </span>
                </label>
              </li>
            ))}
          </ul>
        </fieldset>
      )}
      <input type="hidden" name="versionIds" value={[...chosen].join(",")} />
      <FieldError state={state} name="versionIds" />
      {state.fieldErrors &&
        Object.entries(state.fieldErrors)
          .filter(([k]) => k.startsWith("members/"))
          .map(([k, m]) => (
            <p key={k} className="text-sm text-error">
              {m}
            </p>
          ))}
      <SubmitButton>Make the collection</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

/** The draft's title and description, for its owner. */
export function EditCollectionForm({ collectionId, title, description }: { collectionId: number; title: string; description: string }) {
  const [state, action] = useActionState(editCollectionAction, idleState);
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="collectionId" value={collectionId} />
      <TitleDescriptionFields state={state} title={title} description={description} />
      <SubmitButton className="btn-secondary">Save</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

export function RemoveMemberButton({ collectionId, versionId, label }: { collectionId: number; versionId: number; label: string }) {
  const [state, action] = useActionState(removeMemberAction, idleState);
  return (
    <form action={action}>
      <input type="hidden" name="collectionId" value={collectionId} />
      <input type="hidden" name="versionId" value={versionId} />
      <SubmitButton className="btn-secondary py-1">
        Remove<span className="sr-only"> {label}</span>
      </SubmitButton>
      {state.status === "error" && <p className="text-sm text-error">{state.message}</p>}
    </form>
  );
}

/** A draft member's note: change it or, emptied, remove it. */
export function MemberNoteForm({
  collectionId,
  versionId,
  note,
  label,
}: {
  collectionId: number;
  versionId: number;
  note: string | null;
  label: string;
}) {
  const [state, action] = useActionState(memberNoteAction, idleState);
  const id = `note-${versionId}`;
  return (
    <form action={action} className="flex flex-wrap items-end gap-2 text-sm">
      <input type="hidden" name="collectionId" value={collectionId} />
      <input type="hidden" name="versionId" value={versionId} />
      <label className="min-w-0 flex-1 space-y-1" htmlFor={id}>
        <span className="block">
          Note<span className="sr-only"> on {label}</span>
        </span>
        <input id={id} name="note" maxLength={500} defaultValue={note ?? ""} placeholder="used for R12" className="field-input w-full" />
      </label>
      <SubmitButton className="btn-secondary py-1">
        Save note<span className="sr-only"> on {label}</span>
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

/** Publish the draft, or start a new revision of a published collection. */
export function CollectionStepButton({ collectionId, step }: { collectionId: number; step: "publish" | "revise" }) {
  const [state, action] = useActionState(step === "publish" ? publishCollectionAction : reviseCollectionAction, idleState);
  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="collectionId" value={collectionId} />
      <SubmitButton className={step === "publish" ? "btn-primary" : "btn-secondary"}>
        {step === "publish" ? "Publish this version" : "Start a new revision"}
      </SubmitButton>
      {state.status === "error" && state.fieldErrors && (
        <ul className="text-sm text-error">
          {Object.values(state.fieldErrors).map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      )}
      <FormMessage state={state} />
    </form>
  );
}

/**
 * "Add to a collection" on a dataset, reaction or search page: one of the person's draft
 * collections, an optional note, or a link to start a new collection with these versions.
 */
export function AddToCollectionForm({
  versionIds,
  drafts,
  what,
}: {
  versionIds: number[];
  drafts: { id: number; title: string }[];
  /** "this version", "these 3 versions". */
  what: string;
}) {
  const [state, action] = useActionState(addToCollectionAction, idleState);
  const startNew = `/collections/new?versions=${versionIds.join(",")}`;
  if (drafts.length === 0)
    return (
      <p className="text-sm">
        <Link href={startNew}>Start a collection with {what}</Link>
      </p>
    );
  return (
    <form action={action} className="flex flex-wrap items-end gap-3 text-sm">
      <input type="hidden" name="versionIds" value={versionIds.join(",")} />
      <label className="space-y-1">
        <span className="block">Add {what} to</span>
        <select name="collectionId" className="field-input" defaultValue={drafts[0].id}>
          {drafts.map((d) => (
            <option key={d.id} value={d.id}>
              {d.title}
            </option>
          ))}
        </select>
      </label>
      <label className="space-y-1">
        <span className="block">Note (optional)</span>
        <input name="note" maxLength={500} placeholder="used for R12" className="field-input" />
      </label>
      <SubmitButton className="btn-secondary py-1">Add to the collection</SubmitButton>
      <Link href={startNew}>or start a new one</Link>
      <FormMessage state={state} />
      {state.status === "error" &&
        state.fieldErrors &&
        Object.entries(state.fieldErrors).map(([k, m]) => (
          <p key={k} className="w-full text-error">
            {m}
          </p>
        ))}
    </form>
  );
}
