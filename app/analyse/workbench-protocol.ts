// Messages between the /analyse page and its worker (workbench-worker.ts).
import type { AnalysisResponse } from "@/lib/analyses/analyse-request";
import type { RowError } from "@/lib/analyses/parse-columns";
import type { ReactionOrder } from "@/lib/kinetics/types";
import type { PlotPoint } from "@/components/arrhenius-plot";

export type ExportFormat = "csv" | "json";

export type WorkbenchRequest =
  | { type: "parse"; seq: number; text: string }
  | { type: "fit"; seq: number; order: ReactionOrder; kUnit: string; TUnit: string }
  | { type: "export"; seq: number; format: ExportFormat; energyUnit: string };

/** An error of the fit request, with the pasted line it points at when it points at a point. */
export interface FitProblem {
  title: string;
  errors: { pointer: string; message: string; line?: number }[];
}

export type WorkbenchReply =
  | { type: "parsed"; seq: number; count: number; errors: RowError[]; errorCount: number }
  | {
      type: "fitted";
      seq: number;
      /** The answer without its per-point arrays (they stay in the worker for the exports). */
      response: AnalysisResponse;
      /** Pasted line of each point a flag names. */
      flagLines: Record<number, number>;
      /** The points the plot draws (all of them up to a limit, else a thinned set with every outlier). */
      drawn: PlotPoint[];
      total: number;
    }
  | { type: "fit-failed"; seq: number; problem: FitProblem }
  | { type: "exported"; seq: number; format: ExportFormat; blob: Blob };
