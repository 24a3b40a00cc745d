import { versionPath } from "@/lib/identifiers/paths";
import Link from "next/link";
import {
  CONSENSUS_INCLUDES,
  describeChoice,
  includeLabels,
  type ConsensusSelection,
  type MethodKind,
  type ParameterError,
} from "@/lib/reactions/consensus-selection";
import { ExclusionControls } from "./exclusion-forms";
import { fieldLabels, inFormWords } from "./form-words";
import { formatRange } from "@/lib/format";

const kindWords: Record<MethodKind, string> = {
  measured: "measured",
  calculated: "calculated",
  evaluated: "evaluated",
  unknown: "method not stated",
};

/**
 * The reader's choice of data for the consensus: a plain GET form, so the choice lives in the URL
 * (shareable, works without JavaScript). `values` are the raw parameters, kept when they are wrong.
 */
export function ConsensusChoiceForm({
  pagePath,
  values,
  errors,
}: {
  /** The reaction page this form reloads with the choice. */
  pagePath: string;
  values: { include: string; Tmin: string; Tmax: string };
  errors: ParameterError[];
}) {
  const errorOf = (name: string) => {
    const message = errors.find((e) => e.parameter === name)?.message;
    return message === undefined ? undefined : inFormWords(message);
  };
  const field = (name: "Tmin" | "Tmax", label: string) => {
    const error = errorOf(name);
    return (
      <div className="space-y-1">
        <label htmlFor={`choice-${name}`} className="block text-sm font-medium">
          {label}
        </label>
        <input
          id={`choice-${name}`}
          name={name}
          type="text"
          inputMode="decimal"
          defaultValue={values[name]}
          className="field-input w-32"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `choice-${name}-error` : "choice-window-hint"}
        />
        {error && (
          <p id={`choice-${name}-error`} className="text-sm text-error">
            {error}
          </p>
        )}
      </div>
    );
  };
  const other = errors.filter((e) => e.parameter !== "Tmin" && e.parameter !== "Tmax" && e.parameter !== "include");
  const includeError = errorOf("include");
  return (
    <section className="card space-y-3" aria-labelledby="choice-heading">
      <h2 id="choice-heading" className="text-xl font-semibold">
        Choose the data
      </h2>
      {errors.length > 0 && (
        <p role="alert" className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
          This choice could not be read, so the consensus below uses every measured and calculated dataset at every temperature.
          {other.map((e) => ` ${e.message}.`).join("")}
        </p>
      )}
      <form method="get" action={pagePath} className="flex flex-wrap items-end gap-6">
        <fieldset className="space-y-1" aria-describedby={includeError ? "choice-include-error" : undefined}>
          <legend className="text-sm font-medium">Datasets</legend>
          {CONSENSUS_INCLUDES.map((value) => (
            <label key={value} className="flex items-center gap-2 text-sm">
              <input
                type="radio"
                name="include"
                value={value}
                defaultChecked={((CONSENSUS_INCLUDES as readonly string[]).includes(values.include) ? values.include : "all") === value}
              />
              {includeLabels[value]}
            </label>
          ))}
          {includeError && (
            <p id="choice-include-error" className="text-sm text-error">
              {includeError}
            </p>
          )}
        </fieldset>
        <fieldset className="space-y-1">
          <legend className="text-sm font-medium">Temperature window</legend>
          <div className="flex gap-3">
            {field("Tmin", fieldLabels.Tmin)}
            {field("Tmax", fieldLabels.Tmax)}
          </div>
          <p id="choice-window-hint" className="text-xs text-muted">
            Leave blank for no limit. Points outside are dropped before the fit.
          </p>
        </fieldset>
        <div className="flex items-center gap-3">
          <button type="submit" className="btn-secondary">
            Show this consensus
          </button>
          <Link href={pagePath} className="text-sm">
            Back to the default
          </Link>
        </div>
      </form>
      <p className="text-xs text-muted">Evaluated datasets (recommended values derived from other work) never enter a consensus.</p>
    </section>
  );
}

export interface ExclusionRow {
  versionId: number;
  number: number;
  title: string;
  currentReason: string | null;
}

/** What went into the consensus and what did not, with every reason; curators' controls below. */
export function WhatWentIn({
  selection,
  unavailable,
  curatorRows,
  shown,
}: {
  selection: ConsensusSelection;
  unavailable: string | null;
  /** The versions of the page's part of a long list; every one when absent (the counts are always of all). */
  shown?: ReadonlySet<number>;
  /** Versions the viewer may leave out or include again; null for everyone else. */
  curatorRows: ExclusionRow[] | null;
}) {
  const used = selection.used.filter((d) => !shown || shown.has(d.versionId));
  const notUsed = selection.notUsed.filter((d) => !shown || shown.has(d.versionId));
  return (
    <section className="card space-y-3" aria-labelledby="inputs-heading">
      <h2 id="inputs-heading" className="text-xl font-semibold">
        What went into the consensus
      </h2>
      <p className="text-sm">{describeChoice(selection.choice)}</p>
      {unavailable && <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{unavailable}</p>}
      <h3 className="font-semibold">Used ({selection.used.length})</h3>
      {used.length === 0 ? (
        <p className="text-sm text-muted">{selection.used.length ? "None among the datasets of this part of the list." : "None."}</p>
      ) : (
        <ul className="list-disc space-y-1 pl-6 text-sm">
          {used.map((d) => (
            <li key={d.versionId}>
              <Link href={versionPath(d.datasetId, d.number)}>{d.title}</Link> <span className="text-muted">v{d.number}</span> —{" "}
              {kindWords[d.kind]}, {d.pointsUsed === d.points ? `${d.points} points` : `${d.pointsUsed} of its ${d.points} points`},{" "}
              {formatRange(d.Tmin, d.Tmax, "K")}
            </li>
          ))}
        </ul>
      )}
      <h3 className="font-semibold">Not used ({selection.notUsed.length})</h3>
      {notUsed.length === 0 ? (
        <p className="text-sm text-muted">{selection.notUsed.length ? "None among the datasets of this part of the list." : "None."}</p>
      ) : (
        <ul className="list-disc space-y-2 pl-6 text-sm">
          {notUsed.map((d) => (
            <li key={d.versionId}>
              <Link href={versionPath(d.datasetId, d.number)}>{d.title}</Link> <span className="text-muted">v{d.number}</span> —{" "}
              {kindWords[d.kind]}:
              <ul className="pl-4">
                {d.reasons.map((r) => (
                  <li key={r.code}>{r.message}</li>
                ))}
              </ul>
            </li>
          ))}
        </ul>
      )}
      {curatorRows && curatorRows.length > 0 && (
        <div className="space-y-2 border-t border-line pt-3">
          <h3 className="font-semibold">Curators: leave a dataset out</h3>
          <p className="text-xs text-muted">
            Readers see the reason beside the dataset; the deposit and its published versions stay as they are. Every change is audited.
          </p>
          <ul className="space-y-3">
            {curatorRows.map((r) => (
              <li key={r.versionId} className="space-y-1">
                <p className="text-sm font-medium">
                  {r.title} <span className="text-muted">v{r.number}</span>
                  {r.currentReason !== null && <span className="font-normal text-muted"> — left out: {r.currentReason}</span>}
                </p>
                <ExclusionControls versionId={r.versionId} title={r.title} currentReason={r.currentReason} />
              </li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
