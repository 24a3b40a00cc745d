"use client";

import { useRouter } from "next/navigation";
import { useDeferredValue, useEffect, useMemo, useRef, useState } from "react";
import { createDraftAction, saveDraftAction } from "@/app/deposits/actions";
import type { VersionCapabilities } from "@/lib/curation/capabilities";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import type { DepositDocument } from "@/lib/deposits/types";
import type { FieldError } from "@/lib/errors";
import { AboutSection } from "./about-section";
import { ConditionsSection } from "./conditions-section";
import { CreditSection } from "./credit-section";
import { DataSection } from "./data-section";
import { EditorContextProvider, type EditorContextValue } from "./editor-context";
import { ErrorSummary } from "./error-summary";
import { blankForm, documentToForm, formToDocument, type EditorForm, type PersonDefaults } from "./form-model";
import { LifecyclePanel, type DecisionView, type MemberView, type VersionView } from "./lifecycle-panel";
import { LiveAnalysis } from "./live-analysis";
import { MethodSection } from "./method-section";
import { groupErrors, isWithin, pointRowOf, resolveFieldPointer, SECTIONS, sectionAnchor } from "./pointers";
import { ReactionSection } from "./reaction-section";
import { ReportedFitSection } from "./reported-fit-section";
import { visibleRows, windowStartFor } from "./row-window";
import { AUTOSAVE_DELAY_MS, CONFLICT_MESSAGE, saveStateWords, stateAfterFailure, type SaveResult, type SaveState } from "./save-status";
import { SourceSection } from "./source-section";
import { REACTION_CHECK_CODES, type StoredCheck } from "./words";

export type DepositEditorProps =
  | { mode: "new"; person: PersonDefaults }
  | {
      mode: "existing";
      version: VersionView;
      payload: DepositDocument;
      lockVersion: number;
      role: CoEditorRole | null;
      /** What this person may do to this version (lib/curation/capabilities.ts). */
      capabilities: VersionCapabilities;
      checks: StoredCheck[];
      decisions: DecisionView[];
      members: MemberView[];
    };

function downloadJson(doc: DepositDocument, name: string) {
  const url = URL.createObjectURL(new Blob([JSON.stringify(doc, null, 2)], { type: "application/json" }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  a.click();
  URL.revokeObjectURL(url);
}

/**
 * The deposit editor: the document in sections, the live fit of its rows, saving (by hand, and by
 * itself three seconds after the last change to an existing draft) with optimistic locking, and —
 * for a stored version — where it is in its lifecycle.
 */
export function DepositEditor(props: DepositEditorProps) {
  const router = useRouter();
  const existing = props.mode === "existing" ? props : null;
  const editable = existing ? existing.capabilities.edit : true;
  const versionId = existing?.version.id ?? null;

  const [form, setForm] = useState<EditorForm>(() =>
    existing ? documentToForm(existing.payload) : blankForm(props.mode === "new" ? props.person : undefined),
  );
  const [revision, setRevision] = useState(0);
  const [savedRevision, setSavedRevision] = useState(0);
  const [attemptedRevision, setAttemptedRevision] = useState(0);
  const [serverErrors, setServerErrors] = useState<FieldError[]>([]);
  const [saveState, setSaveState] = useState<SaveState>({ kind: "idle" });
  const [windowStart, setWindowStart] = useState(0);
  const lockVersion = useRef(existing?.lockVersion ?? 0);
  const inFlight = useRef(false);
  const leaving = useRef(false);
  const summaryRef = useRef<HTMLDivElement>(null);
  const [summaryFocus, setSummaryFocus] = useState(0);
  const dirty = revision !== savedRevision;

  const update = (change: (f: EditorForm) => EditorForm) => {
    setForm(change);
    setRevision((r) => r + 1);
  };

  // Numbers the form cannot read are flagged as they are typed; deferred so long tables stay responsive.
  const deferredForm = useDeferredValue(form);
  const localProblems = useMemo(() => formToDocument(deferredForm).problems, [deferredForm]);
  const allErrors = useMemo(() => [...localProblems, ...serverErrors], [localProblems, serverErrors]);
  const grouped = useMemo(() => groupErrors(allErrors, form), [allErrors, form]);
  const serverGrouped = useMemo(() => groupErrors(serverErrors, form), [serverErrors, form]);

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

  async function save(auto: boolean) {
    if (inFlight.current || !editable || saveState.kind === "conflict") return;
    inFlight.current = true;
    const rev = revision;
    setAttemptedRevision(rev);
    setSaveState({ kind: "saving", auto });
    const json = JSON.stringify(formToDocument(form).document);
    let result: SaveResult;
    try {
      result = versionId === null ? await createDraftAction(json) : await saveDraftAction(versionId, lockVersion.current, json);
    } catch {
      result = { ok: false, status: 0, message: "The server could not be reached. Your edits are still here; try again.", errors: [] };
    } finally {
      inFlight.current = false;
    }
    if (result.ok) {
      lockVersion.current = result.lockVersion;
      setSavedRevision(rev);
      setServerErrors([]);
      setSaveState({ kind: "saved", at: new Date() });
      if (versionId === null) {
        leaving.current = true;
        router.replace(`/deposits/${result.versionId}`);
      } else {
        // New checks (identity, balance, fit) come with the refreshed page.
        router.refresh();
      }
      return;
    }
    setServerErrors(result.status === 422 ? result.errors : []);
    setSaveState(stateAfterFailure(result, auto));
    if (result.status === 422 && !auto) setSummaryFocus((n) => n + 1);
  }

  // A refused save the person asked for moves focus to the list of problems.
  useEffect(() => {
    if (summaryFocus > 0) summaryRef.current?.focus();
  }, [summaryFocus]);

  // Autosave: an existing, editable draft saves itself once changes have rested; never after a conflict,
  // and never twice for the same edits (a refused save waits for the next change).
  const saveRef = useRef(save);
  useEffect(() => {
    saveRef.current = save;
  });
  // Numbers that cannot be read yet (often half-typed) would only be refused: autosave waits for them.
  const autosave =
    versionId !== null &&
    editable &&
    dirty &&
    localProblems.length === 0 &&
    revision !== attemptedRevision &&
    saveState.kind !== "conflict" &&
    saveState.kind !== "saving";
  useEffect(() => {
    if (!autosave) return;
    const timer = setTimeout(() => void saveRef.current(true), AUTOSAVE_DELAY_MS);
    return () => clearTimeout(timer);
  }, [autosave, revision]);

  useEffect(() => {
    if (!dirty || !editable) return;
    const warn = (e: BeforeUnloadEvent) => {
      if (leaving.current) return;
      e.preventDefault();
    };
    window.addEventListener("beforeunload", warn);
    return () => window.removeEventListener("beforeunload", warn);
  }, [dirty, editable]);

  const showRow = (row: number) => {
    setWindowStart(windowStartFor(row));
    requestAnimationFrame(() => document.getElementById(`field-points-${row}`)?.scrollIntoView({ block: "center" }));
  };
  const { from, to } = visibleRows(form.points.length, windowStart);
  const hiddenRows = [
    ...new Set(
      serverErrors
        .map((e) => pointRowOf(e.pointer))
        .filter((r): r is number => r !== null && r < form.points.length && (r < from || r >= to)),
    ),
  ].sort((a, b) => a - b);

  const checks = existing?.checks ?? [];
  const reactionChecks = checks.filter((c) => REACTION_CHECK_CODES.has(c.code));
  const waiting = versionId !== null && dirty && localProblems.length > 0 && (saveState.kind === "idle" || saveState.kind === "saved");
  const status = `${saveStateWords(saveState, dirty)}${waiting ? " Autosave waits until every number can be read." : ""}`;

  return (
    <EditorContextProvider value={context}>
      <div className="space-y-6">
        {existing && (
          <LifecyclePanel
            version={existing.version}
            role={existing.role}
            capabilities={existing.capabilities}
            checks={checks}
            decisions={existing.decisions}
            members={existing.members}
            dirty={dirty}
          />
        )}

        {!editable && (
          <p className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
            {existing?.role === "owner" || existing?.role === "editor"
              ? `This version is ${existing.version.state.replace(/_/g, " ")}, so it can be read here but not changed.`
              : "You can read this version; only its owner and editors can change it."}
          </p>
        )}

        {editable && (
          <div className="sticky top-0 z-20 -mx-2 flex flex-wrap items-center gap-3 border-b border-line bg-paper/95 px-2 py-3 backdrop-blur-sm">
            <button
              type="button"
              className="btn-primary"
              onClick={() => void save(false)}
              disabled={saveState.kind === "saving" || saveState.kind === "conflict"}
            >
              {saveState.kind === "saving" ? "Saving…" : "Save draft"}
            </button>
            <p role="status" aria-live="polite" className="text-sm text-muted">
              {status}
            </p>
            {versionId !== null && (
              <p className="ml-auto text-xs text-muted">Drafts save themselves a few seconds after you stop typing.</p>
            )}
          </div>
        )}

        {saveState.kind === "conflict" && (
          <div role="alert" className="space-y-3 rounded-lg border-2 border-error/60 bg-panel p-4 text-sm">
            <p className="font-semibold text-error">{CONFLICT_MESSAGE}</p>
            {saveState.detail && <p>{saveState.detail}</p>}
            <div className="flex flex-wrap gap-3">
              <button
                type="button"
                className="btn-primary"
                onClick={() => {
                  leaving.current = true;
                  window.location.reload();
                }}
              >
                Reload
              </button>
              <button
                type="button"
                className="btn-secondary"
                onClick={() => downloadJson(formToDocument(form).document, `deposit-${versionId ?? "new"}-my-edits.json`)}
              >
                Download my edits (JSON)
              </button>
            </div>
          </div>
        )}

        {saveState.kind === "failed" && (
          <p role="alert" className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
            {saveState.message}
          </p>
        )}

        {saveState.kind === "invalid" && serverErrors.length > 0 && (
          <ErrorSummary
            ref={summaryRef}
            message={saveState.message}
            errors={serverErrors}
            grouped={serverGrouped}
            hiddenRows={hiddenRows}
            onShowRow={showRow}
            announce={!saveState.auto}
          />
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
        <ReportedFitSection form={form} update={update} />
        <SourceSection form={form} update={update} />
        <CreditSection form={form} update={update} />

        {editable && (
          <div className="flex flex-wrap items-center gap-3">
            <button
              type="button"
              className="btn-primary"
              onClick={() => void save(false)}
              disabled={saveState.kind === "saving" || saveState.kind === "conflict"}
            >
              {saveState.kind === "saving" ? "Saving…" : "Save draft"}
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
