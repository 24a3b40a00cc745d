"use client";

import { useActionState } from "react";
import { SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { changeRoleAction, setActiveAction } from "./actions";

const roleOptions = ["researcher", "curator", "admin"] as const;

export function RoleForm({ userId, role, name }: { userId: number; role: string; name: string }) {
  const [state, action] = useActionState(changeRoleAction, idleState);
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <label htmlFor={`role-${userId}`} className="sr-only">
        Role of {name}
      </label>
      <select id={`role-${userId}`} name="role" defaultValue={state.values?.role ?? role} className="field-input w-auto py-1">
        {roleOptions.map((r) => (
          <option key={r} value={r}>
            {r}
          </option>
        ))}
      </select>
      <SubmitButton className="btn-secondary py-1">
        Save<span className="sr-only"> role of {name}</span>
      </SubmitButton>
      {state.message && (
        <span
          role={state.status === "error" ? "alert" : "status"}
          className={state.status === "error" ? "text-sm text-error" : "text-sm text-ok"}
        >
          {state.message}
        </span>
      )}
    </form>
  );
}

export function ActiveForm({ userId, active, name }: { userId: number; active: boolean; name: string }) {
  const [state, action] = useActionState(setActiveAction, idleState);
  return (
    <form action={action} className="space-y-1">
      <input type="hidden" name="userId" value={userId} />
      <input type="hidden" name="active" value={active ? "false" : "true"} />
      <SubmitButton className={active ? "btn-danger py-1" : "btn-secondary py-1"}>
        {active ? "Deactivate" : "Reactivate"}
        <span className="sr-only"> {name}</span>
      </SubmitButton>
      {state.status === "error" && <p className="text-sm text-error">{state.message}</p>}
    </form>
  );
}
