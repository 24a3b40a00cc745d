"use client";

import { useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import {
  changePasswordAction,
  createTokenAction,
  requestPasswordChoiceAction,
  revokeTokenAction,
  setProfileListedAction,
  unlinkOrcidAction,
  updateProfileAction,
} from "./actions";

export function ProfileForm({ name, orcid, affiliation }: { name: string; orcid: string | null; affiliation: string | null }) {
  const [state, action] = useActionState(updateProfileAction, idleState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <FormField label="Name" name="name" defaultValue={state.values?.name ?? name} required autoComplete="name" error={e.name} />
      <FormField
        label="Affiliation"
        name="affiliation"
        defaultValue={state.values?.affiliation ?? affiliation ?? ""}
        error={e.affiliation}
      />
      <FormField
        label="ORCID iD"
        name="orcid"
        defaultValue={state.values?.orcid ?? orcid ?? ""}
        placeholder="0000-0000-0000-0000"
        hint="Optional. Shown as “not verified”: link your iD through ORCID below to prove it is yours."
        error={e.orcid}
      />
      <SubmitButton>Save profile</SubmitButton>
    </form>
  );
}

export function PasswordForm() {
  const [state, action] = useActionState(changePasswordAction, idleState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <FormField label="Current password" name="current" type="password" autoComplete="current-password" required error={e.current} />
      <FormField
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={10}
        error={e.password}
      />
      <FormField label="New password again" name="confirm" type="password" autoComplete="new-password" required error={e.confirm} />
      <p className="text-sm text-muted">
        Changing it signs you out everywhere, here too. API tokens keep working: revoke them below if your password may have leaked.
      </p>
      <SubmitButton>Change password</SubmitButton>
    </form>
  );
}

/** `admin` is offered to admins only: a token never carries more than its holder may do. */
export function CreateTokenForm({ canAdmin }: { canAdmin: boolean }) {
  const [state, action] = useActionState(createTokenAction, idleState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      {state.data?.secret && (
        <div className="space-y-1">
          <label htmlFor="new-token" className="block text-sm font-medium">
            Your new token
          </label>
          <input
            id="new-token"
            readOnly
            value={state.data.secret}
            className="field-input font-mono"
            onFocus={(ev) => ev.currentTarget.select()}
          />
        </div>
      )}
      <FormField
        id="token-name"
        label="Token name"
        name="name"
        placeholder="e.g. lab upload script"
        required
        error={e.name}
        defaultValue={state.status === "error" ? state.values?.name : undefined}
      />
      <fieldset className="space-y-1">
        <legend className="text-sm font-medium">Scopes</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" name="scopes" value="deposit:read" defaultChecked /> deposit:read — fetch datasets, including your drafts
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" name="scopes" value="deposit:write" /> deposit:write — create and edit your drafts, submit and withdraw
          them; for curators also review decisions
        </label>
        {canAdmin && (
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="scopes" value="admin" /> admin — list people, change their roles and accounts
          </label>
        )}
        {e.scopes && <p className="text-sm text-error">{e.scopes}</p>}
      </fieldset>
      <SubmitButton>Create token</SubmitButton>
    </form>
  );
}

export function RevokeTokenButton({ tokenId, name }: { tokenId: number; name: string }) {
  const [state, action] = useActionState(revokeTokenAction, idleState);
  return (
    <form action={action}>
      <input type="hidden" name="tokenId" value={tokenId} />
      <SubmitButton className="btn-danger py-1">
        Revoke<span className="sr-only"> {name}</span>
      </SubmitButton>
      {state.status === "error" && <p className="text-sm text-error">{state.message}</p>}
    </form>
  );
}

export function UnlinkOrcidButton() {
  const [state, action] = useActionState(unlinkOrcidAction, idleState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-2">
      <FormMessage state={state} />
      <FormField
        id="unlink-current"
        label="Your password (to unlink)"
        name="current"
        type="password"
        autoComplete="current-password"
        required
        error={e.current}
      />
      <SubmitButton className="btn-danger">Unlink ORCID</SubmitButton>
    </form>
  );
}

export function ChoosePasswordButton() {
  const [state, action] = useActionState(requestPasswordChoiceAction, idleState);
  return (
    <form action={action} className="space-y-2">
      <FormMessage state={state} />
      <SubmitButton className="btn-secondary">E-mail me a link to choose a password</SubmitButton>
    </form>
  );
}

export function ProfileListingForm({ listed }: { listed: boolean }) {
  const [state, action] = useActionState(setProfileListedAction, idleState);
  return (
    <form action={action} className="space-y-2">
      <FormMessage state={state} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="listed" defaultChecked={listed} /> List my public profile on the people page
      </label>
      <SubmitButton className="btn-secondary">Save listing choice</SubmitButton>
    </form>
  );
}
