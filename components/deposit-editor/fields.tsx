"use client";

import type { ReactNode } from "react";
import { useEditorContext } from "./editor-context";
import { fieldId } from "./pointers";

interface BaseProps {
  /** JSON pointer of the value; it names the input and finds its problems. */
  pointer: string;
  label: string;
  hint?: ReactNode;
  /** Label for screen readers only (inside tables). */
  hideLabel?: boolean;
  className?: string;
}

/** The problems at a pointer, tied to the input by aria-describedby. */
export function FieldMessages({ id, messages }: { id: string; messages: string[] }) {
  if (messages.length === 0) return null;
  return (
    <ul id={`${id}-error`} className="space-y-0.5 text-sm text-error">
      {messages.map((m) => (
        <li key={m}>
          <span className="font-semibold">Problem: </span>
          {m}
        </li>
      ))}
    </ul>
  );
}

function useField(pointer: string, hint: unknown, extraMessages: string[] = []) {
  const ctx = useEditorContext();
  const id = fieldId(pointer);
  const messages = [...ctx.messagesFor(pointer), ...extraMessages];
  const describedBy = [hint ? `${id}-hint` : null, messages.length ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  return { ctx, id, messages, describedBy, invalid: messages.length > 0 };
}

function Label({ id, label, hideLabel, required }: { id: string; label: string; hideLabel?: boolean; required?: boolean }) {
  return (
    <label htmlFor={id} className={hideLabel ? "sr-only" : "block text-sm font-medium"}>
      {label}
      {required && !hideLabel && <span className="font-normal text-muted"> (required)</span>}
    </label>
  );
}

function Hint({ id, hint }: { id: string; hint?: ReactNode }) {
  if (!hint) return null;
  return (
    <p id={`${id}-hint`} className="text-xs text-muted">
      {hint}
    </p>
  );
}

const invalidStyle = "border-error ring-1 ring-error/40";

export function TextField({
  pointer,
  label,
  hint,
  hideLabel,
  className,
  value,
  onChange,
  required,
  list,
  inputMode,
  placeholder,
  autoComplete,
  mono,
}: BaseProps & {
  value: string;
  onChange: (value: string) => void;
  required?: boolean;
  list?: string;
  inputMode?: "text" | "decimal" | "numeric";
  placeholder?: string;
  autoComplete?: string;
  mono?: boolean;
}) {
  const { ctx, id, messages, describedBy, invalid } = useField(pointer, hint);
  return (
    <div className={`space-y-1 ${className ?? ""}`}>
      <Label id={id} label={label} hideLabel={hideLabel} required={required} />
      <input
        id={id}
        type="text"
        value={value}
        onChange={(e) => {
          ctx.clearErrors(pointer);
          onChange(e.target.value);
        }}
        readOnly={ctx.readOnly}
        aria-required={required || undefined}
        aria-invalid={invalid || undefined}
        aria-describedby={describedBy}
        list={list}
        inputMode={inputMode}
        placeholder={placeholder}
        autoComplete={autoComplete ?? "off"}
        spellCheck={mono ? false : undefined}
        className={`field-input ${mono ? "font-mono" : ""} ${invalid ? invalidStyle : ""} ${ctx.readOnly ? "bg-paper" : ""}`}
      />
      <Hint id={id} hint={hint} />
      <FieldMessages id={id} messages={messages} />
    </div>
  );
}

/** A number typed as text (so exponent notation and a half-typed value survive). */
export function NumberField(props: Omit<Parameters<typeof TextField>[0], "inputMode">) {
  return <TextField {...props} inputMode="decimal" mono />;
}

export function TextAreaField({
  pointer,
  label,
  hint,
  className,
  value,
  onChange,
  rows = 4,
  required,
  mono,
}: BaseProps & { value: string; onChange: (value: string) => void; rows?: number; required?: boolean; mono?: boolean }) {
  const { ctx, id, messages, describedBy, invalid } = useField(pointer, hint);
  return (
    <div className={`space-y-1 ${className ?? ""}`}>
      <Label id={id} label={label} required={required} />
      <textarea
        id={id}
        value={value}
        rows={rows}
        onChange={(e) => {
          ctx.clearErrors(pointer);
          onChange(e.target.value);
        }}
        readOnly={ctx.readOnly}
        aria-required={required || undefined}
        aria-invalid={invalid || undefined}
        aria-describedby={describedBy}
        className={`field-input ${mono ? "font-mono" : ""} ${invalid ? invalidStyle : ""} ${ctx.readOnly ? "bg-paper" : ""}`}
      />
      <Hint id={id} hint={hint} />
      <FieldMessages id={id} messages={messages} />
    </div>
  );
}

export interface Option {
  value: string;
  label: string;
}

export function SelectField({
  pointer,
  label,
  hint,
  hideLabel,
  className,
  value,
  onChange,
  options,
  placeholder,
  required,
}: BaseProps & { value: string; onChange: (value: string) => void; options: readonly Option[]; placeholder?: string; required?: boolean }) {
  const { ctx, id, messages, describedBy, invalid } = useField(pointer, hint);
  // A stored value outside the list (an older unit spelling, say) stays visible rather than silently changing.
  const known = value === "" || options.some((o) => o.value === value);
  return (
    <div className={`space-y-1 ${className ?? ""}`}>
      <Label id={id} label={label} hideLabel={hideLabel} required={required} />
      <select
        id={id}
        value={value}
        onChange={(e) => {
          ctx.clearErrors(pointer);
          onChange(e.target.value);
        }}
        disabled={ctx.readOnly}
        aria-required={required || undefined}
        aria-invalid={invalid || undefined}
        aria-describedby={describedBy}
        className={`field-input ${invalid ? invalidStyle : ""}`}
      >
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {!known && <option value={value}>{value}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <Hint id={id} hint={hint} />
      <FieldMessages id={id} messages={messages} />
    </div>
  );
}

export function CheckboxField({
  pointer,
  label,
  hint,
  className,
  checked,
  onChange,
}: BaseProps & { checked: boolean; onChange: (checked: boolean) => void }) {
  const { ctx, id, messages, describedBy, invalid } = useField(pointer, hint);
  return (
    <div className={`space-y-1 ${className ?? ""}`}>
      <div className="flex items-start gap-2">
        <input
          id={id}
          type="checkbox"
          checked={checked}
          onChange={(e) => {
            ctx.clearErrors(pointer);
            onChange(e.target.checked);
          }}
          disabled={ctx.readOnly}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          className="mt-1 h-4 w-4 accent-accent"
        />
        <label htmlFor={id} className="text-sm font-medium">
          {label}
        </label>
      </div>
      <Hint id={id} hint={hint} />
      <FieldMessages id={id} messages={messages} />
    </div>
  );
}

/** Problems about a whole group (a list, a range) shown under its legend. */
export function GroupMessages({ pointer }: { pointer: string }) {
  const { messagesFor } = useEditorContext();
  const messages = messagesFor(pointer);
  if (messages.length === 0) return null;
  return (
    <div id={fieldId(pointer)} tabIndex={-1}>
      <FieldMessages id={fieldId(pointer)} messages={messages} />
    </div>
  );
}

/** A section of the editor: a fieldset with a visible legend and an anchor for the error summary. */
export function Section({ id, title, description, children }: { id: string; title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <fieldset id={id} className="card min-w-0 scroll-mt-6 space-y-5">
      <legend className="float-left mb-1 w-full font-serif text-xl font-semibold">{title}</legend>
      {description && <p className="clear-left text-sm text-muted">{description}</p>}
      <div className="clear-left space-y-5">{children}</div>
    </fieldset>
  );
}

/** A smaller titled group inside a section. */
export function SubGroup({ legend, children, className }: { legend: string; children: ReactNode; className?: string }) {
  return (
    <fieldset className={`space-y-3 rounded-md border border-line p-4 ${className ?? ""}`}>
      <legend className="px-1 text-sm font-semibold">{legend}</legend>
      {children}
    </fieldset>
  );
}
