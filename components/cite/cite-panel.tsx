"use client";

import { useQuery } from "@tanstack/react-query";
import { useId, useState } from "react";
import { ScrollRegion } from "@/components/scroll-region";

/** One citable thing: its machine formats, rendered on the server (lib/citation/formats.ts). */
export interface CiteChoice {
  /** "version" (this version) or "series" (every version). */
  kind: "version" | "series";
  identifier: string | null;
  formats: { id: "bibtex" | "ris" | "csl-json"; label: string; text: string; href: string; fileName: string }[];
}

export interface CitePanelProps {
  datasetId: number;
  /** Every reference style offered, the default first or not. */
  styles: { id: string; label: string }[];
  defaultStyle: string;
  versionNumber: number;
  version: CiteChoice;
  series: CiteChoice | null;
  /** The source publication the deposit names: with a reference to format, or only its DOI. */
  source: { hasReference: boolean; doi: string | null } | null;
}

/** What GET /api/v1/datasets/:id/citation/references answers. */
interface StyleReferences {
  style: string;
  version: string;
  series: string | null;
  source: string | null;
}

/** The formatted references in one style, fetched once per style (citeproc's cost stays off the page's first answer). */
function useStyleReferences(datasetId: number, versionNumber: number, style: string) {
  return useQuery({
    queryKey: ["citation-references", datasetId, versionNumber, style],
    staleTime: Infinity,
    queryFn: async ({ signal }): Promise<StyleReferences> => {
      const res = await fetch(
        `/api/v1/datasets/${datasetId}/citation/references?style=${encodeURIComponent(style)}&version=${versionNumber}`,
        {
          signal,
          headers: { accept: "application/json" },
        },
      );
      if (!res.ok) throw new Error(`the server answered ${res.status}`);
      return (await res.json()) as StyleReferences;
    },
  });
}

/** Copies a text; says so (or why not) in the panel's polite status line. */
function useCopy() {
  const [status, setStatus] = useState("");
  const copy = async (text: string, what: string) => {
    try {
      await navigator.clipboard.writeText(text);
      setStatus(`${what} copied to the clipboard.`);
    } catch {
      setStatus(`Could not copy ${what}: select the text and copy it by hand.`);
    }
  };
  return { status, copy };
}

/**
 * The Cite panel of a public version page: cite this version (default) or every version, a
 * formatted reference in the chosen style, BibTeX, RIS and CSL-JSON to copy or download, and the
 * source publication when the deposit names one.
 */
export function CitePanel({ datasetId, styles, defaultStyle, versionNumber, version, series, source }: CitePanelProps) {
  const [kind, setKind] = useState<"version" | "series">("version");
  const [style, setStyle] = useState(defaultStyle);
  const { status, copy } = useCopy();
  const ids = useId();
  const chosen = kind === "series" && series ? series : version;
  const fetched = useStyleReferences(datasetId, versionNumber, style);
  const styleLabel = styles.find((s) => s.id === style)?.label ?? style;
  const referenceText = (kind === "series" ? fetched.data?.series : fetched.data?.version) ?? null;
  const sourceText = fetched.data?.source ?? null;
  const waiting = fetched.isPending;
  const failed = fetched.isError;

  return (
    <section className="card space-y-4" aria-labelledby={`${ids}-heading`} data-testid="cite-panel">
      <h2 id={`${ids}-heading`} className="text-lg font-semibold">
        Cite
      </h2>
      {series && (
        <fieldset className="space-y-1">
          <legend className="text-sm font-semibold">What to cite</legend>
          <label className="flex items-start gap-2 text-sm">
            <input type="radio" name={`${ids}-kind`} value="version" checked={kind === "version"} onChange={() => setKind("version")} />
            <span>
              This version (version {versionNumber}){" "}
              {version.identifier && <span className="break-all font-mono text-xs">doi:{version.identifier}</span>}
            </span>
          </label>
          <label className="flex items-start gap-2 text-sm">
            <input type="radio" name={`${ids}-kind`} value="series" checked={kind === "series"} onChange={() => setKind("series")} />
            <span>
              Every version (the dataset as it grows){" "}
              {series.identifier && <span className="break-all font-mono text-xs">doi:{series.identifier}</span>}
            </span>
          </label>
        </fieldset>
      )}

      <div className="space-y-2">
        <div className="flex flex-wrap items-end gap-3">
          <label className="space-y-1 text-sm">
            <span className="block font-semibold">Reference style</span>
            <select className="field-input" value={style} onChange={(e) => setStyle(e.target.value)}>
              {styles.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.label}
                </option>
              ))}
            </select>
          </label>
          <button
            type="button"
            className="btn-secondary"
            disabled={referenceText === null}
            onClick={() => referenceText !== null && copy(referenceText, `The ${styleLabel} reference`)}
          >
            Copy reference
          </button>
        </div>
        <p className="break-words rounded-md border border-line bg-panel px-3 py-2 text-sm" data-testid="cite-reference" aria-live="polite">
          {referenceText ??
            (waiting
              ? `Formatting the ${styleLabel} reference…`
              : failed
                ? `The ${styleLabel} reference could not be loaded (${(fetched.error as Error).message})); BibTeX below holds the same details.`
                : null)}
        </p>
      </div>

      <div className="space-y-3">
        <h3 className="font-semibold">For reference managers</h3>
        {chosen.formats.map((f) => (
          <div key={f.id} className="space-y-1">
            <div className="flex flex-wrap items-center gap-3">
              <h4 id={`${ids}-${f.id}`} className="text-sm font-semibold">
                {f.label}
              </h4>
              <button type="button" className="btn-secondary" onClick={() => copy(f.text, f.label)} aria-describedby={`${ids}-${f.id}`}>
                Copy {f.label}
              </button>
              <a className="text-sm" href={f.href} download={f.fileName}>
                Download {f.label} ({f.fileName})
              </a>
            </div>
            <ScrollRegion label={`${f.label} (scrollable)`} className="rounded-md border border-line">
              <pre className="p-3 font-mono text-xs" data-testid={`cite-${f.id}`}>
                {f.text}
              </pre>
            </ScrollRegion>
          </div>
        ))}
      </div>

      {source && (
        <div className="space-y-1">
          <h3 className="font-semibold">Also cite the source publication</h3>
          <p className="text-sm text-muted">The numbers were first published there; cite it beside the dataset.</p>
          {source.hasReference ? (
            <div className="flex flex-wrap items-start gap-3">
              <p className="min-w-0 flex-1 break-words text-sm" data-testid="cite-source">
                {sourceText ??
                  (waiting
                    ? `Formatting the ${styleLabel} reference…`
                    : `The ${styleLabel} reference could not be loaded${source.doi ? ` (doi:${source.doi})` : ""}.`)}
              </p>
              <button
                type="button"
                className="btn-secondary"
                disabled={sourceText === null}
                onClick={() => sourceText !== null && copy(sourceText, "The source publication's reference")}
              >
                Copy source reference
              </button>
            </div>
          ) : (
            source.doi && (
              <p className="break-all text-sm" data-testid="cite-source">
                doi:{source.doi}
              </p>
            )
          )}
        </div>
      )}
      <p role="status" className="text-sm text-muted" data-testid="cite-status">
        {status}
      </p>
    </section>
  );
}
