"use client";

import Link from "next/link";
import { useId, useState, type FormEvent, type ReactNode } from "react";
import { FILTER_PARAMETERS, toSearchParams } from "@/lib/search/params";
import type { FacetCount, SearchFacet, SearchRequest } from "@/lib/search/types";
import {
  FACET_TITLES,
  facetValueLabel,
  facetValueTitle,
  LIST_FILTERS,
  withFacetValue,
  withYear,
  type ListFilter,
} from "@/components/search/search-words";
import { checkWindows, WINDOW_FIELDS, type WindowParameter } from "@/components/search/search-windows";

/** How many values of a facet are shown before "Show all". */
const SHOWN_VALUES = 8;

export const searchHref = (request: SearchRequest) => {
  const qs = toSearchParams(request).toString();
  return qs ? `/search?${qs}` : "/search";
};

/** Facets as checkbox groups with live counts (every checked value shown, even at zero). */
export function FacetGroups({
  request,
  facets,
  errors,
  onChange,
}: {
  request: SearchRequest;
  facets: Partial<Record<SearchFacet, FacetCount[]>> | undefined;
  errors: Map<string, string[]>;
  onChange: (next: SearchRequest) => void;
}) {
  return (
    <>
      {LIST_FILTERS.map((facet) => (
        <FacetGroup key={facet} facet={facet} request={request} counts={facets?.[facet] ?? []} errors={errors} onChange={onChange} />
      ))}
    </>
  );
}

function FacetGroup({
  facet,
  request,
  counts,
  errors,
  onChange,
}: {
  facet: ListFilter;
  request: SearchRequest;
  counts: FacetCount[];
  errors: Map<string, string[]>;
  onChange: (next: SearchRequest) => void;
}) {
  const id = useId();
  const [all, setAll] = useState(false);
  const checked = request.filters[facet] as string[];
  const rows = [...counts];
  for (const value of checked) if (!rows.some((r) => r.value === value)) rows.push({ value, count: 0 });
  const problems = errors.get(FILTER_PARAMETERS[facet]) ?? [];
  if (rows.length === 0 && problems.length === 0) return null;
  // Checked values stay visible when the list is cut short.
  const shown = all ? rows : rows.filter((r, i) => i < SHOWN_VALUES || checked.includes(r.value));
  return (
    <fieldset className="space-y-1" aria-describedby={problems.length ? `${id}-error` : undefined}>
      <legend className="mb-1 text-sm font-semibold">{FACET_TITLES[facet]}</legend>
      {problems.length > 0 && (
        <p id={`${id}-error`} className="text-sm text-error">
          {problems.join(" ")}
        </p>
      )}
      <ul className="space-y-1 text-sm">
        {shown.map((r) => {
          const on = checked.includes(r.value);
          const inputId = `${id}-${r.value}`;
          return (
            <li key={r.value} className="flex items-start gap-2">
              <input
                id={inputId}
                type="checkbox"
                className="mt-1 size-4 accent-accent"
                checked={on}
                onChange={(e) => onChange(withFacetValue(request, facet, r.value, e.target.checked))}
              />
              <label htmlFor={inputId} className="min-w-0 break-words" title={facetValueTitle(facet, r.value)}>
                {facetValueLabel(facet, r.value)} <span className="text-muted">({r.count})</span>
              </label>
            </li>
          );
        })}
      </ul>
      {rows.length > SHOWN_VALUES && (
        <button type="button" className="text-sm text-link underline" aria-expanded={all} onClick={() => setAll((a) => !a)}>
          {all ? "Show fewer" : `Show all ${rows.length}`}
        </button>
      )}
    </fieldset>
  );
}

/** The source years with their counts; each narrows the year range to that year. */
export function YearCounts({ request, counts }: { request: SearchRequest; counts: FacetCount[] | undefined }) {
  if (!counts || counts.length === 0) return null;
  const sorted = [...counts].sort((a, b) => Number(b.value) - Number(a.value));
  return (
    <div className="space-y-1">
      <p className="text-xs text-muted" id="year-counts-label">
        Datasets by year of the source publication (choose one to narrow to it):
      </p>
      <ul aria-labelledby="year-counts-label" className="flex flex-wrap gap-x-3 gap-y-1 text-sm">
        {sorted.map((c) => (
          <li key={c.value}>
            <Link href={searchHref(withYear(request, Number(c.value)))} scroll={false}>
              {c.value}
            </Link>{" "}
            <span className="text-muted">({c.count})</span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/**
 * Temperature, pressure and year windows: one form, applied together. Values are kept as typed
 * (a value the search refuses comes back beside its field); a minimum above its maximum is said
 * here before anything is sent.
 */
export function WindowsForm({
  raw,
  errors,
  onApply,
}: {
  /** The URL's own values of each window parameter (as typed, even when refused). */
  raw: Record<WindowParameter | "tCovers", string>;
  errors: Map<string, string[]>;
  onApply: (values: Record<WindowParameter, string>, covers: boolean) => void;
}) {
  const [local, setLocal] = useState<Map<string, string[]>>(new Map());
  const covers = raw.tCovers === "true" || raw.tCovers === "1";
  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    const values = Object.fromEntries(WINDOW_FIELDS.map((f) => [f.name, String(data.get(f.name) ?? "").trim()])) as Record<
      WindowParameter,
      string
    >;
    const wantCovers = data.get("tCovers") === "true";
    const problems = checkWindows(values, wantCovers);
    setLocal(problems);
    if (problems.size === 0) onApply(values, wantCovers);
  }
  const messagesOf = (name: string) => local.get(name) ?? errors.get(name) ?? [];
  const field = (name: WindowParameter) => {
    const f = WINDOW_FIELDS.find((x) => x.name === name)!;
    const messages = messagesOf(name);
    return (
      <div className="min-w-0 flex-1 space-y-1">
        <label htmlFor={`window-${name}`} className="block text-xs font-medium">
          {f.label}
        </label>
        <input
          id={`window-${name}`}
          name={name}
          type="text"
          inputMode={f.whole ? "numeric" : "decimal"}
          autoComplete="off"
          defaultValue={raw[name]}
          aria-invalid={messages.length ? true : undefined}
          aria-describedby={messages.length ? `window-${name}-error` : undefined}
          className="field-input py-1.5"
        />
        {messages.length > 0 && (
          <p id={`window-${name}-error`} className="text-xs text-error">
            {messages.join(" ")}
          </p>
        )}
      </div>
    );
  };
  const pair = (legend: string, lo: WindowParameter, hi: WindowParameter, extra?: ReactNode) => (
    <fieldset className="space-y-2">
      <legend className="mb-1 text-sm font-semibold">{legend}</legend>
      <div className="flex gap-2">
        {field(lo)}
        {field(hi)}
      </div>
      {extra}
    </fieldset>
  );
  const coversMessages = messagesOf("tCovers");
  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label="Temperature, pressure and year">
      {pair(
        "Temperature window (K)",
        "tMin",
        "tMax",
        <div
          role="radiogroup"
          aria-label="How the measured range meets the window"
          aria-describedby={coversMessages.length ? "window-tCovers-error" : undefined}
          className="space-y-1 text-sm"
        >
          <label className="flex items-start gap-2">
            <input type="radio" name="tCovers" value="false" defaultChecked={!covers} className="mt-1 accent-accent" />
            <span>Measured somewhere in the window</span>
          </label>
          <label className="flex items-start gap-2">
            <input type="radio" name="tCovers" value="true" defaultChecked={covers} className="mt-1 accent-accent" />
            <span>Measured over the whole window</span>
          </label>
          {coversMessages.length > 0 && (
            <p id="window-tCovers-error" className="text-xs text-error">
              {coversMessages.join(" ")}
            </p>
          )}
        </div>,
      )}
      {pair("Pressure window (Pa)", "pMin", "pMax")}
      {pair("Year of the source publication", "yearMin", "yearMax")}
      <button type="submit" className="btn-secondary w-full">
        Apply these windows
      </button>
    </form>
  );
}
