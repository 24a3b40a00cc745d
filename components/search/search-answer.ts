/**
 * The answer of GET /api/v1/search as the page reads it, and the one fetch of it (react-query's
 * query function). The query key is the normalised request (`searchKey`), so two URLs that mean
 * the same search share one cache entry.
 */
import type { FieldError } from "@/lib/errors";
import { parseSearchParams, SEARCH_PARAMETERS, toSearchParams } from "@/lib/search/params";
import type { SearchAnswer } from "@/lib/search/types";

export type { SearchAnswer };

/** A refused or failed search: the status, the problem's title, and the parameters at fault. */
export class SearchProblem extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly errors: FieldError[] = [],
  ) {
    super(message);
    this.name = "SearchProblem";
  }
}

/**
 * The query string sent to the API for the URL's parameters: the normalised request when it is
 * valid (parameters in one order, defaults left out), else the URL's own search parameters as
 * given, so that the API names what is wrong. Parameters the search does not know (a campaign tag)
 * are left out either way: the page ignores them, the API would refuse them.
 */
export function searchKey(params: URLSearchParams): string {
  const parsed = parseSearchParams(params);
  if (parsed.ok) return toSearchParams(parsed.request).toString();
  const known = new URLSearchParams();
  for (const [name, value] of params) if ((SEARCH_PARAMETERS as readonly string[]).includes(name)) known.append(name, value);
  return known.toString();
}

export async function fetchSearch(key: string, signal?: AbortSignal): Promise<SearchAnswer> {
  let res: Response;
  try {
    res = await fetch(`/api/v1/search${key ? `?${key}` : ""}`, { signal, headers: { accept: "application/json" } });
  } catch (err) {
    if (signal?.aborted) throw err;
    throw new SearchProblem(0, "The search service could not be reached. Check the connection and try again.");
  }
  const body = (await res.json().catch(() => null)) as (Partial<SearchAnswer> & { title?: string; errors?: FieldError[] }) | null;
  if (!res.ok || !body) {
    throw new SearchProblem(res.status, body?.title ?? `The search answered with status ${res.status}.`, body?.errors ?? []);
  }
  return body as SearchAnswer;
}

/** Messages by parameter name ("tMin" → ["tMin must be …"]). */
export function errorsByParameter(errors: FieldError[]): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const e of errors) {
    const name = e.parameter ?? "";
    out.set(name, [...(out.get(name) ?? []), e.message]);
  }
  return out;
}
