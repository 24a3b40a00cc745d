"use client";

import { useRouter } from "next/navigation";
import { useCallback, useDeferredValue, useEffect, useMemo, useRef, useState } from "react";
import { createDraftAction, saveDraftAction, type LatestDraft } from "@/app/deposits/actions";
import type { VersionCapabilities } from "@/lib/curation/capabilities";
import type { ConversationEntry } from "@/lib/curation/conversation";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits/limits";
import type { DepositDocument } from "@/lib/deposits/types";
import type { FieldError } from "@/lib/errors";
import { AboutSection } from "./about-section";
import { ConditionsSection } from "./conditions-section";
import { CreditSection } from "./credit-section";
import { DataSection } from "./data-section";
import { EditorContextProvider, type EditorContextValue } from "./editor-context";
import { conflictFields, mergeDocuments, type Side } from "./conflict";
import { ConflictPanel } from "./conflict-panel";
import { blankForm, documentToForm, formToDocument, type EditorForm, type PersonDefaults } from "./form-model";
import { LifecyclePanel, type DecisionView, type MemberView, type VersionView } from "./lifecycle-panel";
import { LiveAnalysis } from "./live-analysis";
import { MethodSection } from "./method-section";
import { fieldId, groupErrors, isWithin, mergeProblems, resolveFieldPointer, SECTIONS, sectionAnchor } from "./pointers";
import { ReactionSection } from "./reaction-section";
import { ReportedFitSection } from "./reported-fit-section";
import { readinessItems } from "./readiness";
import { ReadinessPanel } from "./readiness-panel";
import { windowStartFor } from "./row-window";
import { AUTOSAVE_DELAY_MS, NEEDS_TITLE, saveStateWords, stateAfterFailure, type SaveResult, type SaveState } from "./save-status";
import { SourceSection } from "./source-section";
import { useLeaveGuard } from "./use-leave-guard";
import { validityRangeWarning } from "./validity-range";
import { blockingChecks, checkPointer, REACTION_CHECK_CODES, type StoredCheck } from "./words";

export type DepositEditorProps =
  | { mode: "new"; person: PersonDefaults }
  | {
      mode: "existing";
      version: VersionView;
      /** The latest saved document: the draft document of an incomplete draft, else the payload. */
      payload: DepositDocument | Record<string, unknown>;
      /** What keeps the saved draft from being submitted (empty when it is ready). */
      problems?: FieldError[];
      lockVersion: number;
      role: CoEditorRole | null;
      /** What this person may do to this version (lib/curation/capabilities.ts). */
      capabilities: VersionCapabilities;
      checks: StoredCheck[];
      decisions: DecisionView[];
      /** Returns and the authors' replies so far, oldest first (shown beside the reply field). */
      conversation?: ConversationEntry[];
      members: MemberView[];
    };

function downloadJson(doc: unknown, name: string) {
  const url = URL.createObjectURL(new Blob([JSON.stringify(doc, null, 2)], { type: "application/json" }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  a.click();
  URL.revokeObjectURL(url);
}

/**
 * The deposit editor: the document in sections, the live fit of its rows, and saving. Every change
 * saves itself (AUTOSAVE_DELAY_MS after the last keystroke, at once when focus leaves a field or the
 * tab is hidden), complete or not, once the deposit has a title; what keeps it from being submitted
 * is listed under "Not ready to submit". Saves are guarded by the lock version: when a co-editor
 * saved first, the two drafts are compared field by field and merged as the person chooses. Leaving
 * with unsaved changes asks first. For a stored version it also shows where it is in its lifecycle.
 */
export function DepositEditor(props: DepositEditorProps) {
  const router = useRouter();
  const existing = props.mode === "existing" ? props : null;
  const editable = existing ? existing.capabilities.edit : true;
  const [versionId, setVersionId] = useState<number | null>(existing?.version.id ?? null);

  const [form, setForm] = useState<EditorForm>(() =>
    existing ? documentToForm(existing.payload) : blankForm(props.mode === "new" ? props.person : undefined),
  );
  const [revision, setRevision] = useState(0);
  const [savedRevision, setSavedRevision] = useState(0);
  const [attemptedRevision, setAttemptedRevision] = useState(0);
  const [serverErrors, setServerErrors] = useState<FieldError[]>(existing?.problems ?? []);
  const [saveState, setSaveState] = useState<SaveState>({ kind: "idle" });
  // A co-editor's newer draft and the document both started from (the person's last successful save).
  const [conflict, setConflict] = useState<{ latest: LatestDraft; base: Record<string, unknown> } | null>(null);
  const [windowStart, setWindowStart] = useState(0);
  const lockVersion = useRef(existing?.lockVersion ?? 0);
  // The document as last loaded or saved: a merge proposes theirs where mine is still this.
  const baseDocument = useRef<Record<string, unknown>>(
    existing ? (formToDocument(form).document as unknown as Record<string, unknown>) : {},
  );
  const inFlight = useRef(false);
  const [wantsOwnPage, setWantsOwnPage] = useState(false);
  const saveAgain = useRef(false);
  const [saveAgainTick, setSaveAgainTick] = useState(0);
  const readinessRef = useRef<HTMLDivElement>(null);
  const dirty = revision !== savedRevision;
  const latestRevision = useRef(revision);
  useEffect(() => {
    latestRevision.current = revision;
  });
  const saving = saveState.kind === "saving";
  const guard = useLeaveGuard(editable && (dirty || saving));

  // "Save draft" pressed on a new deposit opens the draft's own page once everything typed is stored.
  // The router takes it there even though the address already names it (set by the first save).
  const leaving = useRef(false);
  useEffect(() => {
    if (!wantsOwnPage || versionId === null || dirty || saving || saveState.kind !== "saved" || leaving.current) return;
    leaving.current = true;
    guard.leave(() => router.replace(`/deposits/${versionId}`));
  }, [wantsOwnPage, versionId, dirty, saving, saveState.kind, guard, router]);

  const update = (change: (f: EditorForm) => EditorForm) => {
    setForm(change);
    setRevision((r) => r + 1);
  };

  // Numbers the form cannot read are flagged as they are typed; deferred so long tables stay responsive.
  const deferredForm = useDeferredValue(form);
  const localProblems = useMemo(() => formToDocument(deferredForm).problems, [deferredForm]);
  // Checks of the last save that stop a submission (e.g. an unbalanced reaction) are listed beside their field too.
  const storedChecks = existing?.checks;
  const checkErrors = useMemo(
    () => blockingChecks(storedChecks ?? []).map((c) => ({ pointer: checkPointer(c.code), message: c.message })),
    [storedChecks],
  );
  const allErrors = useMemo(() => mergeProblems(localProblems, serverErrors, checkErrors), [localProblems, serverErrors, checkErrors]);
  const grouped = useMemo(() => groupErrors(allErrors, form), [allErrors, form]);
  const readiness = useMemo(() => readinessItems(allErrors, deferredForm), [allErrors, deferredForm]);
  const rangeWarning = useMemo(() => validityRangeWarning(deferredForm), [deferredForm]);

  const context: EditorContextValue = {
    readOnly: !editable,
    messagesFor: (pointer) => grouped.byField.get(pointer) ?? [],
    clearErrors: (pointer) =>
      setServerErrors((errors) => {
        const kept = errors.filter(
          (e) => !isWithin(e.pointer, pointer) && !isWithin(resolveFieldPointer(e.pointer, form) ?? e.pointer, pointer),
        );
        return kept.length === errors.length ? errors : kept;
      }),
  };

  async function save(auto: boolean, over?: { form: EditorForm; lockVersion: number; revision: number }) {
    // "Save draft" pressed on a new deposit asks for the draft's own page (its lifecycle, checks and
    // files) as soon as everything typed is stored, whichever save stores it (see the effect below).
    if (!auto && props.mode === "new") setWantsOwnPage(true);
    if (inFlight.current) {
      // Another save is on its way: once it is answered, the autosave looks again (below), so
      // edits made meanwhile are never left unsaved waiting for another keystroke.
      saveAgain.current = true;
      return;
    }
    if (!editable || (conflict && !over)) return;
    const current = over?.form ?? form;
    const rev = over?.revision ?? revision;
    setAttemptedRevision(rev);
    if (current.title.trim() === "") {
      setSaveState({ kind: "failed", message: NEEDS_TITLE });
      if (!auto) document.getElementById(fieldId("/title"))?.focus();
      return;
    }
    inFlight.current = true;
    setSaveState({ kind: "saving", auto });
    const sent = formToDocument(current).document as unknown as Record<string, unknown>;
    // Sent as a Blob (a file part): React refuses text arguments over 1 000 000 characters.
    const json = new Blob([JSON.stringify(sent)], { type: "application/json" });
    const lock = over?.lockVersion ?? lockVersion.current;
    let result: SaveResult;
    try {
      result =
        json.size > MAX_DOCUMENT_BYTES
          ? {
              ok: false,
              status: 413,
              message: `The document is ${(json.size / 1024 / 1024).toFixed(1)} MB; the limit is 25 MB.`,
              errors: [],
            }
          : versionId === null
            ? await createDraftAction(json)
            : await saveDraftAction(versionId, lock, json);
    } catch {
      result = {
        ok: false,
        status: 0,
        message: "the server could not be reached; your edits are still here and will be sent again.",
        errors: [],
      };
    } finally {
      inFlight.current = false;
      if (saveAgain.current) {
        saveAgain.current = false;
        setSaveAgainTick((t) => t + 1);
      }
    }
    const byHand = !auto;
    if (result.ok) {
      lockVersion.current = result.lockVersion;
      baseDocument.current = sent;
      setConflict(null);
      setSavedRevision(rev);
      setServerErrors(result.problems ?? []);
      setSaveState({ kind: "saved", at: new Date() });
      if (props.mode === "new") {
        setVersionId(result.versionId);
        // The address names the stored draft at once (a reload finds it) without leaving this editor;
        // "Save draft" pressed on a new deposit opens the draft's own page once all is saved (below).
        if (versionId === null) guard.replaceAddress(`/deposits/${result.versionId}`);
      } else {
        // New checks (identity, balance, fit) come with the refreshed page.
        router.refresh();
      }
      return;
    }
    if (result.status === 409 && result.latest) {
      setConflict({ latest: result.latest, base: baseDocument.current });
      setSaveState({ kind: "conflict" });
      return;
    }
    if (result.status === 422) setServerErrors(result.errors);
    setSaveState(stateAfterFailure(result, !byHand));
    if (result.status === 422 && byHand) readinessRef.current?.focus();
  }

  // "Mine" is the form as it is now: typing while the panel is open updates the comparison.
  const conflictView = useMemo(() => {
    if (!conflict) return null;
    const mine = formToDocument(form).document as unknown as Record<string, unknown>;
    return { mine, fields: conflictFields(conflict.base, mine, conflict.latest.document) };
  }, [conflict, form]);

  function merge(choices: Record<string, Side>) {
    if (!conflict || !conflictView) return;
    const merged = mergeDocuments(conflictView.mine, conflict.latest.document, conflictView.fields, choices);
    const mergedForm = documentToForm(merged);
    baseDocument.current = conflict.latest.document;
    lockVersion.current = conflict.latest.lockVersion;
    const rev = revision + 1;
    setForm(mergedForm);
    setRevision(rev);
    setServerErrors(conflict.latest.problems);
    void save(false, { form: mergedForm, lockVersion: conflict.latest.lockVersion, revision: rev });
  }

  // Autosave: once changes have rested, never during a conflict, and never twice for the same edits
  // (a refused save waits for the next change).
  const saveRef = useRef(save);
  useEffect(() => {
    saveRef.current = save;
  });
  const autosave = editable && dirty && revision !== attemptedRevision && !conflict && !saving;
  useEffect(() => {
    if (!autosave) return;
    const timer = setTimeout(() => void saveRef.current(true), AUTOSAVE_DELAY_MS);
    return () => clearTimeout(timer);
  }, [autosave, revision, saveAgainTick]);

  // Leaving a field or the tab saves at once (the timer may never fire on a closing tab).
  const autosaveRef = useRef(autosave);
  useEffect(() => {
    autosaveRef.current = autosave;
  });
  const flush = useCallback(() => {
    if (autosaveRef.current) void saveRef.current(true);
  }, []);
  useEffect(() => {
    const onHidden = () => {
      if (document.visibilityState === "hidden") flush();
    };
    document.addEventListener("visibilitychange", onHidden);
    return () => document.removeEventListener("visibilitychange", onHidden);
  }, [flush]);

  const showRow = (row: number) => setWindowStart(windowStartFor(row));

  const checks = existing?.checks ?? [];
  const reactionChecks = checks.filter((c) => REACTION_CHECK_CODES.has(c.code));
  const status = saveStateWords(saveState, dirty);

  return (
    <EditorContextProvider value={context}>
      <div
        className="space-y-6"
        onBlur={(e) => {
          // Focus moving between two inputs of the editor counts too: each field left is saved.
          if (e.target instanceof HTMLInputElement || e.target instanceof HTMLTextAreaElement || e.target instanceof HTMLSelectElement)
            flush();
        }}
      >
        {existing && (
          <LifecyclePanel
            version={existing.version}
            role={existing.role}
            capabilities={existing.capabilities}
            checks={checks}
            decisions={existing.decisions}
            conversation={existing.conversation}
            members={existing.members}
            dirty={dirty}
            notReady={readiness.length}
          />
        )}

        {!editable && (
          <p className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
            {existing?.role === "owner" || existing?.role === "editor"
              ? `This version is ${existing.version.state.replace(/_/g, " ")}, so it can be read here but not changed.`
              : "You can read this version; only its owner and editors can change it."}
          </p>
        )}

        {/* Never disabled while saving: pressing it leaves the field being typed in, whose autosave
            starts on that mousedown; a button disabled by it then swallows the click (the save by hand
            and, on a new deposit, the move to the draft's page). A press during a save is made after it. */}
        {editable && (
          <div className="sticky top-0 z-20 -mx-2 flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-line bg-paper/95 px-2 py-3 backdrop-blur-sm">
            <button type="button" className="btn-primary" onClick={() => void save(false)} disabled={conflict !== null}>
              Save draft
            </button>
            <p role="status" aria-live="polite" className="min-w-0 text-sm text-muted" data-testid="save-status">
              {status}
            </p>
            <p className="text-xs text-muted md:ml-auto">Every change is saved as you type, once the deposit has a title.</p>
          </div>
        )}

        {conflict && conflictView && (
          <ConflictPanel
            key={conflict.latest.lockVersion}
            fields={conflictView.fields}
            saving={saving}
            onMerge={merge}
            onDownloadMine={() => downloadJson(conflictView.mine, `deposit-${versionId ?? "new"}-my-edits.json`)}
          />
        )}

        {saveState.kind === "failed" && saveState.message !== NEEDS_TITLE && (
          <p role="alert" className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
            Not saved: {saveState.message}
          </p>
        )}

        {editable && readiness.length > 0 && <ReadinessPanel ref={readinessRef} items={readiness} onShowRow={showRow} />}
        {editable && versionId !== null && readiness.length === 0 && !dirty && saveState.kind !== "saving" && (
          <p className="text-sm text-muted">Nothing is missing: the saved draft is ready to submit.</p>
        )}

        <nav aria-label="Sections of the deposit" className="text-sm">
          <ul className="flex flex-wrap gap-x-4 gap-y-1">
            {SECTIONS.map((s) => (
              <li key={s.id}>
                <a href={`#${sectionAnchor(s.id)}`}>{s.title}</a>
              </li>
            ))}
            <li>
              <a href="#section-analysis">Fit</a>
            </li>
          </ul>
        </nav>

        <AboutSection form={form} update={update} />
        <ReactionSection form={form} update={update} checks={reactionChecks} />
        <MethodSection form={form} update={update} />
        <ConditionsSection form={form} update={update} />
        <DataSection form={form} update={update} windowStart={windowStart} onWindowStart={setWindowStart} />
        <LiveAnalysis form={deferredForm} />
        <ReportedFitSection form={form} update={update} rangeWarning={rangeWarning} />
        <SourceSection form={form} update={update} />
        <CreditSection form={form} update={update} />

        {editable && (
          <div className="flex flex-wrap items-center gap-3">
            <button type="button" className="btn-primary" onClick={() => void save(false)} disabled={conflict !== null}>
              Save draft
            </button>
            <p className="text-sm text-muted" aria-hidden="true">
              {status}
            </p>
          </div>
        )}
      </div>
    </EditorContextProvider>
  );
}
