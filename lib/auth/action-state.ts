/** What every form action returns to useActionState (shared by server actions and client forms). */
export interface ActionState {
  status: "idle" | "ok" | "error";
  message?: string;
  fieldErrors?: Record<string, string>;
  /** Values to show once (e.g. a new API token's secret). */
  data?: Record<string, string>;
  /** The submitted (non-secret) values, returned with an error so fields keep what was typed. */
  values?: Record<string, string>;
}

export const idleState: ActionState = { status: "idle" };
