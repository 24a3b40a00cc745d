/** What every form action returns to useActionState (shared by server actions and client forms). */
export interface ActionState {
  status: "idle" | "ok" | "error";
  message?: string;
  fieldErrors?: Record<string, string>;
  /** Values to show once (e.g. a new API token's secret). */
  data?: Record<string, string>;
}

export const idleState: ActionState = { status: "idle" };
