"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useId, useMemo, useOptimistic, useState, useTransition, type FormEvent } from "react";
import { DatasetRows, ReactionRows, type Collecting } from "@/components/search/search-results";
import { errorsByParameter, fetchSearch, searchKey, SearchProblem, type SearchAnswer } from "@/components/search/search-answer";
import { WINDOW_FIELDS, type WindowParameter } from "@/components/search/search-windows";
import { activeFilters, SORT_LABELS, VIEW_LABELS, withFilters } from "@/components/search/search-words";
import { SearchExport } from "@/components/search/search-export";
import { EMPTY_FILTERS, FILTER_PARAMETERS, MAX_QUERY_LENGTH, parseSearchParams, toSearchParams } from "@/lib/search/params";
import { SEARCH_SORTS, SEARCH_VIEWS, type DatasetHit, type ReactionHit, type SearchRequest } from "@/lib/search/types";
import { FacetGroups, searchHref, WindowsForm, YearCounts } from "./search-filters";

/**
 * The search page's interactive part. The URL is the whole state: every change pushes a new URL
 * (so the back button steps through searches), and the results are the API's answer for the
 * normalised request in that URL (react-query, keyed by it). `initial` is the server's answer for
 * the first URL, so the first paint already has the results.
 */
export function SearchClient({
  initial,
  collecting,
}: {
  initial: { key: string; answer: SearchAnswer } | null;
  /** The reader's draft collections, when signed in: the dataset rows can then be chosen and added to one. */
  collecting: Collecting | null;
}) {
  const params = useSearchParams();
  const router = useRouter();
  const parsedUrl = useMemo(() => parseSearchParams(params), [params]);
  const request = parsedUrl.request;
  const key = useMemo(() => searchKey(params), [params]);
  const [filtersOpen, setFiltersOpen] = useState(false);
  const filtersId = useId();

  const query = useQuery<SearchAnswer, SearchProblem>({
    queryKey: ["search", key],
    queryFn: ({ signal }) => fetchSearch(key, signal),
    initialData: initial && initial.key === key ? initial.answer : undefined,
    placeholderData: keepPreviousData,
    retry: (count, error) => error.status >= 500 && count < 1,
    refetchOnWindowFocus: false,
  });

  const refused = query.error?.status === 400 ? query.error : null;
  // Until the search answers, the page's own reading of the URL names the same problems.
  const fieldErrors = errorsByParameter(refused?.errors ?? (parsedUrl.ok ? [] : parsedUrl.errors));
  const answer = query.isError ? undefined : query.data;
  const settled = answer !== undefined && !query.isPlaceholderData;

  // A checkbox or the order shows its new state at once, while the URL (and so the search) follows.
  const [, startTransition] = useTransition();
  const [shown, setShown] = useOptimistic(request);
  const go = (next: SearchRequest) =>
    startTransition(() => {
      setShown(next);
      router.push(searchHref(next), { scroll: false });
    });

  const raw = Object.fromEntries([...WINDOW_FIELDS.map((f) => f.name), "tCovers"].map((n) => [n, params.get(n) ?? ""])) as Record<
    WindowParameter | "tCovers",
    string
  >;
  function applyWindows(values: Record<WindowParameter, string>, covers: boolean) {
    // Values go into the URL as typed, so a value the search refuses stays in its field with the reason.
    const next = toSearchParams(
      withFilters(request, { tMin: null, tMax: null, tCovers: false, pMin: null, pMax: null, yearMin: null, yearMax: null }),
    );
    for (const f of WINDOW_FIELDS) if (values[f.name]) next.set(f.name, values[f.name]);
    if (covers) next.set("tCovers", "true");
    router.push(`/search?${next.toString()}`, { scroll: false });
  }

  const active = activeFilters(request);
  const windowProblems = WINDOW_FIELDS.some((f) => fieldErrors.has(f.name)) || fieldErrors.has("tCovers");

  return (
    <div className="space-y-6">
      <QueryForm text={params.get("q") ?? ""} errors={fieldErrors.get("q") ?? []} onSearch={(q) => go({ ...request, q, cursor: null })} />

      <div className="flex flex-wrap items-end justify-between gap-3">
        <nav aria-label="Show results as" className="flex rounded-md border border-line bg-panel p-0.5 text-sm">
          {SEARCH_VIEWS.map((view) => (
            <Link
              key={view}
              href={searchHref({ ...request, view, cursor: null })}
              scroll={false}
              aria-current={request.view === view ? "page" : undefined}
              className={`rounded-sm px-3 py-1.5 no-underline hover:no-underline ${request.view === view ? "bg-accent font-medium text-white" : "text-ink hover:bg-paper"}`}
            >
              {VIEW_LABELS[view]}
            </Link>
          ))}
        </nav>
        <div className="flex items-center gap-2 text-sm">
          <label htmlFor="search-sort">Order</label>
          <select
            id="search-sort"
            className="field-input w-auto py-1.5"
            value={shown.sort}
            onChange={(e) => go({ ...request, sort: e.target.value as SearchRequest["sort"], cursor: null })}
          >
            {SEARCH_SORTS.map((s) => (
              <option key={s} value={s}>
                {SORT_LABELS[s]}
              </option>
            ))}
          </select>
        </div>
      </div>

      {answer && (
        <p className="text-sm" data-testid="understood">
          <span className="text-muted">Searched for: </span>
          {answer.parsed}
        </p>
      )}

      {active.length > 0 && (
        <div className="flex flex-wrap items-center gap-2 text-sm">
          <span className="text-muted">Narrowed to:</span>
          <ul className="flex flex-wrap gap-2" aria-label="Filters in force">
            {active.map((f) => (
              <li key={f.key}>
                <Link
                  href={searchHref(f.without)}
                  scroll={false}
                  className="inline-flex items-center gap-1 rounded-full border border-line bg-panel px-2.5 py-0.5 text-ink no-underline hover:bg-paper hover:no-underline"
                >
                  {f.words}
                  <span aria-hidden="true">✕</span>
                  <span className="sr-only">(remove)</span>
                </Link>
              </li>
            ))}
          </ul>
          <Link href={searchHref({ ...request, filters: EMPTY_FILTERS, cursor: null })} scroll={false}>
            Remove every filter
          </Link>
        </div>
      )}

      <div className="grid gap-6 lg:grid-cols-[16rem_minmax(0,1fr)]">
        <aside aria-label="Narrow the results" className="space-y-3">
          <button
            type="button"
            className="btn-secondary w-full lg:hidden"
            aria-expanded={filtersOpen || windowProblems}
            aria-controls={filtersId}
            onClick={() => setFiltersOpen((o) => !o)}
          >
            {filtersOpen || windowProblems ? "Hide filters" : `Show filters${active.length ? ` (${active.length} in force)` : ""}`}
          </button>
          <div id={filtersId} className={`${filtersOpen || windowProblems ? "block" : "hidden"} card space-y-5 p-4 lg:block`}>
            <FacetGroups request={shown} facets={answer?.facets} errors={fieldErrors} onChange={go} />
            <YearCounts request={request} counts={answer?.facets.sourceYear} />
            <WindowsForm key={key} raw={raw} errors={fieldErrors} onApply={applyWindows} />
          </div>
        </aside>

        <section aria-labelledby="results-heading" aria-busy={query.isFetching} className="min-w-0 space-y-3">
          <h2 id="results-heading" className="text-xl font-semibold">
            Results
          </h2>
          <p role="status" className="text-sm text-muted">
            {statusWords(query.isFetching, answer, request, refused)}
          </p>
          <Results
            request={request}
            answer={answer}
            settled={settled}
            error={query.error}
            onRetry={() => void query.refetch()}
            collecting={collecting}
          />
          {!refused && <SearchExport request={request} total={answer?.total ?? null} />}
        </section>
      </div>
    </div>
  );
}

/** Parameters whose problems are shown beside their own field. */
const FIELD_PARAMETERS: string[] = ["q", "tCovers", ...WINDOW_FIELDS.map((f) => f.name), ...Object.values(FILTER_PARAMETERS)];

function statusWords(fetching: boolean, answer: SearchAnswer | undefined, request: SearchRequest, refused: SearchProblem | null): string {
  if (refused) return "The search was not run: a value needs correcting (see the message beside it).";
  if (fetching && !answer) return "Searching…";
  if (!answer) return "";
  const noun = request.view === "reactions" ? (answer.total === 1 ? "reaction" : "reactions") : answer.total === 1 ? "dataset" : "datasets";
  const found = `${answer.total.toLocaleString("en")} ${noun} found`;
  return fetching ? `${found}; updating…` : found;
}

function QueryForm({ text, errors, onSearch }: { text: string; errors: string[]; onSearch: (q: string) => void }) {
  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    onSearch(String(new FormData(e.currentTarget).get("q") ?? "").trim());
  }
  return (
    <form role="search" onSubmit={submit} className="space-y-1" aria-label="Search published datasets">
      <label htmlFor="search-q" className="block text-sm font-medium">
        Species, reaction, author or any words
      </label>
      <div className="flex gap-2">
        <input
          key={text}
          id="search-q"
          name="q"
          type="search"
          defaultValue={text}
          maxLength={MAX_QUERY_LENGTH}
          autoComplete="off"
          aria-invalid={errors.length ? true : undefined}
          aria-describedby={`search-q-hint${errors.length ? " search-q-error" : ""}`}
          className="field-input"
        />
        <button type="submit" className="btn-primary">
          Search
        </button>
      </div>
      <p id="search-q-hint" className="text-xs text-muted">
        For example <code>methane</code>, <code>CH4</code>, a SMILES such as <code>C</code>, an InChIKey, <code>OH + CH4</code>,{" "}
        <code>OH + *</code> or <code>CH4 -&gt; CH3</code>.
      </p>
      {errors.length > 0 && (
        <p id="search-q-error" className="text-sm text-error">
          {errors.join(" ")}
        </p>
      )}
    </form>
  );
}

function Results({
  request,
  answer,
  settled,
  error,
  onRetry,
  collecting,
}: {
  request: SearchRequest;
  answer: SearchAnswer | undefined;
  settled: boolean;
  error: SearchProblem | null;
  onRetry: () => void;
  collecting: Collecting | null;
}) {
  if (error) {
    if (error.status === 400) {
      const other = error.errors.filter((e) => !FIELD_PARAMETERS.includes(e.parameter ?? ""));
      return (
        <div className="card space-y-2 border-error/40 text-sm">
          <p className="font-medium text-error">{error.message}</p>
          {other.map((e, i) => (
            <p key={i}>{e.message}</p>
          ))}
          {other.some((e) => e.parameter === "cursor") && (
            <p>
              <Link href={searchHref({ ...request, cursor: null })}>Start again from the first results</Link>
            </p>
          )}
        </div>
      );
    }
    return (
      <div className="card space-y-3 border-error/40 text-sm" role="alert">
        <p className="font-medium text-error">The search could not be run. {error.message}</p>
        <button type="button" className="btn-secondary" onClick={onRetry}>
          Try again
        </button>
      </div>
    );
  }
  if (!answer) {
    return (
      <div aria-hidden="true" className="card space-y-3 p-4">
        {Array.from({ length: 4 }, (_, i) => (
          <div key={i} className="h-14 animate-pulse rounded-sm bg-paper" />
        ))}
      </div>
    );
  }
  if (answer.total === 0 || answer.hits.length === 0) return <NothingFound request={request} answer={answer} />;
  return (
    <div className={`space-y-3 transition-opacity ${settled ? "" : "opacity-60"}`}>
      {request.view === "reactions" ? (
        <ReactionRows hits={answer.hits as ReactionHit[]} />
      ) : (
        <DatasetRows hits={answer.hits as DatasetHit[]} collecting={collecting} />
      )}
      <nav aria-label="More results" className="flex flex-wrap items-center justify-between gap-3 text-sm">
        {request.cursor ? <Link href={searchHref({ ...request, cursor: null })}>First results</Link> : <span />}
        {answer.nextCursor && (
          <Link href={searchHref({ ...request, cursor: answer.nextCursor })} className="btn-secondary no-underline hover:no-underline">
            Next {request.limit} results
          </Link>
        )}
      </nav>
    </div>
  );
}

/** Nothing matched: say what was searched, and offer each way to widen. */
function NothingFound({ request, answer }: { request: SearchRequest; answer: SearchAnswer }) {
  const active = activeFilters(request);
  const noun = request.view === "reactions" ? "reactions" : "published datasets";
  return (
    <div className="card space-y-3 text-sm">
      <p className="font-medium">
        No {noun} match. {answer.parsed}
        {active.length > 0 ? `; ${active.map((f) => f.words).join("; ")}` : ""}.
      </p>
      {(active.length > 0 || request.q) && (
        <>
          <p>Widen the search:</p>
          <ul className="list-disc space-y-1 pl-5">
            {active.map((f) => (
              <li key={f.key}>
                <Link href={searchHref(f.without)} scroll={false}>
                  Without “{f.words}”
                </Link>
              </li>
            ))}
            {active.length > 1 && (
              <li>
                <Link href={searchHref({ ...request, filters: EMPTY_FILTERS, cursor: null })} scroll={false}>
                  Without any filter
                </Link>
              </li>
            )}
            {request.q && (
              <li>
                <Link href={searchHref({ ...request, q: "", cursor: null })} scroll={false}>
                  Every published dataset{active.length ? " with these filters" : ""}
                </Link>
              </li>
            )}
          </ul>
        </>
      )}
    </div>
  );
}
