"use client";

import { useId, useRef, useState } from "react";
import { toSearchParams } from "@/lib/search/params";
import type { SearchRequest } from "@/lib/search/types";

type Format = "csv" | "jsonl" | "json";

const FORMAT_WORDS: Record<Format, string> = { csv: "CSV", jsonl: "JSON lines", json: "JSON" };

type Progress =
  | { state: "idle" }
  | { state: "running"; bytes: number; rows: number }
  | { state: "done"; bytes: number; rows: number; name: string }
  | { state: "failed"; message: string }
  | { state: "stopped" };

/** "1.4 MB" */
const megabytes = (bytes: number) => `${(bytes / 1e6).toLocaleString("en", { maximumFractionDigits: 1 })} MB`;

/** The file name the server gave (Content-Disposition), else a plain one. */
function fileNameOf(res: Response, format: Format): string {
  const match = /filename="([^"]+)"/.exec(res.headers.get("content-disposition") ?? "");
  return match?.[1] ?? `arrhenia-search.${format}`;
}

/**
 * "Export": the whole result of the search in view (every page, not only the one shown) from
 * GET /api/v1/search/export, read through the response's stream reader so the page can say how many
 * bytes and rows have arrived (against the total the search reported), then saved as a file.
 */
export function SearchExport({ request, total }: { request: SearchRequest; total: number | null }) {
  const id = useId();
  const [format, setFormat] = useState<Format>("csv");
  const [bom, setBom] = useState(false);
  const [progress, setProgress] = useState<Progress>({ state: "idle" });
  const abort = useRef<AbortController | null>(null);

  async function run() {
    const controller = new AbortController();
    abort.current = controller;
    const q = toSearchParams({ ...request, cursor: null, limit: undefined }, { cursor: false });
    q.set("format", format);
    if (format === "csv" && bom) q.set("bom", "1");
    setProgress({ state: "running", bytes: 0, rows: 0 });
    try {
      const res = await fetch(`/api/v1/search/export?${q.toString()}`, { signal: controller.signal });
      if (!res.ok || !res.body) {
        const problem = await res.json().catch(() => null);
        setProgress({ state: "failed", message: problem?.title ?? `The export failed (HTTP ${res.status}).` });
        return;
      }
      const reader = res.body.getReader();
      const parts: BlobPart[] = [];
      let bytes = 0;
      const lines = lineCounter();
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        parts.push(value);
        bytes += value.byteLength;
        lines.add(value);
        setProgress({ state: "running", bytes, rows: lines.rows() });
      }
      const name = fileNameOf(res, format);
      const url = URL.createObjectURL(new Blob(parts, { type: res.headers.get("content-type") ?? "application/octet-stream" }));
      const a = document.createElement("a");
      a.href = url;
      a.download = name;
      a.click();
      setTimeout(() => URL.revokeObjectURL(url), 60_000);
      setProgress({ state: "done", bytes, rows: lines.rows(), name });
    } catch (e) {
      if (controller.signal.aborted) setProgress({ state: "stopped" });
      else setProgress({ state: "failed", message: e instanceof Error ? e.message : "The export failed." });
    } finally {
      abort.current = null;
    }
  }

  const running = progress.state === "running";
  const of = total !== null ? ` of ${total.toLocaleString("en")}` : "";
  return (
    <details className="card space-y-3 text-sm" data-testid="search-export">
      <summary className="cursor-pointer font-medium">Export every result</summary>
      <p>
        Every {request.view === "reactions" ? "reaction" : "dataset"} this search finds
        {total !== null ? ` (${total.toLocaleString("en")})` : ""}, not only this page, with the caution and where to find each licence and
        citation.
      </p>
      <div className="flex flex-wrap items-end gap-4">
        <label className="space-y-1" htmlFor={`${id}-format`}>
          <span className="block font-medium">Format</span>
          <select
            id={`${id}-format`}
            className="field-input"
            value={format}
            onChange={(e) => setFormat(e.target.value as Format)}
            disabled={running}
          >
            {(Object.keys(FORMAT_WORDS) as Format[]).map((f) => (
              <option key={f} value={f}>
                {FORMAT_WORDS[f]}
              </option>
            ))}
          </select>
        </label>
        {format === "csv" && (
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={bom} onChange={(e) => setBom(e.target.checked)} disabled={running} />
            for spreadsheet programs (byte order mark)
          </label>
        )}
        {running ? (
          <button type="button" className="btn-secondary" onClick={() => abort.current?.abort()}>
            Stop
          </button>
        ) : (
          <button type="button" className="btn-primary" onClick={() => void run()}>
            Export
          </button>
        )}
      </div>
      <p aria-live="polite" data-testid="search-export-status">
        {progress.state === "running" && `Receiving: ${progress.rows.toLocaleString("en")}${of} rows, ${megabytes(progress.bytes)}…`}
        {progress.state === "done" && `Saved ${progress.name}: ${progress.rows.toLocaleString("en")} rows, ${megabytes(progress.bytes)}.`}
        {progress.state === "failed" && progress.message}
        {progress.state === "stopped" && "Export stopped; nothing was saved."}
      </p>
      {running && total ? <progress className="w-full" max={total} value={progress.rows} aria-label="Rows received" /> : null}
    </details>
  );
}

/**
 * Rows received so far, counted as bytes arrive: lines that do not start with "#" or a quoted "#"
 * (CSV's header block, each line one quoted cell), less the first of them (CSV's column line, the
 * "about" line of JSON lines and JSON). A progress figure only: the file itself is what the server wrote.
 */
function lineCounter() {
  let atStart = true;
  /** The line began with a quote: its next byte says whether it is a header line. */
  let quoteFirst = false;
  let comment = false;
  let lines = 0;
  return {
    add(bytes: Uint8Array) {
      for (let i = 0; i < bytes.length; i++) {
        const b = bytes[i];
        // The byte order mark (EF BB BF) is not the start of a line's text.
        if (atStart && (b === 0xef || b === 0xbb || b === 0xbf)) continue;
        if (quoteFirst) {
          comment = b === 0x23;
          quoteFirst = false;
        } else if (atStart) {
          // "#": a CSV header line; "]": the close of a JSON document; a quote: look at the next byte.
          comment = b === 0x23 || b === 0x5d;
          quoteFirst = b === 0x22;
          atStart = false;
        }
        if (b === 0x0a) {
          if (!comment) lines++;
          atStart = true;
          quoteFirst = false;
        }
      }
    },
    rows: () => Math.max(0, lines - 1),
  };
}
