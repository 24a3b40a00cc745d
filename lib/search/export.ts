import "server-only";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { csvCell } from "@/lib/analyses/fit-export";
import { appUrl } from "@/lib/config";
import { csvCommentLine, textCell } from "@/lib/datasets/point-export";
import { versionPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";
import { hitInFileUnits } from "./hit-units";
import { currentSearchEngine } from "./index";
import { toSearchParams } from "./params";
import { displayEquations } from "./lexicon";
import { resolveQuery } from "./resolve-query";
import type { DatasetHit, ParsedQuery, ReactionHit, SearchEngine, SearchRequest } from "./types";

/**
 * A whole search result as a download that streams: the engine is walked with its keyset positions
 * one batch at a time, and each batch is written to the response as soon as it is read, only when
 * the reader asks for more (a ReadableStream's pull, one chunk ahead): nothing holds the whole
 * result, so 100 000 rows take the memory of one batch. CSV (a `#` header block, one row per hit,
 * formula-safe, optional UTF-8 byte order mark), JSON lines (an "about" line, then one hit per line)
 * or one JSON document ({"about": …, "hits": [ … ]}, written piece by piece).
 */

export type SearchExportFormat = "csv" | "jsonl" | "json";

/** Hits read from the engine per step. */
export const SEARCH_EXPORT_BATCH = 1000;

export const SEARCH_EXPORT_MEDIA_TYPES: Record<SearchExportFormat, string> = {
  csv: "text/csv; charset=utf-8; header=present",
  jsonl: "application/jsonl; charset=utf-8",
  json: "application/json; charset=utf-8",
};

type Row = Record<string, string | number | boolean | null | string[]>;

/** A datasets-view hit as an export row (canonical units named in the column). */
function datasetRow(h: DatasetHit, origin: string): Row {
  return {
    version_identifier: h.versionIdentifier,
    page: `${origin}${versionPath(h.datasetId, h.versionNumber)}`,
    title: h.title,
    equation: h.equation,
    reaction_key: h.reactionKey,
    reaction_class: h.reactionClass,
    method: h.methodCategory,
    T_min_K: h.tMin,
    T_max_K: h.tMax,
    points: h.pointCount,
    // The straight-line (two-parameter) Arrhenius re-fit, whatever the dataset's preferred model:
    // a dataset flagged curved says so in `flags`.
    "arrhenius_Ea_J_mol-1": h.ea,
    arrhenius_A: h.a,
    arrhenius_A_unit: h.aUnit,
    flags: h.flags,
    creators: h.creators,
    published_at: h.publishedAt,
    retracted: h.retracted,
  };
}

/** A reactions-view hit as an export row. */
function reactionRow(h: ReactionHit, origin: string): Row {
  const c = h.consensus;
  return {
    reaction_key: h.reactionKey,
    page: `${origin}${reactionPath(h.reactionKey)}`,
    equation: h.equation,
    datasets: h.datasetCount,
    retracted_datasets: h.retractedCount,
    T_min_K: h.tMin,
    T_max_K: h.tMax,
    consensus_model: c?.model ?? null,
    consensus_A: c?.a ?? null,
    consensus_n: c?.n ?? null,
    "consensus_Ea_J_mol-1": c?.ea ?? null,
    consensus_A_unit: c?.aUnit ?? null,
    consensus_T_min_K: c?.tMin ?? null,
    consensus_T_max_K: c?.tMax ?? null,
    spread_factor: h.spread,
  };
}

// The column names, in order, from the row builders themselves (one definition of a row).
const DATASET_COLUMNS = Object.keys(datasetRow({ datasetId: 1, versionNumber: 1 } as DatasetHit, ""));
const REACTION_COLUMNS = Object.keys(reactionRow({ reactionKey: "" } as ReactionHit, ""));

/** One CSV line: numbers as JavaScript writes them, text formula-safe, lists joined by "; ". */
function csvLine(row: Row, columns: string[]): string {
  return columns
    .map((c) => {
      const v = row[c];
      if (typeof v === "number" || v === null) return csvCell(v);
      if (typeof v === "boolean") return v ? "yes" : "";
      return textCell(Array.isArray(v) ? v.join("; ") : v);
    })
    .join(",");
}

/** The units of the export's numbers, in the files' ASCII spelling (lib/unit-labels.ts unitText). */
const EXPORT_UNITS = { T: "K", Ea: "J mol-1", A: "the unit in A_unit (the canonical unit of the reaction's order)" };

/** The CSV header's units line: plain text like every other header line. */
const EXPORT_UNITS_LINE = `T in ${EXPORT_UNITS.T}; Ea in ${EXPORT_UNITS.Ea}; A in ${EXPORT_UNITS.A}: s-1, cm3 molecule-1 s-1 or cm6 molecule-2 s-1`;

/** What the file says about itself: the search, when, the caution, where licences and citations are. */
function aboutOf(request: SearchRequest, words: string, origin: string) {
  const query = toSearchParams({ ...request, cursor: null, limit: undefined }, { cursor: false }).toString();
  return {
    search: `${origin}/search${query ? `?${query}` : ""}`,
    understood: words,
    view: request.view,
    exportedAt: new Date().toISOString(),
    units: EXPORT_UNITS,
    consensus:
      request.view === "reactions" ? "A (T/T0)^n exp(-Ea/(R T)) with T0 = 298.15 K, over the reaction's published datasets" : undefined,
    licences: "each dataset under its own licence, named on its page",
    cite: "cite each dataset by its version identifier (its page gives the citation)",
    caution: CAUTION,
  };
}

export interface SearchExportOptions {
  format: SearchExportFormat;
  bom?: boolean;
  /** The engine walked (the configured one unless a test brings its own). */
  engine?: SearchEngine;
  batch?: number;
  /** Called after each batch is written: rows so far (tests and logs). */
  onBatch?: (rows: number) => void;
}

/**
 * The whole result of `request` (its cursor and limit are not used) as a byte stream. The search text
 * is resolved and the first batch read before the stream is returned, so a bad query (a 400 naming
 * `q`) or a database out of reach (a 503 with Retry-After) is still an ordinary problem response.
 * Each later pull reads one batch and enqueues its text; the stream holds at most one chunk that the
 * reader has not taken (highWaterMark 1), so a slow reader slows the walk instead of filling memory.
 * A batch that fails once bytes have gone out errors the stream, so the connection is cut and the
 * download is visibly incomplete (never a file that merely stops, never a connection left open).
 */
export async function searchExportStream(request: SearchRequest, options: SearchExportOptions): Promise<ReadableStream<Uint8Array>> {
  const { format, bom = false, batch = SEARCH_EXPORT_BATCH, onBatch } = options;
  const engine = options.engine ?? currentSearchEngine();
  const origin = appUrl();
  const encoder = new TextEncoder();
  const columns = request.view === "reactions" ? REACTION_COLUMNS : DATASET_COLUMNS;
  const resolved = await resolveQuery(request.q);
  const parsed: ParsedQuery = resolved.parsed;
  let after: string | null = null;
  let rows = 0;

  const rowsText = (list: Row[]) => {
    if (format === "csv") return list.map((r) => `${csvLine(r, columns)}\r\n`).join("");
    if (format === "jsonl") return list.map((r) => `${JSON.stringify(r)}\n`).join("");
    return list.map((r, i) => `${rows + i === 0 ? "\n" : ",\n"}${JSON.stringify(r)}`).join("");
  };

  /** The next batch as text (the closing of a JSON document after the last); `last` when the walk is done. */
  const nextBatch = async (): Promise<{ text: string; last: boolean }> => {
    const page = await engine.search({ parsed, view: request.view, filters: request.filters, sort: request.sort, after, limit: batch });
    let list: Row[];
    if (page.view === "reactions") list = (page.hits as ReactionHit[]).map((h) => reactionRow(hitInFileUnits(h), origin));
    else {
      // Rows name species as every public page does, whatever the engine stored.
      const hits = page.hits as DatasetHit[];
      const equations = await displayEquations([...new Set(hits.map((h) => h.reactionKey))]);
      list = hits.map((h) => datasetRow(hitInFileUnits({ ...h, equation: equations.get(h.reactionKey) ?? h.equation }), origin));
    }
    const text = rowsText(list);
    rows += list.length;
    after = page.nextAfter;
    const last = after === null || list.length === 0;
    onBatch?.(rows);
    return { text: last && format === "json" ? `${text}${rows ? "\n" : ""}]}\n` : text, last };
  };

  const about = aboutOf(request, resolved.words, origin);
  const head =
    format === "csv"
      ? [
          ...Object.entries(about)
            .filter(([, v]) => v !== undefined)
            .map(([label, v]) => csvCommentLine(label, label === "units" ? EXPORT_UNITS_LINE : String(v))),
          columns.join(","),
        ].join("\r\n") + "\r\n"
      : format === "jsonl"
        ? `${JSON.stringify({ about })}\n`
        : `{"about":${JSON.stringify(about)},"hits":[`;
  // Read before anything is answered: an error here is still a problem response.
  const first = await nextBatch();
  let done = first.last;
  // Encoded now, so no closure of the stream keeps the first batch's text.
  let opening: Uint8Array | null = encoder.encode(`${bom ? "\uFEFF" : ""}${head}${first.text}`);

  return new ReadableStream<Uint8Array>(
    {
      start(controller) {
        controller.enqueue(opening!);
        opening = null;
        if (done) controller.close();
      },
      async pull(controller) {
        if (done) return;
        try {
          const { text, last } = await nextBatch();
          controller.enqueue(encoder.encode(text));
          if (last) {
            done = true;
            controller.close();
          }
        } catch (err) {
          done = true;
          console.warn(`[search export] stopped after ${rows} rows:`, (err as Error)?.message ?? err);
          controller.error(err);
        }
      },
    },
    { highWaterMark: 1 },
  );
}

/** The download's file name: "search-<date>.<ext>". */
export const searchExportFileName = (format: SearchExportFormat) =>
  `arrhenia-search-${new Date().toISOString().slice(0, 10)}.${format === "jsonl" ? "jsonl" : format}`;
