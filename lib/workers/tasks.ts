/**
 * The tasks an analysis worker thread runs. Each takes and returns plain data (structured clone
 * crosses the thread boundary; class instances such as AppError do not), so failures of the input
 * come back as `{ ok: false, … }` values rather than exceptions.
 */
import { runAnalysisOrThrow, type AnalysisRequest, type AnalysisResponse } from "@/lib/analyses/analyse-request";
import { checkAndAnalyseDocument, type CheckedDocument } from "@/lib/datasets/prepare-document";
import { AppError, type ErrorCode, type FieldError } from "@/lib/errors";
import { judgeReactions } from "@/lib/mechanisms/judge";
import { readMechanismRequest } from "@/lib/mechanisms/request";

export type AnalyseOutcome =
  { ok: true; response: AnalysisResponse } | { ok: false; code: ErrorCode; message: string; errors: FieldError[] };

export const tasks = {
  /**
   * Deposit document (JSON text, or its UTF-8 bytes as a request brought them) → validated,
   * normalised, analysed (lib/datasets/prepare-document.ts). Bytes are decoded here, not on the
   * request thread, and a valid document's text is sent back for the caller to store.
   */
  checkDocument: (input: string | Uint8Array): CheckedDocument & { text?: string } => {
    if (typeof input === "string") return checkAndAnalyseDocument(input);
    const text = new TextDecoder().decode(input);
    const checked = checkAndAnalyseDocument(text);
    return checked.ok ? { ...checked, text } : checked;
  },
  /** The stateless analysis of POST /api/v1/analyses, on an already parsed request. */
  analyse: (request: AnalysisRequest): AnalyseOutcome => {
    try {
      return { ok: true, response: runAnalysisOrThrow(request) };
    } catch (err) {
      if (err instanceof AppError) return { ok: false, code: err.code, message: err.message, errors: err.errors };
      throw err;
    }
  },
  /**
   * A mechanism check's body (bytes as received): decoded, its fields read, the one-pass pre-check,
   * then the mechanism read (lib/mechanisms/request.ts). Never on the request thread: a nested or
   * huge file costs its time and memory here.
   */
  readMechanism: readMechanismRequest,
  /** The verdicts of a mechanism's matched reactions against their consensus (lib/mechanisms/judge.ts). */
  judgeMechanism: judgeReactions,
};

export type Tasks = typeof tasks;
export type TaskName = keyof Tasks;

/** What the worker thread receives. */
export interface TaskMessage<N extends TaskName = TaskName> {
  name: N;
  input: Parameters<Tasks[N]>[0];
}

/** Entry used by the worker thread: dispatch one message. */
export function runTask({ name, input }: TaskMessage): ReturnType<Tasks[TaskName]> {
  const task = tasks[name] as (input: unknown) => ReturnType<Tasks[TaskName]>;
  if (!task) throw new Error(`Unknown analysis task "${String(name)}"`);
  return task(input);
}
