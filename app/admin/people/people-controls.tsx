"use client";

import { useActionState, useState } from "react";
import { SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { changeRoleAction, setActiveAction } from "./actions";

const roleOptions = ["researcher", "curator", "admin"] as const;

export function RoleForm({ userId, role, name }: { userId: number; role: string; name: string }) {
  const [state, action] = useActionState(changeRoleAction, idleState);
  // The select always shows the role as saved: the new one after a change, the old one after a
  // refusal. React resets a form after its action, putting back the options selected at first
  // render, so each answer mounts the select afresh with the saved role as its default.
  const saved = state.status === "ok" && state.values?.role ? state.values.role : role;
  const [answers, setAnswers] = useState({ state, count: 0 });
  if (answers.state !== state) setAnswers({ state, count: answers.count + 1 });
  return (
    <form action={action} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <label htmlFor={`role-${userId}`} className="sr-only">
        Role of {name}
      </label>
      <select key={answers.count} id={`role-${userId}`} name="role" defaultValue={saved} className="field-input w-auto py-1">
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
