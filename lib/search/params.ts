/**
 * The search's query string, both ways: URL (or API) parameters → a validated `SearchRequest`, and
 * a request → parameters (`toSearchParams`), so the page builds its links from the same rules.
 *
 * Parameters (all optional): q, view, sort, limit, cursor; the filters class, phase, method,
 * bathGas, licence, flag, creator (each repeated or comma-separated: any of the values); tMin, tMax
 * (K), tCovers (true/false), pMin, pMax (Pa), yearMin, yearMax. Empty values mean "not set" (a form
 * sends its blank fields). Any problem is reported with the parameter it is about. Enumerated
 * filters (class, phase, method, licence, flag) may be comma-separated; the free-text ones (bathGas,
 * creator) are repeated, since a name may hold a comma. Pure (the page builds links with it in the
 * browser): the cursor's signature is checked where the search runs (lib/search/index.ts).
 */
import { z } from "zod";
import { LICENCES, METHOD_CATEGORIES, PHASES, REACTION_CLASSES, RETIRED_REACTION_CLASS_IDS } from "@/lib/deposits/vocabulary";
import { AppError, type FieldError } from "@/lib/errors";
import { isStorableText } from "@/lib/storable-text";
import { SEARCH_FLAGS, SEARCH_SORTS, SEARCH_VIEWS, type SearchFilters, type SearchRequest } from "./types";

export const MAX_QUERY_LENGTH = 500;
export const DEFAULT_LIMIT = 20;
export const MAX_LIMIT = 100;
/** More values than this in one filter is not a search a person makes. */
const MAX_VALUES = 50;
const MAX_VALUE_LENGTH = 200;

/** Query parameter of each list filter (the page's facet boxes send these names). */
export const FILTER_PARAMETERS = {
  reactionClass: "class",
  phase: "phase",
  methodCategory: "method",
  bathGas: "bathGas",
  licence: "licence",
  flags: "flag",
  creator: "creator",
} as const satisfies Partial<Record<keyof SearchFilters, string>>;

type ListFilter = keyof typeof FILTER_PARAMETERS;

const NUMBER_PARAMETERS = ["tMin", "tMax", "pMin", "pMax", "yearMin", "yearMax"] as const;
export const SEARCH_PARAMETERS = [
  "q",
  "view",
  "sort",
  "limit",
  "cursor",
  "tCovers",
  ...NUMBER_PARAMETERS,
  ...Object.values(FILTER_PARAMETERS),
] as const;

export const EMPTY_FILTERS: SearchFilters = {
  reactionClass: [],
  phase: [],
  methodCategory: [],
  bathGas: [],
  licence: [],
  flags: [],
  creator: [],
  tMin: null,
  tMax: null,
  tCovers: false,
  pMin: null,
  pMax: null,
  yearMin: null,
  yearMax: null,
};

export const DEFAULT_REQUEST: SearchRequest = {
  q: "",
  view: "datasets",
  filters: EMPTY_FILTERS,
  sort: "relevance",
  cursor: null,
  limit: DEFAULT_LIMIT,
};

const ids = (list: readonly { id: string }[]) => list.map((x) => x.id);
const listOf = (values: readonly string[]) => values.map((v) => `“${v}”`).join(", ");

/** Allowed values of the enumerated filters (the deposit schema's lists); null = free text. */
const ALLOWED: Record<ListFilter, readonly string[] | null> = {
  // Retired class ids are accepted and read as the current ones (old links keep working).
  reactionClass: [...ids(REACTION_CLASSES), ...Object.keys(RETIRED_REACTION_CLASS_IDS)],
  phase: ids(PHASES),
  methodCategory: ids(METHOD_CATEGORIES),
  licence: ids(LICENCES),
  flags: SEARCH_FLAGS,
  bathGas: null,
  creator: null,
};

/** Each list filter's schema, built once (building a zod schema costs more than a search answer kept in memory). */
const listSchemas = new Map<ListFilter, ReturnType<typeof buildListSchema>>();
function listSchema(filter: ListFilter) {
  let schema = listSchemas.get(filter);
  if (!schema) listSchemas.set(filter, (schema = buildListSchema(filter)));
  return schema;
}

function buildListSchema(filter: ListFilter) {
  const parameter = FILTER_PARAMETERS[filter];
  const allowed = ALLOWED[filter];
  return (
    z
      .array(z.string())
      // Enumerated values may be comma-separated; free text (creator names hold commas) only repeated.
      .transform((raw) => [
        ...new Set(
          raw
            .flatMap((v) => (allowed ? v.split(",") : [v]))
            .map((v) => v.trim())
            .filter(Boolean),
        ),
      ])
      .pipe(
        z
          .array(
            allowed
              ? z.string().refine((v) => allowed.includes(v), {
                  error: (i) =>
                    `${parameter} “${String(i.input)}” is not one of ${listOf(allowed.filter((a) => !(a in RETIRED_REACTION_CLASS_IDS)))}`,
                })
              : z.string().max(MAX_VALUE_LENGTH, `each ${parameter} value may have at most ${MAX_VALUE_LENGTH} characters`),
          )
          .max(MAX_VALUES, `at most ${MAX_VALUES} ${parameter} values`),
      )
      .transform((values) => (filter === "reactionClass" ? [...new Set(values.map((v) => RETIRED_REACTION_CLASS_IDS[v] ?? v))] : values))
  );
}

// A plain decimal number as a person writes it: no hex, no "Infinity", no sign but "+".
const DECIMAL = /^\+?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

const numberSchema = (parameter: string, what: string, { whole = false } = {}) =>
  z
    .string()
    .trim()
    .refine(
      (t) => DECIMAL.test(t) && Number.isFinite(Number(t)),
      `${parameter} must be ${what}, a non-negative plain number such as ${whole ? "1998" : "300"}`,
    )
    .transform(Number)
    .refine((n) => !whole || Number.isInteger(n), `${parameter} must be a whole year`)
    .refine((n) => !whole || n <= 9999, `${parameter} must be a year no later than 9999`);

const single = {
  q: z
    .string()
    .transform((s) => s.trim())
    .pipe(z.string().max(MAX_QUERY_LENGTH, `q may have at most ${MAX_QUERY_LENGTH} characters`))
    .refine((s) => isStorableText(s), "q holds a character that cannot be searched (U+0000 or a lone surrogate)"),
  view: z.enum(SEARCH_VIEWS, { error: `view must be ${listOf(SEARCH_VIEWS)}` }),
  sort: z.enum(SEARCH_SORTS, { error: `sort must be ${listOf(SEARCH_SORTS)}` }),
  limit: z
    .string()
    .trim()
    .regex(/^\d{1,4}$/, `limit must be a whole number from 1 to ${MAX_LIMIT}`)
    .transform(Number)
    .refine((n) => n >= 1 && n <= MAX_LIMIT, `limit must be a whole number from 1 to ${MAX_LIMIT}`),
  cursor: z.string().trim().max(2000, "cursor is not one this service gave out"),
  tCovers: z.enum(["true", "false", "1", "0"], { error: "tCovers must be true or false" }).transform((v) => v === "true" || v === "1"),
  tMin: numberSchema("tMin", "a temperature in K"),
  tMax: numberSchema("tMax", "a temperature in K"),
  pMin: numberSchema("pMin", "a pressure in Pa"),
  pMax: numberSchema("pMax", "a pressure in Pa"),
  yearMin: numberSchema("yearMin", "a year", { whole: true }),
  yearMax: numberSchema("yearMax", "a year", { whole: true }),
} as const;

export type RawSearchParams = URLSearchParams | Record<string, string | string[] | undefined>;

function valuesOf(params: RawSearchParams): Map<string, string[]> {
  const out = new Map<string, string[]>();
  if (params instanceof URLSearchParams) {
    for (const [name, value] of params) out.set(name, [...(out.get(name) ?? []), value]);
  } else {
    for (const [name, value] of Object.entries(params)) if (value !== undefined) out.set(name, Array.isArray(value) ? value : [value]);
  }
  return out;
}

function problem(parameter: string, message: string, value?: string): FieldError {
  return { pointer: `/${parameter}`, parameter, message, ...(value !== undefined ? { value } : {}) };
}

export type SearchParamsResult = { ok: true; request: SearchRequest } | { ok: false; errors: FieldError[]; request: SearchRequest };

/**
 * Reads a search request from query parameters. With `strict` (the API), a parameter this search
 * does not know is an error too (a mistyped `tmin` must not be ignored silently); the page ignores
 * them. On failure, `request` holds every parameter that was valid (the page still shows them).
 */
/**
 * Every query parameter with the schema that reads one of its values (list filters: the values
 * of all its occurrences), as the API document describes them.
 */
export function searchParameterSchemas(): Record<string, z.ZodType> {
  const lists: Record<string, z.ZodType> = Object.fromEntries(
    (Object.keys(FILTER_PARAMETERS) as ListFilter[]).map((f) => [FILTER_PARAMETERS[f], listSchema(f)]),
  );
  return { ...single, ...lists };
}

export function parseSearchParams(params: RawSearchParams, { strict = false }: { strict?: boolean } = {}): SearchParamsResult {
  const errors: FieldError[] = [];
  const request: SearchRequest = { ...DEFAULT_REQUEST, filters: { ...EMPTY_FILTERS } };
  const filters = request.filters;
  const lists = new Map<ListFilter, string[]>();
  for (const [name, values] of valuesOf(params)) {
    const listFilter = (Object.keys(FILTER_PARAMETERS) as ListFilter[]).find((f) => FILTER_PARAMETERS[f] === name);
    if (listFilter) {
      lists.set(listFilter, values);
      continue;
    }
    // Own keys only: "constructor" or "__proto__" is an unknown parameter, not Object's.
    if (!Object.hasOwn(single, name)) {
      if (strict)
        errors.push(problem(name, `Unknown query parameter “${name}”: use ${SEARCH_PARAMETERS.join(", ")} (names are case-sensitive)`));
      continue;
    }
    if (values.length > 1) {
      errors.push(problem(name, `Give ${name} once (it appears ${values.length} times)`));
      continue;
    }
    const raw = values[0];
    if (raw.trim() === "") continue;
    const parsed = single[name as keyof typeof single].safeParse(raw);
    if (!parsed.success) {
      errors.push(problem(name, parsed.error.issues[0].message, raw.length > 200 ? `${raw.slice(0, 200)}…` : raw));
      continue;
    }
    const value = parsed.data;
    if (name === "q") request.q = value as string;
    else if (name === "view") request.view = value as SearchRequest["view"];
    else if (name === "sort") request.sort = value as SearchRequest["sort"];
    else if (name === "limit") request.limit = value as number;
    else if (name === "cursor") request.cursor = value as string;
    else if (name === "tCovers") filters.tCovers = value as boolean;
    else filters[name as (typeof NUMBER_PARAMETERS)[number]] = value as number;
  }
  for (const [filter, values] of lists) {
    const parsed = listSchema(filter).safeParse(values);
    if (parsed.success) (filters[filter] as string[]) = parsed.data;
    else for (const issue of parsed.error.issues) errors.push(problem(FILTER_PARAMETERS[filter], issue.message));
  }
  for (const [lo, hi, what] of [
    ["tMin", "tMax", "K"],
    ["pMin", "pMax", "Pa"],
    ["yearMin", "yearMax", ""],
  ] as const) {
    const a = filters[lo];
    const b = filters[hi];
    if (a !== null && b !== null && a > b)
      errors.push(problem(hi, `${hi} (${b}${what ? ` ${what}` : ""}) must not be below ${lo} (${a}${what ? ` ${what}` : ""})`, String(b)));
  }
  if (filters.tCovers && (filters.tMin === null || filters.tMax === null)) {
    errors.push(problem("tCovers", "tCovers needs both tMin and tMax: the window a dataset's range must cover"));
  }
  if (errors.length) return { ok: false, errors, request: { ...request, cursor: null } };
  return { ok: true, request };
}

/** The request, or a 400 problem naming every parameter at fault. */
export function parseSearchParamsOrThrow(params: RawSearchParams, options: { strict?: boolean } = {}): SearchRequest {
  const result = parseSearchParams(params, options);
  if (!result.ok) {
    const named = [...new Set(result.errors.map((e) => e.parameter))].join(", ");
    const title =
      result.errors.length === 1 ? result.errors[0].message : `${result.errors.length} query parameters are not valid (${named})`;
    throw new AppError("bad_request", title, result.errors);
  }
  return result.request;
}

/**
 * The request as query parameters, defaults left out (list filters comma-separated), so
 * `parseSearchParams(toSearchParams(r))` gives `r` back. `cursor: false` drops the cursor (links
 * that change the search start from the first page).
 */
export function toSearchParams(
  request: Partial<Omit<SearchRequest, "filters">> & { filters?: Partial<SearchFilters> },
  { cursor = true } = {},
): URLSearchParams {
  const out = new URLSearchParams();
  const f = { ...EMPTY_FILTERS, ...request.filters };
  if (request.q) out.set("q", request.q);
  if (request.view && request.view !== DEFAULT_REQUEST.view) out.set("view", request.view);
  if (request.sort && request.sort !== DEFAULT_REQUEST.sort) out.set("sort", request.sort);
  if (request.limit && request.limit !== DEFAULT_LIMIT) out.set("limit", String(request.limit));
  for (const filter of Object.keys(FILTER_PARAMETERS) as ListFilter[]) {
    const values = f[filter];
    if (ALLOWED[filter]) {
      if (values.length) out.set(FILTER_PARAMETERS[filter], values.join(","));
    } else for (const v of values) out.append(FILTER_PARAMETERS[filter], v);
  }
  for (const name of NUMBER_PARAMETERS) if (f[name] !== null) out.set(name, String(f[name]));
  if (f.tCovers) out.set("tCovers", "true");
  if (cursor && request.cursor) out.set("cursor", request.cursor);
  return out;
}
