import { createHash } from "node:crypto";
import type { ConsensusResult } from "@/lib/kinetics";
import type { ConsensusSelection } from "./consensus-selection";

/**
 * The consensus of a reaction's default choice of data, kept with its search summary
 * (search_reaction_summaries.consensus_result, written with it by lib/search/documents.ts whenever
 * the reaction's data change), so the reaction page need not run the engine on every view (about a
 * fifth of a cold render, measured with `npm run bench:web`).
 *
 * It is used only for exactly the input it was computed from: the engine version and a SHA-256 of
 * the engine's input (every dataset, point and curator exclusion that goes in). Any other input —
 * a reader's own choice of data, a version published since, a re-fit, a new engine — does not
 * match, and the engine runs as before. So a kept result can be missing or old, never wrong.
 */
export interface StoredConsensus {
  engine: string;
  /** SHA-256 (hex) of the engine's input, as consensusInputKey writes it. */
  input: string;
  result: ConsensusResult | null;
  unavailable: string | null;
}

/** The fingerprint of the engine's input for one selection. */
export function consensusInputKey(selection: Pick<ConsensusSelection, "inputs">): string {
  return createHash("sha256").update(JSON.stringify(selection.inputs)).digest("hex");
}

/** What is kept for a selection and the engine's answer to it. */
export function storedConsensusOf(
  selection: Pick<ConsensusSelection, "inputs">,
  run: { result: ConsensusResult | null; unavailable: string | null },
  engine: string,
): StoredConsensus {
  // JSON keeps no NaN or ±Infinity: an answer holding one is kept under no input, so it is never read back.
  return { engine, input: jsonSafe(run.result) ? consensusInputKey(selection) : "", result: run.result, unavailable: run.unavailable };
}

/** Whether a value comes back from JSON as it went in (no non-finite number, no undefined in an array). */
function jsonSafe(value: unknown): boolean {
  if (typeof value === "number") return Number.isFinite(value);
  if (value === null || typeof value !== "object") return typeof value !== "function" && typeof value !== "bigint";
  if (Array.isArray(value)) return value.every((v) => v !== undefined && jsonSafe(v));
  if (ArrayBuffer.isView(value) || value instanceof Date || value instanceof Map || value instanceof Set) return false;
  return Object.values(value).every((v) => v === undefined || jsonSafe(v));
}

/**
 * The kept answer when it was computed by this engine from exactly this selection's input; null
 * otherwise (the caller then runs the engine).
 */
export function readStoredConsensus(
  value: unknown,
  selection: Pick<ConsensusSelection, "inputs">,
  engine: string,
): { result: ConsensusResult | null; unavailable: string | null } | null {
  const kept = value as Partial<StoredConsensus> | null;
  if (!kept || typeof kept !== "object" || kept.engine !== engine || typeof kept.input !== "string") return null;
  if (kept.result === undefined || (kept.result !== null && typeof kept.result !== "object")) return null;
  if (!kept.input || kept.input !== consensusInputKey(selection)) return null;
  return { result: kept.result, unavailable: typeof kept.unavailable === "string" ? kept.unavailable : null };
}
