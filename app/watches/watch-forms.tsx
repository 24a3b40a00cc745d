"use client";

import Link from "next/link";
import { useActionState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { dailyDigestAction, removeWatchAction, stopWatchAction, toggleWatchAction } from "./actions";

type Subject = { kind: "reaction" | "dataset" | "collection"; id: number } | { kind: "species"; inchiKey: string };

/**
 * "Watch" on a reaction, species, dataset or collection page. Signed out: a link to sign in and come back.
 * The button's words follow the result, so watching and stopping need no reload.
 */
export function WatchToggle({
  subject,
  what,
  watching,
  signedIn,
  backPath,
  news = "a version is published or retracted",
}: {
  subject: Subject;
  /** What the mail is about: "a version is published or retracted" by default. */
  news?: string;
  /** "this reaction", "this species", "this dataset", "this collection". */
  what: string;
  watching: boolean;
  signedIn: boolean;
  backPath: string;
}) {
  const [state, action] = useActionState(toggleWatchAction, idleState);
  if (!signedIn) {
    return (
      <p className="text-sm">
        <Link href={`/sign-in?callbackUrl=${encodeURIComponent(backPath)}`}>Sign in to watch {what}</Link>: a mail when {news}.
      </p>
    );
  }
  const now = state.status === "ok" ? state.data?.watching === "1" : watching;
  return (
    <form action={action} className="flex flex-wrap items-center gap-3 text-sm">
      <input type="hidden" name="kind" value={subject.kind} />
      {"id" in subject ? (
        <input type="hidden" name="id" value={subject.id} />
      ) : (
        <input type="hidden" name="inchiKey" value={subject.inchiKey} />
      )}
      <input type="hidden" name="watch" value={now ? "0" : "1"} />
      <SubmitButton className={now ? "btn-secondary py-1" : "btn-primary py-1"}>
        {now ? `Stop watching ${what}` : `Watch ${what}`}
      </SubmitButton>
      {now && state.status === "idle" && <span className="text-muted">You get a mail when {news}.</span>}
      <FormMessage state={state} />
    </form>
  );
}

export function RemoveWatchButton({ watchId, label }: { watchId: number; label: string }) {
  const [state, action] = useActionState(removeWatchAction, idleState);
  return (
    <form action={action}>
      <input type="hidden" name="watchId" value={watchId} />
      <SubmitButton className="btn-secondary py-1">
        Stop<span className="sr-only"> watching {label}</span>
      </SubmitButton>
      {state.status === "error" && <p className="text-sm text-error">{state.message}</p>}
    </form>
  );
}

export function DailyDigestForm({ dailyDigest }: { dailyDigest: boolean }) {
  const [state, action] = useActionState(dailyDigestAction, idleState);
  return (
    <form action={action} className="space-y-3">
      <fieldset className="space-y-2">
        <legend className="font-medium">How to tell you</legend>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" name="dailyDigest" value="0" defaultChecked={!dailyDigest} /> A mail for each change, as it happens
        </label>
        <label className="flex items-center gap-2 text-sm">
          <input type="radio" name="dailyDigest" value="1" defaultChecked={dailyDigest} /> One mail a day with the day&apos;s changes (06:00
          UTC)
        </label>
      </fieldset>
      <SubmitButton>Save</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

export function StopWatchForm({ token, label }: { token: string; label: string }) {
  const [state, action] = useActionState(stopWatchAction, idleState);
  if (state.status === "ok") return <FormMessage state={state} />;
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="token" value={token} />
      <p>Stop watching {label}? You will get no more mail about it.</p>
      <SubmitButton>Stop watching</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}
